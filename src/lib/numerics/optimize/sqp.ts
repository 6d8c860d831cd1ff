/**
 * Sequential quadratic programming for
 *   minimize F(x)  s.t.  lo ≤ x ≤ hi,  gᵢ(x) ≤ 0,  hⱼ(x) = 0.
 *
 * - Hessian of the Lagrangian: damped BFGS, kept positive definite (Powell 1978,
 *   see quasiNewton.ts), started from the identity; y = ∇L(x⁺, λ⁺) − ∇L(x, λ⁺)
 *   (Nocedal & Wright, Numerical Optimization, 2nd ed. 2006, eq. 18.13).
 * - Subproblem: the QP of N&W eq. 18.11 by the Goldfarb–Idnani dual active-set
 *   method (qpSubproblem.ts); bounds enter as inequalities, so every iterate
 *   stays in the box (the start is projected into it first).
 * - Merit: the ℓ1 function φ(x) = F(x) + Σ μᵢ·viol(cᵢ(x)) with one weight per
 *   constraint updated by Powell's rule μᵢ ← max(|λᵢ|, ½(μᵢ + |λᵢ|)) (Powell
 *   1978), which keeps the QP step a descent direction for φ (N&W Thm 18.2).
 *   Directional derivative D = ∇Fᵀd − Σ μᵢ viol(cᵢ) + Σ μᵢ viol(cᵢ + ∇cᵢᵀd)
 *   (the last sum is zero unless the elastic QP was used).
 * - Line search: backtracking on φ with the Armijo test φ(x + αd) ≤ φ(x) + ηαD,
 *   η = 1e-4, α from safeguarded quadratic interpolation in [0.1α, 0.5α]
 *   (N&W Algorithm 3.1 and §3.5). If the full step is rejected because the
 *   constraints' curvature raised the violation, one second-order correction is
 *   tried (N&W Algorithm 18.3): d̂ = −Aᵀ(AAᵀ)⁻¹c(x + d) over the active constraints.
 * - Stop: the KKT conditions at x with the QP's multipliers — stationarity
 *   ‖∇F + Σλᵢ∇cᵢ − z_lo + z_hi‖∞ and complementarity max |λᵢcᵢ|, |z·(x − bound)|
 *   both ≤ gradTol·max(1, ‖∇F(start)‖∞) (a gradient scale, so an offset in F
 *   changes nothing), feasibility max viol ≤ feasTol — then the
 *   second-order check on the null space of the active constraints.
 *
 * Fallbacks (documented outcomes, never silent):
 * - The linearized constraints are inconsistent (QP infeasible): solve the
 *   elastic ℓ1 QP (Fletcher's Sℓ1QP; qpSubproblem.ts) with weights
 *   ν = 10·max(1, μ, ‖∇F‖∞) and raise the merit weights to ν. If that step does
 *   not decrease φ, the run is `stalled` as locally infeasible.
 * - The QP fails numerically: reset B to I (counted) and retry once; then a
 *   steepest-descent step on φ (the gradient of F plus the weighted gradients
 *   of the violated constraints, with components that would leave the box set to zero).
 * - The line search fails: reset B to I (counted) and retry once; then `stalled`.
 */
import { allFinite, dot, identity, luSolve, norm2, normInf } from './linalg';
import { dampedBfgsUpdate } from './quasiNewton';
import { solveQpSubproblem, type LinearizedConstraint, type QpSolution } from './qpSubproblem';
import { fmt, Run, scaleOf, type Point } from './run';
import { conclude } from './secondOrder';
import type { KktResiduals, OptimizeOptions, Problem, RunResult } from './types';

const ETA = 1e-4;

export function sqp(problem: Problem, options: OptimizeOptions, start: number[]): RunResult {
	const run: Run = new Run(problem, 'sqp', options, { maxIterations: 500 });
	return run.guard(() => {
		const n = run.n;
		const cs = problem.objective.constraints ?? [];
		const m = cs.length;
		const kinds = cs.map((c) => c.kind);
		const { feasTol, stepTol } = run.settings;

		const viol = (values: number[], i: number) => (kinds[i] === 'eq' ? Math.abs(values[i]) : Math.max(0, values[i]));
		const weights = new Array<number>(m).fill(0);
		const merit = (q: Point) => {
			const { values } = q.constraints();
			let s = q.f;
			for (let i = 0; i < m; i++) s += weights[i] * viol(values, i);
			return s;
		};
		let lambda = new Array<number>(m).fill(0);
		const gradL = (q: Point) => {
			const g = q.grad.slice();
			const { grads } = q.constraints();
			for (let i = 0; i < m; i++) if (lambda[i]) for (let j = 0; j < n; j++) g[j] += lambda[i] * grads[i][j];
			return g;
		};
		const valueL = (q: Point) => {
			const { values } = q.constraints();
			let s = q.f;
			for (let i = 0; i < m; i++) s += lambda[i] * values[i];
			return s;
		};

		let p = run.evaluate(run.prepareStart(start));
		if (!Number.isFinite(p.f) || !allFinite(p.grad)) run.stop('diverged', `f or ∇f is not finite at the start ${fmt(p.x)}`, p);
		let C = p.constraints();
		if (!allFinite(C.values) || !C.grads.every(allFinite)) run.stop('diverged', `a constraint is not finite at the start ${fmt(p.x)}`, p);
		run.record(p, { violation: run.violation(C.values), merit: p.f });

		// B starts as max(1, ‖∇F(start)‖∞)·I, the stopping test's gradient scale: the first
		// QP step is then −∇F/‖∇F‖∞ (clipped by the box) whatever the units of f, so scaling f
		// changes no step (above the floor 1, as for the stopping test); a reset returns to it
		const b0 = run.gradScale();
		let B = identity(n, b0);
		const resetB = () => identity(n, b0);
		let fresh = true;
		let firstWeights = true;
		let slow = 0;
		let retryNote = '';
		// a no-progress verdict waits until the new point has had its KKT test
		let stall = '';

		const linearized = (Cq: { values: number[]; grads: number[][] }): LinearizedConstraint[] =>
			cs.map((c, i) => ({ kind: c.kind, value: Cq.values[i], grad: Cq.grads[i] }));

		for (;;) {
			const x = p.x;
			const g = p.grad;
			const dLo = x.map((v, j) => run.lo[j] - v);
			const dHi = x.map((v, j) => run.hi[j] - v);
			const lin = linearized(C);
			let qp: QpSolution = solveQpSubproblem(B, g, lin, dLo, dHi);
			if (qp.status === 'failed' && !fresh) {
				B = resetB();
				fresh = true;
				run.resets++;
				qp = solveQpSubproblem(B, g, lin, dLo, dHi);
			}
			let mode: 'qp' | 'elastic' | 'descent' = 'qp';
			if (qp.status === 'infeasible') {
				const nu = 10 * Math.max(1, ...weights, normInf(g));
				const el = solveQpSubproblem(B, g, lin, dLo, dHi, { weights: new Array<number>(m).fill(nu), reg: 1e-8 * Math.max(1, normInf(B.map((r) => normInf(r)))) });
				if (el.status === 'ok') {
					qp = el;
					mode = 'elastic';
					for (let i = 0; i < m; i++) weights[i] = Math.max(weights[i], nu);
				} else mode = 'descent';
			} else if (qp.status === 'failed') mode = 'descent';

			// KKT residuals at x with the QP's multipliers
			const tol = run.gradTolAt(p);
			let kkt: KktResiduals | null = null;
			if (mode === 'qp') {
				const r = g.slice();
				for (let i = 0; i < m; i++) for (let j = 0; j < n; j++) r[j] += qp.lambda[i] * C.grads[i][j];
				for (let j = 0; j < n; j++) r[j] += -qp.zLo[j] + qp.zHi[j];
				let comp = 0;
				for (let i = 0; i < m; i++) if (kinds[i] === 'ineq') comp = Math.max(comp, Math.abs(qp.lambda[i] * C.values[i]));
				for (let j = 0; j < n; j++) {
					if (qp.zLo[j]) comp = Math.max(comp, Math.abs(qp.zLo[j] * (x[j] - run.lo[j])));
					if (qp.zHi[j]) comp = Math.max(comp, Math.abs(qp.zHi[j] * (run.hi[j] - x[j])));
				}
				kkt = { stationarity: normInf(r), feasibility: run.violation(C.values), complementarity: comp };
				const met = run.firstOrderMet(p, kkt.stationarity) && kkt.feasibility <= feasTol && kkt.complementarity <= tol;
				if (met) {
					lambda = qp.lambda;
					const activeNormals: number[][] = [];
					const multTol = 1e-8 * Math.max(1, normInf(qp.lambda));
					for (let i = 0; i < m; i++) if (kinds[i] === 'eq' || qp.lambda[i] > multTol) activeNormals.push(C.grads[i]);
					return conclude(run, p, `KKT conditions met (stationarity ${kkt.stationarity.toExponential(2)}, feasibility ${kkt.feasibility.toExponential(2)}, complementarity ${kkt.complementarity.toExponential(2)})`, {
						lagrangianGrad: gradL,
						lagrangianValue: valueL,
						activeNormals,
						generalActive: activeNormals.length > 0,
						multipliers: { constraints: qp.lambda.slice(), lower: qp.zLo.slice(), upper: qp.zHi.slice() },
						kkt
					});
				}
			}
			if (stall) run.stop('stalled', stall);
			run.beginIteration();

			// direction and the merit's directional derivative
			let d: number[];
			if (mode !== 'descent') {
				d = qp.d;
				if (mode === 'qp') {
					for (let i = 0; i < m; i++) {
						const a = Math.abs(qp.lambda[i]);
						weights[i] = firstWeights ? a : Math.max(a, 0.5 * (weights[i] + a));
					}
					firstWeights = false;
				}
			} else {
				d = g.slice();
				for (let i = 0; i < m; i++) {
					const v = C.values[i];
					const s = kinds[i] === 'eq' ? Math.sign(v) : v > 0 ? 1 : 0;
					const w = Math.max(weights[i], 1);
					if (s) for (let j = 0; j < n; j++) d[j] += w * s * C.grads[i][j];
				}
				for (let j = 0; j < n; j++) {
					d[j] = -d[j];
					if ((x[j] <= run.lo[j] && d[j] < 0) || (x[j] >= run.hi[j] && d[j] > 0)) d[j] = 0;
				}
				for (let i = 0; i < m; i++) weights[i] = Math.max(weights[i], 1);
			}
			const phi0 = merit(p);
			let D = dot(g, d);
			for (let i = 0; i < m; i++) {
				D -= weights[i] * viol(C.values, i);
				if (mode === 'elastic') {
					const lv = C.values[i] + dot(C.grads[i], d);
					D += weights[i] * (kinds[i] === 'eq' ? Math.abs(lv) : Math.max(0, lv));
				}
			}
			if (mode === 'descent') D = -dot(d, d);
			const dInf = normInf(d);
			const tiny = stepTol * scaleOf(x);
			if (!(D < 0) || dInf <= tiny) {
				const v = run.violation(C.values);
				if (mode === 'elastic' || (mode === 'descent' && v > feasTol))
					run.stop('stalled', `locally infeasible: the linearized constraints are inconsistent and no step reduces the violation ${v.toExponential(2)}`);
				if (!fresh) {
					B = resetB();
					fresh = true;
					run.resets++;
					continue;
				}
				run.stop('stalled', `the QP step ${dInf.toExponential(2)} makes no progress but the KKT residuals are not met${kkt ? ` (stationarity ${kkt.stationarity.toExponential(2)}, feasibility ${kkt.feasibility.toExponential(2)})` : ''}`);
			}

			// backtracking on the merit
			const trial = (step: number[]) => {
				const q = run.evaluate(run.project(x.map((v, j) => v + step[j])));
				if (!Number.isFinite(q.f)) return { q, phi: NaN };
				const Cq = q.constraints();
				if (!allFinite(Cq.values)) return { q, phi: NaN };
				return { q, phi: merit(q) };
			};
			const lagrangianSlope = (q: Point, lam: number[], dir: number[]) => {
				const gq = q.grad;
				const Cq = q.constraints();
				let v = dot(gq, dir);
				for (let i = 0; i < m; i++) if (lam[i]) v += lam[i] * dot(Cq.grads[i], dir);
				return v;
			};
			const slopeL0 = mode === 'qp' ? lagrangianSlope(p, qp.lambda, d) : 0;
			let alpha = 1;
			let accepted: Point | null = null;
			let acceptedPhi = NaN;
			let sawFinite = false;
			let socTried = false;
			for (let k = 0; k < 60; k++) {
				const step = d.map((v) => alpha * v);
				const { q, phi } = trial(step);
				if (Number.isFinite(phi)) sawFinite = true;
				if (phi === -Infinity || q.f === -Infinity) {
					run.record(q);
					run.stop('diverged', 'f → −∞ (unbounded below)', q);
				}
				if (Number.isFinite(phi) && phi <= phi0 + ETA * alpha * D) {
					accepted = q;
					acceptedPhi = phi;
					break;
				}
				// within f's rounding level of φ(x) (a large offset in f rounds the decrease
				// away): accept a step that keeps feasibility and meets the derivative form of
				// sufficient decrease, φ′(α) ≤ (2η − 1)φ′(0) (approximate Wolfe, Hager & Zhang
				// 2005, exact for a quadratic), with φ′ the Lagrangian's slope along d
				if (Number.isFinite(phi) && phi <= phi0 + run.meritNoise(phi0, weights) && mode === 'qp' && slopeL0 < 0) {
					const Cq = q.constraints();
					if (run.violation(Cq.values) <= Math.max(run.violation(C.values), feasTol)) {
						const sq = lagrangianSlope(q, qp.lambda, d);
						if (sq <= (2 * ETA - 1) * slopeL0) {
							accepted = q;
							acceptedPhi = phi;
							break;
						}
					}
				}
				// second-order correction of the full step (Maratos effect)
				if (alpha === 1 && !socTried && mode === 'qp' && m > 0 && Number.isFinite(phi)) {
					socTried = true;
					const Cq = q.constraints();
					if (run.violation(Cq.values) > run.violation(C.values)) {
						const rows: number[] = [];
						for (let i = 0; i < m; i++) if (qp.active.includes(`c${i}`)) rows.push(i);
						if (rows.length > 0 && rows.length <= n) {
							const A = rows.map((i) => C.grads[i]);
							const AAt = A.map((ai) => A.map((aj) => dot(ai, aj)));
							const w = luSolve(AAt, rows.map((i) => Cq.values[i]));
							if (w) {
								const corr = d.slice();
								for (let r = 0; r < rows.length; r++) for (let j = 0; j < n; j++) corr[j] -= A[r][j] * w[r];
								const soc = trial(corr);
								if (Number.isFinite(soc.phi) && soc.phi <= phi0 + ETA * D) {
									accepted = soc.q;
									acceptedPhi = soc.phi;
									break;
								}
							}
						}
					}
				}
				let next = 0.5 * alpha;
				if (Number.isFinite(phi)) {
					const den = 2 * (phi - phi0 - alpha * D);
					if (den > 0) next = Math.min(0.5 * alpha, Math.max(0.1 * alpha, (-D * alpha * alpha) / den));
				} else next = 0.1 * alpha;
				alpha = next;
				if (alpha * dInf <= tiny) break;
			}
			if (!accepted) {
				if (!sawFinite) run.stop('diverged', `f or a constraint is not finite at any trial step from ${fmt(x)}`);
				if (!fresh) {
					B = resetB();
					fresh = true;
					run.resets++;
					retryNote = 'merit line search failed once; Hessian approximation reset';
					continue;
				}
				run.stop('stalled', `merit line search found no decrease from ${fmt(x)}${kkt ? ` (stationarity ${kkt.stationarity.toExponential(2)})` : ''}: a kink, a step or noise`);
			}
			if (retryNote) {
				if (!run.notes.includes(retryNote)) run.notes.push(retryNote);
				retryNote = '';
			}
			const q = accepted;
			if (normInf(q.x) > 1e150) {
				run.record(q);
				run.stop('diverged', `iterates diverge (‖x‖∞ = ${normInf(q.x).toExponential(2)})`, q);
			}
			// damped BFGS on the Lagrangian with the new multipliers
			if (mode !== 'descent') lambda = qp.lambda;
			const s = q.x.map((v, j) => v - x[j]);
			const gq = gradL(q);
			const gp = gradL(p);
			const y = gq.map((v, j) => v - gp[j]);
			if (!allFinite(y)) {
				B = resetB();
				run.resets++;
				fresh = true;
			} else if (norm2(s) > 0) {
				const up = dampedBfgsUpdate(B, s, y);
				if (!up.ok) {
					B = resetB();
					run.resets++;
					fresh = true;
				} else fresh = false;
			}
			const Cq = q.constraints();
			run.record(q, { violation: run.violation(Cq.values), merit: acceptedPhi, active: mode === 'descent' ? [] : qp.active });
			const moved = normInf(s);
			p = q;
			C = Cq;
			slow = moved <= tiny ? slow + 1 : 0;
			if (slow >= 2) stall = `no progress: steps below the step tolerance (violation ${run.violation(C.values).toExponential(2)})`;
		}
	});
}
