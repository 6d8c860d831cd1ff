/**
 * Emitters for the two surface representations (../fits/surfaceFile.ts):
 * tensor Hermite grid cells (multilinear for grid-linear) and radial basis
 * functions with a polynomial tail. Each repeats the engine's own arithmetic
 * in the same order (TensorGrid.evaluate, RadialBasis.evaluate), so the
 * generated code returns the engine's doubles up to the last bits of the
 * platform's exp/log/sqrt.
 */
import { decodeArray, decodeNumber } from '../fits/fitFile';
import { FitError } from '../fits/fitError';
import { registerEmitter, type CodeEmitter } from './emitters';
import { pyFloat, tsNumber, wrapItems } from './literals';

type Body = Record<string, unknown>;

function pyArray(name: string, a: ArrayLike<number>, comment: string): string {
	return `# ${comment}\n${name} = np.array([\n${wrapItems(Array.from(a, pyFloat), '    ')}\n])`;
}

function tsArray(name: string, a: ArrayLike<number>, comment: string): string {
	return `/** ${comment} */\nconst ${name}: readonly number[] = [\n${wrapItems(Array.from(a, tsNumber), '\t')}\n];`;
}

function boxDomain(fit: Body): [number, number][] {
	const d = fit.domain;
	if (!Array.isArray(d) || d.length < 1) throw new FitError('bad-fit-file', 'fit file: domain must list [lo, hi] per input');
	return d.map((r, k) => {
		const a = decodeArray(r, `domain[${k}]`);
		if (a.length !== 2) throw new FitError('bad-fit-file', `fit file: domain[${k}] must be [lo, hi]`);
		return [a[0], a[1]];
	});
}

/** Python: refuse a point outside the box (names the input and the domain). */
const PY_REFUSE = [
	'    for k in range(INPUT_COUNT):',
	'        lo, hi = DOMAIN[k]',
	'        out = (X[:, k] < lo) | (X[:, k] > hi)',
	'        if out.any():',
	'            v = X[int(np.argmax(out)), k]',
	'            raise ValueError(',
	'                f"{INPUT_NAMES[k]} = {v!r} lies outside the fit\'s domain [{lo!r}, {hi!r}]"',
	'                " and its extrapolation rule is \'refuse\'"',
	'            )'
];
const TS_REFUSE = [
	'\tfor (let k = 0; k < x.length; k++) {',
	'\t\tconst [lo, hi] = DOMAIN[k];',
	'\t\tif (!(x[k] >= lo && x[k] <= hi)) {',
	"\t\t\tthrow new RangeError(`${INPUT_NAMES[k]} = ${x[k]} lies outside the fit's domain [${lo}, ${hi}] and its extrapolation rule is 'refuse'`);",
	'\t\t}',
	'\t}'
];

function gridParts(fit: Body) {
	if (!Array.isArray(fit.axes) || fit.axes.length < 1) throw new FitError('bad-fit-file', 'fit file: axes must list the grid values per input');
	const axes = (fit.axes as unknown[]).map((a, k) => decodeArray(a, `axes[${k}]`));
	const cubic = fit.cubic === true;
	const data = decodeArray(fit.data, 'data');
	const slots = cubic ? 1 << axes.length : 1;
	const nodes = axes.reduce((p, a) => p * a.length, 1);
	if (data.length !== nodes * slots) throw new FitError('bad-fit-file', `fit file: grid data: expected ${nodes * slots} numbers, got ${data.length}`);
	return { axes, cubic, data, slots };
}

const GRID_DOC = (cubic: boolean, d: number) => [
	`Grid cells: input k has grid values AXES[k]; a point lies in the cell [a_i, a_i+1] with a_i <= x_k < a_i+1`,
	`(the last cell also takes the right end; outside, the edge cell continues). With h = a_i+1 - a_i and`,
	`t = (x_k - a_i)/h, each input has ${cubic ? 4 : 2} local basis functions:`,
	cubic
		? '    b0 = 2t^3 - 3t^2 + 1, b1 = (t^3 - 2t^2 + t)h, b2 = -2t^3 + 3t^2, b3 = (t^3 - t^2)h  (cubic Hermite)'
		: '    b0 = 1 - t, b1 = t  (multilinear)',
	cubic
		? `Basis b = 2c + s picks the cell corner c (0 low, 1 high) and s = 1 for the derivative along that input.`
		: 'Basis b is the cell corner (0 low, 1 high).',
	`f = sum over the ${cubic ? 4 ** d : 2 ** d} local terms of DATA[node, slot] * prod_k b(k); nodes row-major (last input`,
	`fastest), ${cubic ? `${1 << d} slots per node: slot S holds the mixed partial of f along the inputs in bit set S` : 'one value per node'}.`
];

const tensorHermite: CodeEmitter = {
	inputCount: (fit) => gridParts(fit).axes.length,
	domain: boxDomain,
	python(fit: Body): string {
		const { axes, cubic, data, slots } = gridParts(fit);
		const d = axes.length;
		const refuse = fit.extrapolation === 'refuse';
		return [
			...GRID_DOC(cubic, d).map((l) => `# ${l}`),
			`CUBIC = ${cubic ? 'True' : 'False'}`,
			`SLOTS = ${slots}`,
			`AXES = (`,
			...axes.map((a, k) => `    np.array([${Array.from(a, pyFloat).join(', ')}]),  # input ${k}`),
			')',
			pyArray('DATA', data, `${data.length / slots} nodes x ${slots} slot${slots === 1 ? '' : 's'}`),
			'_M = 4 if CUBIC else 2',
			'_STRIDES = [1] * INPUT_COUNT',
			'for _k in range(INPUT_COUNT - 2, -1, -1):',
			'    _STRIDES[_k] = _STRIDES[_k + 1] * len(AXES[_k + 1])',
			'# local terms: (node offset, slot, basis index per input)',
			'_TERMS = []',
			'for _J in range(_M ** INPUT_COUNT):',
			'    _r, _node, _slot, _b = _J, 0, 0, [0] * INPUT_COUNT',
			'    for _k in range(INPUT_COUNT - 1, -1, -1):',
			'        _b[_k] = _r % _M',
			'        _r //= _M',
			'        _node += (_b[_k] >> 1 if CUBIC else _b[_k]) * _STRIDES[_k]',
			'        if CUBIC and _b[_k] & 1:',
			'            _slot |= 1 << _k',
			'    _TERMS.append((_node, _slot, tuple(_b)))',
			'',
			'',
			'def _basis(k, v):',
			'    """Cell index and basis weights (with first and second derivatives) of input k at v."""',
			'    a = AXES[k]',
			'    i = np.clip(np.searchsorted(a, v, side="right") - 1, 0, len(a) - 2)',
			'    h = a[i + 1] - a[i]',
			'    t = (v - a[i]) / h',
			'    if CUBIC:',
			'        t2 = t * t',
			'        t3 = t2 * t',
			'        w0 = (2 * t3 - 3 * t2 + 1, (t3 - 2 * t2 + t) * h, -2 * t3 + 3 * t2, (t3 - t2) * h)',
			'        w1 = ((6 * t2 - 6 * t) / h, 3 * t2 - 4 * t + 1, (-6 * t2 + 6 * t) / h, 3 * t2 - 2 * t)',
			'        w2 = ((12 * t - 6) / (h * h), (6 * t - 4) / h, (-12 * t + 6) / (h * h), (6 * t - 2) / h)',
			'    else:',
			'        z = np.zeros_like(t)',
			'        w0, w1, w2 = (1 - t, t), (-1 / h, 1 / h), (z, z)',
			'    return i, w0, w1, w2',
			'',
			'',
			'def _evaluate_points(X):',
			`    """f, gradient and Hessian at the points X, shape (n, ${d})."""`,
			...(refuse ? PY_REFUSE : ['    # extend: outside the domain, the edge cells continue']),
			'    n, d = X.shape',
			'    base = np.zeros(n, dtype=np.int64)',
			'    W0, W1, W2 = [], [], []',
			'    for k in range(d):',
			'        i, w0, w1, w2 = _basis(k, X[:, k])',
			'        base = base + i * _STRIDES[k]',
			'        W0.append(w0)',
			'        W1.append(w1)',
			'        W2.append(w2)',
			'    f = np.zeros(n)',
			'    grad = np.zeros((n, d))',
			'    hess = np.zeros((n, d, d))',
			'    for node, slot, b in _TERMS:',
			'        v = DATA[(base + node) * SLOTS + slot]',
			'        fa = [W0[k][b[k]] for k in range(d)]',
			'        fb = [W1[k][b[k]] for k in range(d)]',
			'        fe = [W2[k][b[k]] for k in range(d)]',
			'        for j in range(d):',
			'            pj = v',
			'            for k in range(d):',
			'                if k != j:',
			'                    pj = pj * fa[k]',
			'            grad[:, j] += pj * fb[j]',
			'            hess[:, j, j] += pj * fe[j]',
			'            for l in range(j + 1, d):',
			'                pjl = v * fb[j] * fb[l]',
			'                for k in range(d):',
			'                    if k != j and k != l:',
			'                        pjl = pjl * fa[k]',
			'                hess[:, j, l] += pjl',
			'        p = v',
			'        for k in range(d):',
			'            p = p * fa[k]',
			'        f += p',
			'    for j in range(d):',
			'        for l in range(j + 1, d):',
			'            hess[:, l, j] = hess[:, j, l]',
			'    return f, grad, hess'
		].join('\n');
	},
	typescript(fit: Body): string {
		const { axes, cubic, data, slots } = gridParts(fit);
		const d = axes.length;
		const refuse = fit.extrapolation === 'refuse';
		return [
			'/*',
			...GRID_DOC(cubic, d).map((l) => ` * ${l}`),
			' */',
			`const CUBIC = ${cubic};`,
			`const SLOTS = ${slots};`,
			'const AXES: readonly (readonly number[])[] = [',
			...axes.map((a, k) => `\t[${Array.from(a, tsNumber).join(', ')}], // input ${k}`),
			'];',
			tsArray('DATA', data, `${data.length / slots} nodes × ${slots} slot${slots === 1 ? '' : 's'}`),
			'const M = CUBIC ? 4 : 2;',
			'const D = AXES.length;',
			'const STRIDES: number[] = new Array(D).fill(1);',
			'for (let k = D - 2; k >= 0; k--) STRIDES[k] = STRIDES[k + 1] * AXES[k + 1].length;',
			'/** local terms: node offset, slot, basis index per input */',
			'const TERMS: { node: number; slot: number; b: number[] }[] = [];',
			'for (let J = 0; J < M ** D; J++) {',
			'\tlet r = J;',
			'\tlet node = 0;',
			'\tlet slot = 0;',
			'\tconst b: number[] = new Array(D).fill(0);',
			'\tfor (let k = D - 1; k >= 0; k--) {',
			'\t\tb[k] = r % M;',
			'\t\tr = (r - b[k]) / M;',
			'\t\tnode += (CUBIC ? b[k] >> 1 : b[k]) * STRIDES[k];',
			'\t\tif (CUBIC && (b[k] & 1) === 1) slot |= 1 << k;',
			'\t}',
			'\tTERMS.push({ node, slot, b });',
			'}',
			'',
			'/** Cell index and basis weights (with first and second derivatives) of input k at v. */',
			'function basis(k: number, v: number): { i: number; w0: number[]; w1: number[]; w2: number[] } {',
			'\tconst a = AXES[k];',
			'\tconst n = a.length;',
			'\tlet lo = 0;',
			'\tlet hi = n - 2;',
			'\tif (v >= a[hi]) lo = hi;',
			'\telse if (v > a[0]) {',
			'\t\twhile (hi - lo > 1) {',
			'\t\t\tconst mid = (lo + hi) >> 1;',
			'\t\t\tif (a[mid] <= v) lo = mid;',
			'\t\t\telse hi = mid;',
			'\t\t}',
			'\t}',
			'\tconst i = lo;',
			'\tconst h = a[i + 1] - a[i];',
			'\tconst t = (v - a[i]) / h;',
			'\tif (!CUBIC) return { i, w0: [1 - t, t], w1: [-1 / h, 1 / h], w2: [0, 0] };',
			'\tconst t2 = t * t;',
			'\tconst t3 = t2 * t;',
			'\treturn {',
			'\t\ti,',
			'\t\tw0: [2 * t3 - 3 * t2 + 1, (t3 - 2 * t2 + t) * h, -2 * t3 + 3 * t2, (t3 - t2) * h],',
			'\t\tw1: [(6 * t2 - 6 * t) / h, 3 * t2 - 4 * t + 1, (-6 * t2 + 6 * t) / h, 3 * t2 - 2 * t],',
			'\t\tw2: [(12 * t - 6) / (h * h), (6 * t - 4) / h, (-12 * t + 6) / (h * h), (6 * t - 2) / h]',
			'\t};',
			'}',
			'',
			'function evaluatePoint(x: number[]): { f: number; grad: number[]; hess: number[][] | null } {',
			...(refuse ? TS_REFUSE : ['\t// extend: outside the domain, the edge cells continue']),
			'\tlet base = 0;',
			'\tconst w = x.map((v, k) => basis(k, v));',
			'\tfor (let k = 0; k < D; k++) base += w[k].i * STRIDES[k];',
			'\tlet f = 0;',
			'\tconst grad: number[] = new Array(D).fill(0);',
			'\tconst hess: number[][] = Array.from({ length: D }, () => new Array(D).fill(0));',
			'\tfor (const { node, slot, b } of TERMS) {',
			'\t\tconst v = DATA[(base + node) * SLOTS + slot];',
			'\t\tif (v === 0) continue;',
			'\t\tconst fa = b.map((bk, k) => w[k].w0[bk]);',
			'\t\tconst fb = b.map((bk, k) => w[k].w1[bk]);',
			'\t\tconst fe = b.map((bk, k) => w[k].w2[bk]);',
			'\t\tfor (let j = 0; j < D; j++) {',
			'\t\t\tlet pj = v;',
			'\t\t\tfor (let k = 0; k < D; k++) if (k !== j) pj *= fa[k];',
			'\t\t\tgrad[j] += pj * fb[j];',
			'\t\t\thess[j][j] += pj * fe[j];',
			'\t\t\tfor (let l = j + 1; l < D; l++) {',
			'\t\t\t\tlet pjl = v * fb[j] * fb[l];',
			'\t\t\t\tfor (let k = 0; k < D; k++) if (k !== j && k !== l) pjl *= fa[k];',
			'\t\t\t\thess[j][l] += pjl;',
			'\t\t\t}',
			'\t\t}',
			'\t\tlet p = v;',
			'\t\tfor (let k = 0; k < D; k++) p *= fa[k];',
			'\t\tf += p;',
			'\t}',
			'\tfor (let j = 0; j < D; j++) for (let l = j + 1; l < D; l++) hess[l][j] = hess[j][l];',
			'\treturn { f, grad, hess };',
			'}'
		].join('\n');
	}
};

const KERNELS: Record<string, string> = { 'rbf-thin-plate': 'thin-plate', 'rbf-multiquadric': 'multiquadric', 'rbf-gaussian': 'gaussian' };

function rbfParts(fit: Body) {
	const kernel = KERNELS[String(fit.method)];
	if (!kernel) throw new FitError('bad-fit-file', `fit file: unknown scattered method ${JSON.stringify(fit.method)}`);
	const lower = decodeArray(fit.lower, 'lower');
	const span = decodeArray(fit.span, 'span');
	const centres = decodeArray(fit.centres, 'centres');
	const coefficients = decodeArray(fit.coefficients, 'coefficients');
	const tail = decodeArray(fit.tail, 'tail');
	const d = lower.length;
	if (d < 1 || span.length !== d || centres.length !== coefficients.length * d) throw new FitError('bad-fit-file', 'fit file: lower, span and centres do not match');
	const opt = (fit.options ?? {}) as Record<string, unknown>;
	const epsilon = decodeNumber(opt.epsilon, 'options.epsilon');
	return { kernel, lower, span, centres, coefficients, tail, d, e2: epsilon * epsilon };
}

const RBF_DOC = [
	'Radial basis functions: with u_k = (x_k - LOWER[k]) / SPAN[k] and s_j = |u - C_j|^2 (C_j row j of CENTRES),',
	'    f = TAIL[0] + sum_k TAIL[k+1] u_k + sum_j COEFFICIENTS[j] g(s_j)   (tail terms present as TAIL lists them)',
	'with g(s) the kernel of the squared distance (E2 = epsilon^2):',
	'    thin-plate:   g = (E2 s/2) log(E2 s)  (0 at s = 0)',
	'    multiquadric: g = -sqrt(1 + E2 s)',
	'    gaussian:     g = exp(-E2 s)',
	"Derivatives in u: df/du_k = sum 2 c g'(s) du_k, d2f/du_k du_l = sum 4 c g''(s) du_k du_l + [k = l] 2 c g'(s);",
	'then divided by SPAN. Thin-plate: at a centre the Hessian is undefined; that centre\'s curvature term is left out.',
	'Outside the data box the formula continues (extrapolation "extend").'
];

const radialBasis: CodeEmitter = {
	inputCount: (fit) => rbfParts(fit).d,
	domain: boxDomain,
	python(fit: Body): string {
		const p = rbfParts(fit);
		const n = p.coefficients.length;
		return [
			...RBF_DOC.map((l) => `# ${l}`),
			`KERNEL = "${p.kernel}"`,
			`E2 = ${pyFloat(p.e2)}`,
			pyArray('LOWER', p.lower, 'per input'),
			pyArray('SPAN', p.span, 'per input'),
			pyArray('CENTRES', p.centres, `${n} centres x ${p.d} scaled inputs`) + `.reshape(${n}, ${p.d})`,
			pyArray('COEFFICIENTS', p.coefficients, `${n} kernel coefficients`),
			pyArray('TAIL', p.tail, 'polynomial tail: constant, then one per input (may be empty)'),
			'',
			'',
			'def _kernel(s):',
			"    \"\"\"g, g', g'' of the squared scaled distance s (array).\"\"\"",
			'    if KERNEL == "gaussian":',
			'        g = np.exp(-E2 * s)',
			'        return g, -E2 * g, E2 * E2 * g',
			'    if KERNEL == "multiquadric":',
			'        q = np.sqrt(1 + E2 * s)',
			'        return -q, -E2 / (2 * q), (E2 * E2) / (4 * q * q * q)',
			'    zero = s == 0',
			'    with np.errstate(divide="ignore", invalid="ignore"):',
			'        L = np.log(E2 * s)',
			'        g = 0.5 * E2 * s * L',
			'        g1 = 0.5 * E2 * (L + 1)',
			'        g2 = (0.5 * E2) / s',
			'    return np.where(zero, 0.0, g), np.where(zero, 0.0, g1), np.where(zero, 0.0, g2)',
			'',
			'',
			'def _evaluate_points(X):',
			`    """f, gradient and Hessian at the points X, shape (n, ${p.d})."""`,
			'    n, d = X.shape',
			'    u = (X - LOWER) / SPAN',
			'    if len(TAIL) == 0:',
			'        f = np.zeros(n)',
			'    else:',
			'        f = np.full(n, TAIL[0])',
			'        for k in range(1, len(TAIL)):',
			'            f = f + TAIL[k] * u[:, k - 1]',
			'    grad = np.zeros((n, d))',
			'    hess = np.zeros((n, d, d))',
			'    for j in range(len(COEFFICIENTS)):',
			'        delta = u - CENTRES[j]',
			'        s = np.zeros(n)',
			'        for k in range(d):',
			'            s = s + delta[:, k] * delta[:, k]',
			'        g, g1, g2 = _kernel(s)',
			'        cj = COEFFICIENTS[j]',
			'        f = f + cj * g',
			'        w1 = 2 * cj * g1',
			'        w2 = 4 * cj * g2',
			'        for k in range(d):',
			'            grad[:, k] += w1 * delta[:, k]',
			'            for l in range(k, d):',
			'                hess[:, k, l] += w2 * delta[:, k] * delta[:, l] + (w1 if k == l else 0.0)',
			'    for k in range(d):',
			'        grad[:, k] = (grad[:, k] + (TAIL[k + 1] if len(TAIL) > 1 else 0.0)) / SPAN[k]',
			'        for l in range(k, d):',
			'            hess[:, k, l] /= SPAN[k] * SPAN[l]',
			'            hess[:, l, k] = hess[:, k, l]',
			'    return f, grad, hess'
		].join('\n');
	},
	typescript(fit: Body): string {
		const p = rbfParts(fit);
		const n = p.coefficients.length;
		return [
			'/*',
			...RBF_DOC.map((l) => ` * ${l}`),
			' */',
			`const KERNEL: string = ${JSON.stringify(p.kernel)};`,
			`const E2 = ${tsNumber(p.e2)};`,
			tsArray('LOWER', p.lower, 'per input'),
			tsArray('SPAN', p.span, 'per input'),
			tsArray('CENTRES', p.centres, `${n} centres × ${p.d} scaled inputs, centre after centre`),
			tsArray('COEFFICIENTS', p.coefficients, `${n} kernel coefficients`),
			tsArray('TAIL', p.tail, 'polynomial tail: constant, then one per input (may be empty)'),
			'',
			'/** g, g′, g″ of the squared scaled distance s. */',
			'function kernel(s: number): [number, number, number] {',
			"\tif (KERNEL === 'gaussian') {",
			'\t\tconst g = Math.exp(-E2 * s);',
			'\t\treturn [g, -E2 * g, E2 * E2 * g];',
			'\t}',
			"\tif (KERNEL === 'multiquadric') {",
			'\t\tconst q = Math.sqrt(1 + E2 * s);',
			'\t\treturn [-q, -E2 / (2 * q), (E2 * E2) / (4 * q * q * q)];',
			'\t}',
			'\tif (s === 0) return [0, 0, 0];',
			'\tconst L = Math.log(E2 * s);',
			'\treturn [0.5 * E2 * s * L, 0.5 * E2 * (L + 1), (0.5 * E2) / s];',
			'}',
			'',
			'function evaluatePoint(x: number[]): { f: number; grad: number[]; hess: number[][] | null } {',
			'\tconst d = LOWER.length;',
			'\tconst u = x.map((v, k) => (v - LOWER[k]) / SPAN[k]);',
			'\tlet f = 0;',
			'\tif (TAIL.length > 0) {',
			'\t\tf = TAIL[0];',
			'\t\tfor (let k = 1; k < TAIL.length; k++) f += TAIL[k] * u[k - 1];',
			'\t}',
			'\tconst grad: number[] = new Array(d).fill(0);',
			'\tconst hess: number[][] = Array.from({ length: d }, () => new Array(d).fill(0));',
			'\tconst delta: number[] = new Array(d).fill(0);',
			'\tfor (let j = 0, o = 0; j < COEFFICIENTS.length; j++, o += d) {',
			'\t\tlet s = 0;',
			'\t\tfor (let k = 0; k < d; k++) {',
			'\t\t\tdelta[k] = u[k] - CENTRES[o + k];',
			'\t\t\ts += delta[k] * delta[k];',
			'\t\t}',
			'\t\tconst [g, g1, g2] = kernel(s);',
			'\t\tconst cj = COEFFICIENTS[j];',
			'\t\tf += cj * g;',
			'\t\tconst w1 = 2 * cj * g1;',
			'\t\tconst w2 = 4 * cj * g2;',
			'\t\tfor (let k = 0; k < d; k++) {',
			'\t\t\tgrad[k] += w1 * delta[k];',
			'\t\t\tfor (let l = k; l < d; l++) hess[k][l] += w2 * delta[k] * delta[l] + (k === l ? w1 : 0);',
			'\t\t}',
			'\t}',
			'\tfor (let k = 0; k < d; k++) {',
			'\t\tgrad[k] = (grad[k] + (TAIL.length > 1 ? TAIL[k + 1] : 0)) / SPAN[k];',
			'\t\tfor (let l = k; l < d; l++) {',
			'\t\t\thess[k][l] /= SPAN[k] * SPAN[l];',
			'\t\t\thess[l][k] = hess[k][l];',
			'\t\t}',
			'\t}',
			'\treturn { f, grad, hess };',
			'}'
		].join('\n');
	}
};

registerEmitter('tensor-hermite', tensorHermite);
registerEmitter('radial-basis', radialBasis);
