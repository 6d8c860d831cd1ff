/**
 * Newton's method, in three uses.
 *
 * 1. Stationary points (`minimize` / `maximize`): the pure Newton iteration on
 *    ∇F = 0, x⁺ = P(x − ∇²F(x)⁻¹∇F(x)) (Nocedal & Wright, Numerical
 *    Optimization, 2nd ed. 2006, §3.3 and eq. 3.38), with the objective's
 *    Hessian (forward differences of the gradient if it gives none, noted).
 *    Deliberately undamped: it shows why C2 matters. It converges
 *    quadratically where f″ is continuous near the solution; where f″ jumps
 *    between pieces (a C1 fit) the curvature used by one step can be wrong for
 *    the next, and the iterates may cycle. Cycling is detected (an iterate returns
 *    to within stepTol of one of the last 8) and reported as `stalled`; a
 *    singular Hessian (f″ = 0, e.g. on a linear fit) ends the run as `stalled`;
 *    a stationary point that is not a minimum of F fails the second-order check.
 *    Inputs on a bound whose gradient points out of the box are held fixed.
 *
 * 2. `solve` with one input, f(x) = target: safeguarded Newton with bracketing
 *    (the scheme of `rtsafe`, W. H. Press, S. A. Teukolsky, W. T. Vetterling,
 *    B. P. Flannery, Numerical Recipes, 3rd ed. 2007, §9.4): once a sign change
 *    of r = f − target is known, a Newton step that leaves the bracket or does
 *    not halve |r| is replaced by bisection; without a bracket, a step that
 *    is undefined (f′ = 0) or pinned at a bound makes the method evaluate the
 *    bounds to find one. A bracket that shrinks below stepTol without |r|
 *    reaching the tolerance means f jumps across the target (a step, a
 *    discontinuity): `stalled`, never `converged`.
 *
 * 3. `solve` with several inputs: the equations r(x) = (f(x) − target,
 *    h₁(x), …) — the objective and the equality constraints. Square systems
 *    take the Newton step J d = −r (LU with pivoting); others, or a singular J,
 *    the minimum-norm / least-squares step with a small Levenberg–Marquardt
 *    shift (J. J. Moré, "The Levenberg–Marquardt algorithm: implementation and
 *    theory", in Numerical Analysis, Springer LNM 630, 1978). Damped by backtracking
 *    on ½‖r‖² with the Armijo test (N&W §11.2, Algorithm 11.4 without trust
 *    region); steps are projected into the bounds. Inequality constraints are
 *    checked at the root: a root that violates one is `stalled`.
 */
import { allFinite, dot, EPS, luSolve, normInf } from './linalg';
import { fmt, Run, scaleOf, type Point } from './run';
import { conclude } from './secondOrder';
import type { OptimizeOptions, Problem, RunResult } from './types';

export function newton(problem: Problem, options: OptimizeOptions, start: number[]): RunResult {
	const solve = problem.kind === 'solve';
	const run: Run = new Run(problem, 'newton', options, { maxIterations: 100 }, true);
	const eqCount = (problem.objective.constraints ?? []).filter((c) => c.kind === 'eq').length;
	if (!solve) return stationary(run, start);
	if (run.n === 1 && eqCount === 0) return solveScalar(run, start);
	return solveSystem(run, start);
}

/** forward-difference Hessian of the minimized function from gradients (N&W eq. 8.20), symmetrized */
function differenceHessian(run: Run, p: Point): number[][] | null {
	const n = run.n;
	const g = p.grad;
	const H: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
	for (let j = 0; j < n; j++) {
		let h = Math.sqrt(EPS) * Math.max(1, Math.abs(p.x[j]));
		if (p.x[j] + h > run.hi[j]) h = -h;
		const y = p.x.slice();
		y[j] += h;
		const q = run.evaluate(y);
		const gq = q.grad;
		if (!allFinite(gq)) return null;
		for (let i = 0; i < n; i++) H[i][j] = (gq[i] - g[i]) / h;
	}
	for (let i = 0; i < n; i++)
		for (let j = 0; j < i; j++) H[i][j] = H[j][i] = 0.5 * (H[i][j] + H[j][i]);
	return H;
}

function stationary(run: Run, start: number[]): RunResult {
	return run.guard(() => {
		const n = run.n;
		const { stepTol } = run.settings;
		let p = run.evaluate(run.prepareStart(start));
		if (!Number.isFinite(p.f) || !allFinite(p.grad)) run.stop('diverged', `f or ∇f is not finite at the start ${fmt(p.x)}`, p);
		run.record(p);
		const recent: number[][] = [p.x];
		let noted = false;
		for (;;) {
			const x = p.x;
			const g = p.grad;
			const pg = run.projectedGradNorm(x, g);
			if (run.firstOrderMet(p, pg)) return conclude(run, p, `‖projected ∇f‖∞ = ${pg.toExponential(2)} within tolerance`);
			run.beginIteration();
			let H = p.hess;
			if (!H) {
				if (!noted) {
					run.notes.push('the objective gives no Hessian: forward differences of the gradient');
					noted = true;
				}
				H = differenceHessian(run, p);
			}
			if (!H || !H.every(allFinite)) run.stop('stalled', `the Hessian is not finite at ${fmt(x)}`);
			const free: number[] = [];
			for (let i = 0; i < n; i++) if (!((x[i] <= run.lo[i] && g[i] > 0) || (x[i] >= run.hi[i] && g[i] < 0))) free.push(i);
			if (free.length === 0) run.stop('stalled', `every input is held at a bound with ∇f pointing out of the box at ${fmt(x)}`);
			const dF = luSolve(
				free.map((i) => free.map((j) => H[i][j])),
				free.map((i) => -g[i])
			);
			if (!dF)
				run.stop('stalled', `the Hessian is singular at ${fmt(x)}${n === 1 ? ` (f″ = ${H[0][0].toPrecision(3)})` : ''}: the Newton step is undefined`);
			const y = x.slice();
			free.forEach((i, k) => (y[i] += dF[k]));
			const q = run.evaluate(run.project(y));
			if (!Number.isFinite(q.f) || !allFinite(q.grad)) {
				run.record(q);
				run.stop('diverged', `f or ∇f is not finite at the Newton step from ${fmt(x)}`, q);
			}
			run.record(q);
			if (normInf(q.x) > 1e150) run.stop('diverged', `iterates diverge (‖x‖∞ = ${normInf(q.x).toExponential(2)})`, q);
			const scale = stepTol * scaleOf(q.x);
			const moved = normInf(q.x.map((v, i) => v - x[i]));
			p = q;
			if (moved <= scale) {
				if (run.firstOrderMet(p, run.projectedGradNorm(p.x, p.grad))) continue;
				run.stop('stalled', `the Newton step vanishes at ${fmt(p.x)} but ‖projected ∇f‖∞ = ${run.projectedGradNorm(p.x, p.grad).toExponential(2)}`);
			}
			// cycle: the new iterate returns to one of the last few (not the previous one)
			const tolCycle = Math.max(scale, 1e-12 * scaleOf(q.x));
			for (let k = recent.length - 2; k >= 0; k--) {
				if (normInf(q.x.map((v, i) => v - recent[k][i])) <= tolCycle) {
					const period = recent.length - k;
					if (run.firstOrderMet(p, run.projectedGradNorm(p.x, p.grad))) break;
					run.stop(
						'stalled',
						`Newton iterates cycle with period ${period} through ${fmt(q.x)} and ${fmt(recent[recent.length - 1])} (‖∇f‖ stays ${run.projectedGradNorm(p.x, p.grad).toExponential(2)}): the curvature changes between steps, as where f″ jumps at knots`
					);
				}
			}
			recent.push(q.x);
			if (recent.length > 9) recent.shift();
		}
	});
}

function solveScalar(run: Run, start: number[]): RunResult {
	return run.guard(() => {
		const t = run.target;
		const lo = run.lo[0];
		const hi = run.hi[0];
		const widthTol = (v: number) => Math.max(run.settings.stepTol, 4 * EPS) * (1 + Math.abs(v));
		let p = run.evaluate(run.prepareStart(start));
		if (!Number.isFinite(p.userF)) run.stop('diverged', `f is not finite at the start ${fmt(p.x)}`, p);
		let r = p.userF - t;
		const tolR = run.residualTolerance(Math.abs(r));
		run.record(p, { merit: Math.abs(r) });
		// bracket [a, b] with r(a)·r(b) < 0, when known
		let a = NaN;
		let b = NaN;
		let ra = NaN;
		let probedBounds = false;
		let rPrev = Infinity;
		let bestAbs = Math.abs(r);
		let noImprove = 0;
		const setBracket = (x1: number, r1: number, x2: number, r2: number) => {
			if (x1 < x2) [a, ra, b] = [x1, r1, x2];
			else [a, ra, b] = [x2, r2, x1];
		};
		const probeBounds = (x: number, rx: number): boolean => {
			probedBounds = true;
			for (const edge of [lo, hi]) {
				if (!Number.isFinite(edge) || edge === x) continue;
				const q = run.evaluate([edge]);
				const rq = q.userF - t;
				if (Number.isFinite(rq) && Math.abs(rq) <= tolR) run.stop('converged', `f = target at the bound x = ${edge} (|f − target| = ${Math.abs(rq).toExponential(2)})`, q);
				if (Number.isFinite(rq) && Math.sign(rq) !== Math.sign(rx)) {
					setBracket(x, rx, edge, rq);
					return true;
				}
			}
			return false;
		};
		for (;;) {
			const x = p.x[0];
			if (Math.abs(r) <= tolR) return run.finish(p, 'converged', `f = target within tolerance (|f − target| = ${Math.abs(r).toExponential(2)})`);
			run.beginIteration();
			const dr = p.userGrad[0];
			const newtonX = Number.isFinite(dr) && dr !== 0 ? x - r / dr : NaN;
			const bracketed = Number.isFinite(a);
			let next: number;
			if (bracketed) {
				// Newton while it stays inside the bracket and at least halves |r|; else bisection
				const inside = newtonX > a && newtonX < b;
				next = inside && Math.abs(r) <= 0.5 * Math.abs(rPrev) ? newtonX : 0.5 * (a + b);
			} else if (!Number.isFinite(newtonX)) {
				if (probedBounds || !probeBounds(x, r))
					run.stop('stalled', `f′ = 0 at ${fmt(p.x)} and no sign change of f − target was found${Number.isFinite(lo) || Number.isFinite(hi) ? ' at the bounds' : ''}: no root reachable`);
				continue;
			} else {
				next = Math.min(hi, Math.max(lo, newtonX));
				if (next === x) {
					if (probedBounds || !probeBounds(x, r))
						run.stop('stalled', `the Newton step leaves the bounds at ${fmt(p.x)} and f − target has one sign at the bounds: no root inside`);
					continue;
				}
			}
			let q = run.evaluate([next]);
			for (let k = 0; k < 40 && !Number.isFinite(q.userF); k++) {
				next = x + 0.5 * (next - x);
				q = run.evaluate([next]);
			}
			if (!Number.isFinite(q.userF)) run.stop('diverged', `f is not finite near the step from ${fmt(p.x)}`);
			const rq = q.userF - t;
			if (Number.isFinite(a)) {
				if (Math.sign(rq) === Math.sign(ra)) {
					a = next;
					ra = rq;
				} else b = next;
			} else if (rq !== 0 && Math.sign(rq) !== Math.sign(r)) setBracket(x, r, next, rq);
			run.record(q, { merit: Math.abs(rq) });
			rPrev = r;
			const moved = Math.abs(next - x);
			p = q;
			r = rq;
			if (Math.abs(r) <= tolR) continue;
			if (Number.isFinite(a) && b - a <= widthTol(next))
				run.stop('stalled', `f − target changes sign within [${a.toPrecision(10)}, ${b.toPrecision(10)}] but |f − target| stays ${Math.abs(r).toExponential(2)}: f jumps across the target (a step or discontinuity)`);
			if (!Number.isFinite(a) && moved <= widthTol(next))
				run.stop('stalled', `no progress at ${fmt(p.x)}: |f − target| = ${Math.abs(r).toExponential(2)}`);
			// without a bracket, Newton can wander (e.g. bounce between the bounds): look for one, else stop
			if (Math.abs(r) < bestAbs) {
				bestAbs = Math.abs(r);
				noImprove = 0;
			} else noImprove++;
			if (!Number.isFinite(a) && noImprove >= 4) {
				if (probedBounds || !probeBounds(p.x[0], r))
					run.stop('stalled', `no root found: |f − target| stops decreasing (best ${bestAbs.toExponential(2)}) and no sign change was found${Number.isFinite(lo) || Number.isFinite(hi) ? ' at the bounds' : ''}`);
			}
		}
	});
}

function solveSystem(run: Run, start: number[]): RunResult {
	return run.guard(() => {
		const n = run.n;
		const cs = run.problem.objective.constraints ?? [];
		const eqIdx = cs.map((c, i) => (c.kind === 'eq' ? i : -1)).filter((i) => i >= 0);
		const ineqIdx = cs.map((c, i) => (c.kind === 'ineq' ? i : -1)).filter((i) => i >= 0);
		const t = run.target;
		const residual = (q: Point) => {
			const C = cs.length ? q.constraints() : { values: [], grads: [] };
			const r = [q.userF - t, ...eqIdx.map((i) => C.values[i])];
			return { r, C };
		};
		const jacobian = (q: Point, C: { grads: number[][] }) => [q.userGrad, ...eqIdx.map((i) => C.grads[i])];
		const half = (r: number[]) => 0.5 * dot(r, r);

		let p = run.evaluate(run.prepareStart(start));
		let { r, C } = residual(p);
		const tolR = run.residualTolerance(normInf(r));
		if (!allFinite(r)) run.stop('diverged', `f or a constraint is not finite at the start ${fmt(p.x)}`, p);
		run.record(p, { merit: normInf(r), violation: C.values.length ? run.violation(C.values) : 0 });
		for (;;) {
			const x = p.x;
			if (normInf(r) <= tolR) {
				const bad = ineqIdx.filter((i) => C.values[i] > run.settings.feasTol);
				if (bad.length) run.stop('stalled', `root found, but it violates inequality constraint${bad.length > 1 ? 's' : ''} ${bad.map((i) => cs[i].label ?? `c${i}`).join(', ')}`, p);
				return run.finish(p, 'converged', `residuals within tolerance (max |r| = ${normInf(r).toExponential(2)})`);
			}
			run.beginIteration();
			const J = jacobian(p, C);
			if (!J.every(allFinite)) run.stop('stalled', `the Jacobian is not finite at ${fmt(x)}`);
			const m = J.length;
			const Jtr = new Array<number>(n).fill(0);
			for (let k = 0; k < m; k++) for (let j = 0; j < n; j++) Jtr[j] += J[k][j] * r[k];
			let d: number[] | null = m === n ? luSolve(J, r.map((v) => -v)) : null;
			if (!d) {
				// minimum-norm (m ≤ n) or least-squares (m > n) step with a small shift
				let trace = 0;
				for (const row of J) trace += dot(row, row);
				const mu = 1e-10 * Math.max(trace, 1e-300);
				if (m <= n) {
					const JJt = J.map((ri, a) => J.map((rj, b) => dot(ri, rj) + (a === b ? mu : 0)));
					const w = luSolve(JJt, r.map((v) => -v), 0);
					if (w) {
						d = new Array<number>(n).fill(0);
						for (let k = 0; k < m; k++) for (let j = 0; j < n; j++) d[j] += J[k][j] * w[k];
					}
				} else {
					const JtJ = Array.from({ length: n }, (_, a) => Array.from({ length: n }, (_, b) => J.reduce((s, row) => s + row[a] * row[b], 0) + (a === b ? mu : 0)));
					d = luSolve(JtJ, Jtr.map((v) => -v), 0);
				}
			}
			if (!d || !allFinite(d)) run.stop('stalled', `the Jacobian is singular at ${fmt(x)}: no Newton step (∇f = 0?)`);
			let D = dot(Jtr, d);
			if (!(D < 0)) {
				d = Jtr.map((v) => -v);
				D = -dot(Jtr, Jtr);
			}
			const phi0 = half(r);
			let alpha = 1;
			let accepted: { q: Point; r: number[]; C: { values: number[]; grads: number[][] } } | null = null;
			const tiny = run.settings.stepTol * scaleOf(x);
			for (let k = 0; k < 60 && alpha * normInf(d) > tiny; k++) {
				const q = run.evaluate(run.project(x.map((v, j) => v + alpha * (d as number[])[j])));
				const rq = Number.isFinite(q.userF) ? residual(q) : null;
				const phi = rq && allFinite(rq.r) ? half(rq.r) : NaN;
				if (rq && Number.isFinite(phi) && phi <= phi0 + 1e-4 * alpha * D) {
					accepted = { q, r: rq.r, C: rq.C };
					break;
				}
				let nextAlpha = 0.5 * alpha;
				if (Number.isFinite(phi)) {
					const den = 2 * (phi - phi0 - alpha * D);
					if (den > 0) nextAlpha = Math.min(0.5 * alpha, Math.max(0.1 * alpha, (-D * alpha * alpha) / den));
				}
				alpha = nextAlpha;
			}
			if (!accepted) run.stop('stalled', `no step reduces the residual from ${fmt(x)} (max |r| = ${normInf(r).toExponential(2)}): a local minimum of ‖r‖, not a root`);
			p = accepted.q;
			r = accepted.r;
			C = accepted.C;
			run.record(p, { merit: normInf(r), violation: C.values.length ? run.violation(C.values) : 0 });
			if (normInf(p.x) > 1e150) run.stop('diverged', `iterates diverge (‖x‖∞ = ${normInf(p.x).toExponential(2)})`, p);
		}
	});
}
