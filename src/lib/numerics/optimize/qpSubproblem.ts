/**
 * The SQP quadratic subproblem
 *   minimize ½ dᵀBd + gᵀd
 *   s.t. cᵢ + ∇cᵢᵀd = 0 (eq),  cᵢ + ∇cᵢᵀd ≤ 0 (ineq),  dLo ≤ d ≤ dHi,
 * solved by the dual active-set method of D. Goldfarb, A. Idnani, "A
 * numerically stable dual method for solving strictly convex quadratic
 * programs", Math. Programming 27:1–33, 1983 (npm `quadprog`, a port of the
 * Fortran QuadProg: minimize ½dᵀDd − dvecᵀd s.t. Aᵀd ≥ b, first `meq` rows
 * equalities; arrays are 1-based, index 0 unused; `message` is '' on success).
 *
 * Elastic form, for when the linearized constraints are inconsistent (the ℓ1
 * relaxation of R. Fletcher, "An ℓ1 penalty method for nonlinear constraints",
 * in Numerical Optimization 1984, SIAM 1985, pp. 26–40; the Sℓ1QP subproblem
 * of Nocedal & Wright, Numerical Optimization, 2nd ed. 2006, §18.5):
 *   minimize ½dᵀBd + gᵀd + Σ νᵢtᵢ + ½ε‖t‖²
 *   s.t. −tᵢ ≤ cᵢ + ∇cᵢᵀd ≤ tᵢ (eq),  cᵢ + ∇cᵢᵀd ≤ tᵢ (ineq),  t ≥ 0,  bounds on d.
 * It is always feasible (bounds on d are consistent because the iterate is
 * inside the box). The small ε·I on t keeps the matrix positive definite, as
 * the Goldfarb–Idnani method requires.
 */
import { solveQP } from 'quadprog';

export interface LinearizedConstraint {
	kind: 'ineq' | 'eq';
	value: number;
	grad: number[];
}

export interface QpSolution {
	status: 'ok' | 'infeasible' | 'failed';
	d: number[];
	/** per general constraint, for L = F + Σλᵢcᵢ: ≥ 0 for ineq */
	lambda: number[];
	zLo: number[];
	zHi: number[];
	/** labels of the active constraints: c<i>, lo<j>, hi<j> */
	active: string[];
	/** elastic slacks (zeros for the ordinary QP) */
	slack: number[];
}

interface Column {
	a: number[];
	b: number;
	/** what the column stands for */
	tag: { type: 'eq' | 'eq+' | 'eq-' | 'ineq' | 'lo' | 'hi' | 'slack'; index: number };
}

export function solveQpSubproblem(
	B: number[][],
	g: number[],
	cons: LinearizedConstraint[],
	dLo: number[],
	dHi: number[],
	elastic: { weights: number[]; reg: number } | null = null
): QpSolution {
	const n = g.length;
	const m = cons.length;
	const nv = elastic ? n + m : n;
	const cols: Column[] = [];
	const pad = (a: number[]) => (elastic ? [...a, ...new Array<number>(m).fill(0)] : a);
	const slackCol = (a: number[], i: number) => {
		a[n + i] = 1;
		return a;
	};
	let meq = 0;
	if (!elastic) {
		cons.forEach((c, i) => {
			if (c.kind === 'eq') cols.push({ a: c.grad.slice(), b: -c.value, tag: { type: 'eq', index: i } });
		});
		meq = cols.length;
		cons.forEach((c, i) => {
			if (c.kind === 'ineq') cols.push({ a: c.grad.map((v) => -v), b: c.value, tag: { type: 'ineq', index: i } });
		});
	} else {
		cons.forEach((c, i) => {
			if (c.kind === 'eq') {
				cols.push({ a: slackCol(pad(c.grad.slice()), i), b: -c.value, tag: { type: 'eq+', index: i } });
				cols.push({ a: slackCol(pad(c.grad.map((v) => -v)), i), b: c.value, tag: { type: 'eq-', index: i } });
			} else cols.push({ a: slackCol(pad(c.grad.map((v) => -v)), i), b: c.value, tag: { type: 'ineq', index: i } });
			const t = new Array<number>(nv).fill(0);
			t[n + i] = 1;
			cols.push({ a: t, b: 0, tag: { type: 'slack', index: i } });
		});
	}
	for (let j = 0; j < n; j++) {
		if (dLo[j] > -Infinity) {
			const a = new Array<number>(nv).fill(0);
			a[j] = 1;
			cols.push({ a, b: dLo[j], tag: { type: 'lo', index: j } });
		}
		if (dHi[j] < Infinity) {
			const a = new Array<number>(nv).fill(0);
			a[j] = -1;
			cols.push({ a, b: -dHi[j], tag: { type: 'hi', index: j } });
		}
	}
	if (cols.length === 0) {
		// quadprog needs at least one constraint: 0ᵀd ≥ −1 is never active
		cols.push({ a: new Array<number>(nv).fill(0), b: -1, tag: { type: 'slack', index: -1 } });
	}
	// The objective divided by σ, the power of two nearest B's largest diagonal entry (exact in
	// floating point): the minimizer is the same, the multipliers come back times σ. quadprog's
	// tests for a dependent or violated constraint compare against the objective's size, so
	// without it the same QP with f in other units (B and g times 1e6) read as inconsistent.
	let bMax = 0;
	for (let i = 0; i < n; i++) bMax = Math.max(bMax, Math.abs(B[i][i]));
	const sigma = bMax > 0 && Number.isFinite(bMax) ? 2 ** Math.round(Math.log2(bMax)) : 1;
	// 1-based arrays for quadprog
	const q = cols.length;
	const Dmat: number[][] = [[]];
	const dvec: number[] = [0];
	for (let i = 0; i < nv; i++) {
		const row = [0];
		for (let j = 0; j < nv; j++) row.push((i < n && j < n ? B[i][j] : i === j ? (elastic as { reg: number }).reg : 0) / sigma);
		Dmat.push(row);
		dvec.push((i < n ? -g[i] : -(elastic as { weights: number[] }).weights[i - n]) / sigma);
	}
	const Amat: number[][] = [[]];
	for (let i = 0; i < nv; i++) {
		const row = [0];
		for (let j = 0; j < q; j++) row.push(cols[j].a[i]);
		Amat.push(row);
	}
	const bvec = [0, ...cols.map((c) => c.b)];
	const empty: QpSolution = {
		status: 'failed',
		d: new Array<number>(n).fill(0),
		lambda: new Array<number>(m).fill(0),
		zLo: new Array<number>(n).fill(0),
		zHi: new Array<number>(n).fill(0),
		active: [],
		slack: new Array<number>(m).fill(0)
	};
	let res: ReturnType<typeof solveQP>;
	try {
		res = solveQP(Dmat, dvec, Amat, bvec, meq);
	} catch {
		return empty;
	}
	if (res.message) return { ...empty, status: /inconsistent/.test(res.message) ? 'infeasible' : 'failed' };
	// quadprog negates an equality row in place (Amat column and bvec entry) when
	// the current point lies on its positive side, and then reports the multiplier
	// of the negated row (qpgen2's start-up and add-constraint steps). Compare each
	// equality column with the one we built: where the net effect is a flip, the
	// reported multiplier has the opposite sign of the row we stated.
	const flipped = (j: number): boolean => {
		const a = cols[j].a;
		let at = -1;
		for (let i = 0; i < nv; i++) if (a[i] !== 0 && (at < 0 || Math.abs(a[i]) > Math.abs(a[at]))) at = i;
		if (at >= 0) return Math.sign(Amat[at + 1][j + 1]) !== Math.sign(a[at]);
		return cols[j].b !== 0 && Math.sign(bvec[j + 1]) !== Math.sign(cols[j].b);
	};
	const sol = res.solution;
	const d = new Array<number>(n);
	for (let i = 0; i < n; i++) d[i] = sol[i + 1];
	if (!d.every(Number.isFinite)) return empty;
	const slack = new Array<number>(m).fill(0);
	if (elastic) for (let i = 0; i < m; i++) slack[i] = Math.max(0, sol[n + i + 1]);
	const lambda = new Array<number>(m).fill(0);
	const zLo = new Array<number>(n).fill(0);
	const zHi = new Array<number>(n).fill(0);
	for (let j = 0; j < q; j++) {
		let u = (res.Lagrangian[j + 1] ?? 0) * sigma;
		if (!u) continue;
		if (j < meq && flipped(j)) u = -u;
		const { type, index } = cols[j].tag;
		// quadprog's stationarity: Dd − dvec = Σ uⱼaⱼ, i.e. Bd + g − Σ uⱼaⱼ = 0
		if (type === 'eq') lambda[index] -= u;
		else if (type === 'eq+') lambda[index] -= u;
		else if (type === 'eq-') lambda[index] += u;
		else if (type === 'ineq') lambda[index] += u;
		else if (type === 'lo') zLo[index] += u;
		else if (type === 'hi') zHi[index] += u;
	}
	const active = new Set<string>();
	for (let k = 1; k < res.iact.length; k++) {
		const j = res.iact[k];
		if (!j) continue;
		const { type, index } = cols[j - 1].tag;
		if (type === 'lo' || type === 'hi') active.add(`${type}${index}`);
		else if (type !== 'slack') active.add(`c${index}`);
	}
	cons.forEach((c, i) => {
		if (c.kind === 'eq') active.add(`c${i}`);
	});
	return { status: 'ok', d, lambda, zLo, zHi, active: [...active].sort(), slack };
}
