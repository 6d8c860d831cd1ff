/**
 * Emitters for the three curve representations (../fits/fitFile.ts):
 * piecewise polynomial, barycentric polynomial and scaled polynomial. Each
 * writes the same arithmetic, in the same order, as the engine's own
 * evaluation (PiecewisePolynomial, BarycentricPolynomial, ScaledPolynomial),
 * so the generated code returns the engine's doubles. The extrapolation rule
 * is written as code for that one rule only, which keeps the module short.
 */
import { decodeArray, decodeNumber } from '../fits/fitFile';
import { FitError } from '../fits/fitError';
import { registerEmitter, type CodeEmitter, type EmitContext } from './emitters';
import { pyFloat, tsNumber, wrapItems } from './literals';

type Body = Record<string, unknown>;

function curveDomain(fit: Body): [number, number][] {
	const d = fit.domain;
	if (!Array.isArray(d) || d.length !== 2) throw new FitError('bad-fit-file', 'fit file: domain must be [lo, hi]');
	return [[decodeNumber(d[0], 'domain[0]'), decodeNumber(d[1], 'domain[1]')]];
}

function pyArray(name: string, a: ArrayLike<number>, comment: string): string {
	return `# ${comment}\n${name} = np.array([\n${wrapItems(Array.from(a, pyFloat), '    ')}\n])`;
}

function tsArray(name: string, a: ArrayLike<number>, comment: string): string {
	return `/** ${comment} */\nconst ${name}: readonly number[] = [\n${wrapItems(Array.from(a, tsNumber), '\t')}\n];`;
}

/** Python: the curve under its extrapolation rule, on top of `_polynomial(x)`. */
function pythonCurve(rule: string): string {
	const lines = [
		'# The fit at its two ends (limits from inside the data), for the extrapolation rule.',
		'_LO = _polynomial(np.array([DOMAIN[0][0]]))',
		'_HI = _polynomial(np.array([DOMAIN[0][1]]))',
		'F_LO, DF_LO = float(_LO[0][0]), float(_LO[1][0])',
		'F_HI, DF_HI = float(_HI[0][0]), float(_HI[1][0])',
		'',
		'',
		'def _curve(x):',
		'    """f, df/dx, d2f/dx2 at the 1-D float array x, the extrapolation rule applied."""',
		'    lo, hi = DOMAIN[0]',
		'    below = x < lo',
		'    above = x > hi'
	];
	if (rule === 'refuse') {
		lines.push(
			'    outside = below | above',
			'    if outside.any():',
			'        k = int(np.argmax(outside))',
			'        raise ValueError(',
			'            f"{INPUT_NAMES[0]} = {x[k]!r} lies outside the fit\'s domain [{lo!r}, {hi!r}]"',
			'            " and its extrapolation rule is \'refuse\'"',
			'        )'
		);
	}
	lines.push('    with np.errstate(all="ignore"):  # points outside are replaced below', '        f, df, d2f = _polynomial(x)');
	if (rule === 'hold') {
		lines.push(
			'    # hold: the edge value, flat',
			'    outside = below | above',
			'    f = np.where(below, F_LO, np.where(above, F_HI, f))',
			'    df = np.where(outside, 0.0, df)',
			'    d2f = np.where(outside, 0.0, d2f)'
		);
	} else if (rule === 'linear') {
		lines.push(
			'    # linear: the tangent line at the edge',
			'    outside = below | above',
			'    f = np.where(below, F_LO + DF_LO * (x - lo), np.where(above, F_HI + DF_HI * (x - hi), f))',
			'    df = np.where(below, DF_LO, np.where(above, DF_HI, df))',
			'    d2f = np.where(outside, 0.0, d2f)'
		);
	} else if (rule === 'extend') {
		lines.push('    # extend: the edge piece continues outside (already so in _polynomial)');
	}
	lines.push(
		'    return f, df, d2f',
		'',
		'',
		'def _evaluate_points(X):',
		'    """f, gradient and Hessian at the points X, shape (n, 1)."""',
		'    f, df, d2f = _curve(X[:, 0])',
		'    return f, df[:, None], d2f[:, None, None]'
	);
	return lines.join('\n');
}

/** TypeScript: the curve under its extrapolation rule, on top of `polynomial(x)`. */
function tsCurve(rule: string): string {
	const lines = [
		'/** The fit at its two ends (limits from inside the data), for the extrapolation rule. */',
		'const EDGE_LO = polynomial(DOMAIN[0][0]);',
		'const EDGE_HI = polynomial(DOMAIN[0][1]);',
		'',
		'/** f, df/dx, d2f/dx2 at x, the extrapolation rule applied. */',
		'function curve(x: number): Jet {',
		'\tconst [lo, hi] = DOMAIN[0];',
		'\tif (x >= lo && x <= hi) return polynomial(x);'
	];
	switch (rule) {
		case 'refuse':
			lines.push("\tthrow new RangeError(`${INPUT_NAMES[0]} = ${x} lies outside the fit's domain [${lo}, ${hi}] and its extrapolation rule is 'refuse'`);");
			break;
		case 'hold':
			lines.push('\t// hold: the edge value, flat', '\treturn { f: x < lo ? EDGE_LO.f : EDGE_HI.f, df: 0, d2f: 0 };');
			break;
		case 'linear':
			lines.push(
				'\t// linear: the tangent line at the edge',
				'\treturn x < lo',
				'\t\t? { f: EDGE_LO.f + EDGE_LO.df * (x - lo), df: EDGE_LO.df, d2f: 0 }',
				'\t\t: { f: EDGE_HI.f + EDGE_HI.df * (x - hi), df: EDGE_HI.df, d2f: 0 };'
			);
			break;
		default:
			lines.push('\t// extend: the edge piece continues outside', '\treturn polynomial(x);');
	}
	lines.push(
		'}',
		'',
		'function evaluatePoint(x: number[]): { f: number; grad: number[]; hess: number[][] | null } {',
		'\tconst j = curve(x[0]);',
		'\treturn { f: j.f, grad: [j.df], hess: [[j.d2f]] };',
		'}'
	);
	return lines.join('\n');
}

const TS_JET = '/** Value, first and second derivative at one point. */\ntype Jet = { f: number; df: number; d2f: number };';

function rule(fit: Body): string {
	return String(fit.extrapolation);
}

const piecewise: CodeEmitter = {
	inputCount: () => 1,
	domain: curveDomain,
	python(fit: Body, _ctx: EmitContext): string {
		const { knots, degree, rows } = piecewiseParts(fit);
		const stride = degree + 1;
		const names = ['c0', 'c1', 'c2', 'c3'].slice(0, stride);
		const formula = names.map((c, k) => (k === 0 ? c : k === 1 ? `${c}*s` : `${c}*s**${k}`)).join(' + ');
		const body: string[] = [
			`# Piece i covers [KNOTS[i], KNOTS[i+1]); a point on an interior knot belongs to the piece on`,
			`# its right, the last knot to the last piece. On piece i, with s = x - KNOTS[i]:`,
			`#     f = ${formula}    (row i of COEFFICIENTS)`,
			`DEGREE = ${degree}`,
			pyArray('KNOTS', knots, `${knots.length} knots, increasing`),
			`# ${rows.length} pieces: ${names.join(', ')}`,
			`COEFFICIENTS = np.array([\n${rows.map((r, i) => `    [${r.map(pyFloat).join(', ')}],  # piece ${i}`).join('\n')}\n])`,
			'',
			'',
			'def _polynomial(x):',
			'    """f, df/dx, d2f/dx2 of the piece polynomials at x (points outside use the end pieces)."""',
			'    i = np.clip(np.searchsorted(KNOTS, x, side="right") - 1, 0, len(KNOTS) - 2)',
			'    s = x - KNOTS[i]'
		];
		if (degree === 3) {
			body.push(
				'    c0, c1, c2, c3 = (COEFFICIENTS[i, k] for k in range(4))',
				'    f = c0 + s * (c1 + s * (c2 + s * c3))',
				'    df = c1 + s * (2.0 * c2 + 3.0 * c3 * s)',
				'    d2f = 2.0 * c2 + 6.0 * c3 * s'
			);
		} else if (degree === 2) {
			body.push(
				'    c0, c1, c2 = (COEFFICIENTS[i, k] for k in range(3))',
				'    f = c0 + s * (c1 + s * c2)',
				'    df = c1 + 2.0 * c2 * s',
				'    d2f = 2.0 * c2'
			);
		} else {
			body.push('    c0, c1 = COEFFICIENTS[i, 0], COEFFICIENTS[i, 1]', '    f = c0 + s * c1', '    df = c1', '    d2f = np.zeros_like(s)');
		}
		body.push('    return f, df, d2f', '', '', pythonCurve(rule(fit)));
		return body.join('\n');
	},
	typescript(fit: Body): string {
		const { knots, degree, rows } = piecewiseParts(fit);
		const names = ['c0', 'c1', 'c2', 'c3'].slice(0, degree + 1);
		const formula = names.map((c, k) => (k === 0 ? c : k === 1 ? `${c}·s` : `${c}·s^${k}`)).join(' + ');
		const out: string[] = [
			TS_JET,
			'',
			`/**`,
			` * Piece i covers [KNOTS[i], KNOTS[i+1]); a point on an interior knot belongs to the piece on`,
			` * its right, the last knot to the last piece. On piece i, with s = x − KNOTS[i]:`,
			` *     f = ${formula}    (row i of COEFFICIENTS)`,
			` */`,
			tsArray('KNOTS', knots, `${knots.length} knots, increasing`),
			`/** ${rows.length} pieces: ${names.join(', ')} */`,
			`const COEFFICIENTS: readonly (readonly number[])[] = [\n${rows.map((r, i) => `\t[${r.map(tsNumber).join(', ')}], // piece ${i}`).join('\n')}\n];`,
			'',
			'/** The piece holding x by bisection (points outside get the end pieces). */',
			'function pieceOf(x: number): number {',
			'\tlet lo = 0;',
			'\tlet hi = KNOTS.length - 1;',
			'\twhile (hi - lo > 1) {',
			'\t\tconst mid = (lo + hi) >>> 1;',
			'\t\tif (x < KNOTS[mid]) hi = mid;',
			'\t\telse lo = mid;',
			'\t}',
			'\treturn lo;',
			'}',
			'',
			'/** f, df/dx, d2f/dx2 of the piece polynomial holding x. */',
			'function polynomial(x: number): Jet {',
			'\tconst i = pieceOf(x);',
			'\tconst s = x - KNOTS[i];'
		];
		if (degree === 3) {
			out.push(
				'\tconst [c0, c1, c2, c3] = COEFFICIENTS[i];',
				'\treturn { f: c0 + s * (c1 + s * (c2 + s * c3)), df: c1 + s * (2 * c2 + 3 * c3 * s), d2f: 2 * c2 + 6 * c3 * s };'
			);
		} else if (degree === 2) {
			out.push('\tconst [c0, c1, c2] = COEFFICIENTS[i];', '\treturn { f: c0 + s * (c1 + s * c2), df: c1 + 2 * c2 * s, d2f: 2 * c2 };');
		} else {
			out.push('\tconst [c0, c1] = COEFFICIENTS[i];', '\treturn { f: c0 + s * c1, df: c1, d2f: 0 };');
		}
		out.push('}', '', tsCurve(rule(fit)));
		return out.join('\n');
	}
};

function piecewiseParts(fit: Body): { knots: Float64Array; degree: 1 | 2 | 3; rows: number[][] } {
	const degree = fit.degree;
	if (degree !== 1 && degree !== 2 && degree !== 3) throw new FitError('bad-fit-file', 'fit file: degree must be 1, 2 or 3');
	const knots = decodeArray(fit.knots, 'knots');
	const c = decodeArray(fit.coefficients, 'coefficients');
	const m = knots.length - 1;
	if (m < 1 || c.length !== (degree + 1) * m) throw new FitError('bad-fit-file', 'fit file: coefficients do not match the knots');
	const rows: number[][] = [];
	for (let i = 0; i < m; i++) rows.push(Array.from(c.subarray(i * (degree + 1), (i + 1) * (degree + 1))));
	return { knots, degree, rows };
}

const barycentric: CodeEmitter = {
	inputCount: () => 1,
	domain: curveDomain,
	python(fit: Body): string {
		const p = barycentricParts(fit);
		return [
			'# One polynomial through all nodes, second barycentric form:',
			'#     f(x) = sum_j [W_j/(x - X_j)] F_j / sum_j W_j/(x - X_j)',
			"# and f', f'' the same way from their values at the nodes (see the fit file's method notes).",
			pyArray('NODES', p.nodes, 'the nodes X_j (the data x, increasing)'),
			pyArray('VALUES', p.values, 'f at the nodes'),
			pyArray('WEIGHTS', p.weights, 'barycentric weights W_j'),
			pyArray('SLOPES', p.slopes, "f' at the nodes"),
			pyArray('CURVATURES', p.curvatures, "f'' at the nodes"),
			'',
			'',
			'def _polynomial(x):',
			'    """f, df/dx, d2f/dx2 of the polynomial at x (any x)."""',
			'    den = np.zeros_like(x)',
			'    nf = np.zeros_like(x)',
			'    n1 = np.zeros_like(x)',
			'    n2 = np.zeros_like(x)',
			'    node = np.full(x.shape, -1)',
			'    with np.errstate(divide="ignore", invalid="ignore"):',
			'        for j in range(len(NODES)):',
			'            dx = x - NODES[j]',
			'            node[dx == 0] = j',
			'            t = WEIGHTS[j] / dx',
			'            den = den + t',
			'            nf = nf + t * VALUES[j]',
			'            n1 = n1 + t * SLOPES[j]',
			'            n2 = n2 + t * CURVATURES[j]',
			'        f, df, d2f = nf / den, n1 / den, n2 / den',
			'    # At a node the formula is 0/0; the nodal values are the answer.',
			'    hit = node >= 0',
			'    f[hit], df[hit], d2f[hit] = VALUES[node[hit]], SLOPES[node[hit]], CURVATURES[node[hit]]',
			'    return f, df, d2f',
			'',
			'',
			pythonCurve(rule(fit))
		].join('\n');
	},
	typescript(fit: Body): string {
		const p = barycentricParts(fit);
		return [
			TS_JET,
			'',
			'/*',
			' * One polynomial through all nodes, second barycentric form:',
			' *     f(x) = Σ_j [W_j/(x − X_j)]·F_j / Σ_j W_j/(x − X_j)',
			" * and f′, f″ the same way from their values at the nodes.",
			' */',
			tsArray('NODES', p.nodes, 'the nodes X_j (the data x, increasing)'),
			tsArray('VALUES', p.values, 'f at the nodes'),
			tsArray('WEIGHTS', p.weights, 'barycentric weights W_j'),
			tsArray('SLOPES', p.slopes, 'f′ at the nodes'),
			tsArray('CURVATURES', p.curvatures, 'f″ at the nodes'),
			'',
			'/** f, df/dx, d2f/dx2 of the polynomial at x (any x). */',
			'function polynomial(x: number): Jet {',
			'\tlet den = 0;',
			'\tlet nf = 0;',
			'\tlet n1 = 0;',
			'\tlet n2 = 0;',
			'\tfor (let j = 0; j < NODES.length; j++) {',
			'\t\tconst dx = x - NODES[j];',
			'\t\t// At a node the formula is 0/0; the nodal values are the answer.',
			'\t\tif (dx === 0) return { f: VALUES[j], df: SLOPES[j], d2f: CURVATURES[j] };',
			'\t\tconst t = WEIGHTS[j] / dx;',
			'\t\tden += t;',
			'\t\tnf += t * VALUES[j];',
			'\t\tn1 += t * SLOPES[j];',
			'\t\tn2 += t * CURVATURES[j];',
			'\t}',
			'\treturn { f: nf / den, df: n1 / den, d2f: n2 / den };',
			'}',
			'',
			tsCurve(rule(fit))
		].join('\n');
	}
};

function barycentricParts(fit: Body) {
	const parts = {
		nodes: decodeArray(fit.nodes, 'nodes'),
		values: decodeArray(fit.values, 'values'),
		weights: decodeArray(fit.weights, 'weights'),
		slopes: decodeArray(fit.slopes, 'slopes'),
		curvatures: decodeArray(fit.curvatures, 'curvatures')
	};
	const n = parts.nodes.length;
	if (n < 1 || [parts.values, parts.weights, parts.slopes, parts.curvatures].some((a) => a.length !== n)) {
		throw new FitError('bad-fit-file', 'fit file: nodes, values, weights, slopes and curvatures must have one entry per node');
	}
	return parts;
}

const scaledPolynomial: CodeEmitter = {
	inputCount: () => 1,
	domain: curveDomain,
	python(fit: Body): string {
		const { center, scale, a } = scaledParts(fit);
		return [
			'# One polynomial in t = (x - CENTER) / SCALE:  f = sum_k A[k] * t**k',
			`CENTER = ${pyFloat(center)}`,
			`SCALE = ${pyFloat(scale)}`,
			pyArray('A', a, 'coefficients, ascending powers of t'),
			'',
			'',
			'def _polynomial(x):',
			'    """f, df/dx, d2f/dx2 of the polynomial at x (Horner, with its first two derivatives)."""',
			'    t = (x - CENTER) / SCALE',
			'    p = np.full_like(t, A[-1])',
			'    p1 = np.zeros_like(t)',
			"    p2 = np.zeros_like(t)  # p''/2",
			'    for k in range(len(A) - 2, -1, -1):',
			'        p2 = p2 * t + p1',
			'        p1 = p1 * t + p',
			'        p = p * t + A[k]',
			'    return p, p1 / SCALE, (2.0 * p2) / (SCALE * SCALE)',
			'',
			'',
			pythonCurve(rule(fit))
		].join('\n');
	},
	typescript(fit: Body): string {
		const { center, scale, a } = scaledParts(fit);
		return [
			TS_JET,
			'',
			'/* One polynomial in t = (x − CENTER) / SCALE:  f = Σ_k A[k]·t^k */',
			`const CENTER = ${tsNumber(center)};`,
			`const SCALE = ${tsNumber(scale)};`,
			tsArray('A', a, 'coefficients, ascending powers of t'),
			'',
			'/** f, df/dx, d2f/dx2 of the polynomial at x (Horner, with its first two derivatives). */',
			'function polynomial(x: number): Jet {',
			'\tconst t = (x - CENTER) / SCALE;',
			'\tlet p = A[A.length - 1];',
			'\tlet p1 = 0;',
			'\tlet p2 = 0; // p″/2',
			'\tfor (let k = A.length - 2; k >= 0; k--) {',
			'\t\tp2 = p2 * t + p1;',
			'\t\tp1 = p1 * t + p;',
			'\t\tp = p * t + A[k];',
			'\t}',
			'\treturn { f: p, df: p1 / SCALE, d2f: (2 * p2) / (SCALE * SCALE) };',
			'}',
			'',
			tsCurve(rule(fit))
		].join('\n');
	}
};

function scaledParts(fit: Body) {
	const a = decodeArray(fit.coefficients, 'coefficients');
	if (a.length < 1) throw new FitError('bad-fit-file', 'fit file: a polynomial needs at least one coefficient');
	return { center: decodeNumber(fit.center, 'center'), scale: decodeNumber(fit.scale, 'scale'), a };
}

registerEmitter('piecewise-polynomial', piecewise);
registerEmitter('barycentric', barycentric);
registerEmitter('polynomial', scaledPolynomial);
