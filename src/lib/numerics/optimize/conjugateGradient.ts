/**
 * Nonlinear conjugate gradient, Polak–Ribière with β⁺ = max(β, 0) and a Wolfe
 * line search (E. Polak, G. Ribière, 1969; Nocedal & Wright, Numerical
 * Optimization, 2nd ed. 2006, §5.2, eq. 5.44–5.45), run by fmin's
 * `conjugateGradient` (0.0.4) inside a wrapper that counts evaluations, records
 * the path and enforces the budgets.
 *
 * How the wrapper drives fmin
 * - Bounds by projection: fmin's points are clamped into the box P before the
 *   objective sees them, and fmin gets the gradient of f∘P: components where
 *   x was clamped, or that push out of the box at a bound, are zero.
 * - Stop test (ours): the projected gradient ‖x − P(x − ∇f)‖∞ ≤
 *   gradTol·max(1, |f|) at an evaluated point no worse than the best so far;
 *   the wrapper then throws a private sentinel out of fmin and applies the
 *   second-order check.
 * - Scaling: fmin's first trial step is α = 1 along −∇, and it stops by itself
 *   at ‖∇‖₂ ≤ 1e-5 (both fixed). At each (re)start from c the wrapper gives
 *   fmin the variables u with x = P(c + D·u) and the function s·f(x), so fmin
 *   sees the gradient sD·∇f and its first trial moves x by sD²‖∇f(c)‖. With
 *   sD = 1e-5/(gradTol·max(1, |f(c)|)) fmin's own stop can only fire after
 *   ours, and D is chosen so that the first trial moves x by L: a tenth of x's
 *   scale at the start, the last accepted step length at a restart. The
 *   Polak–Ribière iteration with a Wolfe search is invariant to both scalings
 *   apart from that first trial.
 * - fmin's per-iteration `history` hook records the path, enforces the
 *   iteration and time budgets, and detects failure: after two successive
 *   failed line searches (the second along −∇f, after fmin's own reset) fmin is
 *   restarted with s rescaled to the last accepted step (its fixed 16 halvings
 *   cannot reach a step much shorter than its first trial), from the best point
 *   it evaluated (its strong-Wolfe search rejects points that only decrease f,
 *   as next to a kink); when two such restarts in a row make no progress the
 *   run is `stalled`. If fmin returns without our test met, it is restarted the
 *   same way.
 * - A non-finite f is passed to fmin as +∞ with a zero gradient, so its line
 *   search backs off.
 */
import { conjugateGradient as fminConjugateGradient } from 'fmin/index.js';
import { allFinite, normInf } from './linalg';
import { fmt, Run, scaleOf, type Point } from './run';
import { conclude } from './secondOrder';
import type { OptimizeOptions, Problem, RunResult } from './types';

/** private: thrown from the history hook to restart fmin with a new scale */
class Restart extends Error {}

/** private: thrown from inside the objective when our stop test is met */
class Converged extends Error {
	constructor(
		readonly point: Point,
		readonly reason: string
	) {
		super(reason);
	}
}

interface CgState {
	x: number[];
	fx: number;
	fxprime: number[];
	alpha: number;
}

export function conjugateGradient(problem: Problem, options: OptimizeOptions, start: number[]): RunResult {
	const run: Run = new Run(problem, 'conjugate-gradient', options);
	return run.guard(() => {
		const n = run.n;
		const { stepTol } = run.settings;
		const first = run.evaluate(run.prepareStart(start));
		if (!Number.isFinite(first.f) || !allFinite(first.grad)) run.stop('diverged', `f or ∇f is not finite at the start ${fmt(first.x)}`, first);
		run.record(first);
		let best: Point = first;
		let current: Point = first;
		let failures = 0;
		let restarts = 0;
		let fruitless = 0;
		let lastStep = 0;
		// points evaluated in the last two line searches: fmin reports iterate x_i
		// after the search from x_i, so x_i was evaluated one search earlier
		let recent = new Map<string, Point>();
		let older = new Map<string, Point>();
		const key = (x: number[]) => x.join(',');
		const firstOrder = (q: Point) => {
			const pg = run.projectedGradNorm(q.x, q.grad);
			return run.firstOrderMet(q, pg) ? pg : -1;
		};
		const pg0 = firstOrder(first);
		if (pg0 >= 0) return conclude(run, first, `‖projected ∇f‖∞ = ${pg0.toExponential(2)} within tolerance`);

		for (;;) {
			const origin = current;
			const g0 = Math.max(run.projectedGradNorm(origin.x, origin.grad) * Math.sqrt(n), 1e-300);
			const L = lastStep > 0 ? lastStep : 0.1 * scaleOf(origin.x);
			const sD = 1e-5 / (run.settings.gradTol * Math.max(1, Math.abs(origin.f)));
			const D = L / (sD * g0);
			const scale = sD / D;
			const c = origin.x.slice();
			const toX = (u: number[]) => u.map((v, i) => c[i] + D * v);
			failures = 0;
			let firstCall = true;
			const objective = (u: number[], fxprime: number[]) => {
				const x = toX(u);
				const xp = run.project(x);
				let q: Point;
				if (firstCall && xp.every((v, i) => v === origin.x[i])) q = origin;
				else q = run.evaluate(xp);
				firstCall = false;
				recent.set(key(u), q);
				const g = Number.isFinite(q.f) ? q.grad : null;
				if (!g || !allFinite(g)) {
					fxprime.fill(0);
					return q.f === -Infinity ? -Infinity : Infinity;
				}
				for (let i = 0; i < n; i++) {
					const clamped = x[i] < run.lo[i] || x[i] > run.hi[i];
					const outward = (xp[i] <= run.lo[i] && g[i] > 0) || (xp[i] >= run.hi[i] && g[i] < 0);
					fxprime[i] = clamped || outward ? 0 : sD * g[i];
				}
				if (q.f === -Infinity || normInf(q.x) > 1e150) {
					run.stop('diverged', q.f === -Infinity ? 'f → −∞ (unbounded below)' : `iterates diverge (‖x‖∞ = ${normInf(q.x).toExponential(2)})`, q);
				}
				if (q !== origin && q.f <= best.f) {
					const pg = firstOrder(q);
					if (pg >= 0) throw new Converged(q, `‖projected ∇f‖∞ = ${pg.toExponential(2)} within tolerance`);
				}
				if (q.f < best.f) best = q;
				return scale * q.f;
			};
			let pushes = 0;
			const history = {
				push(state: CgState) {
					if (pushes++ > 0) {
						const k = key(state.x);
						const xp = run.project(toX(state.x));
						const q = recent.get(k) ?? older.get(k) ?? (xp.every((v, i) => v === current.x[i]) ? current : best);
						older = recent;
						recent = new Map();
						const moved = normInf(q.x.map((v, i) => v - current.x[i]));
						if (q !== current) run.record(q);
						current = q;
						if (moved <= stepTol * scaleOf(q.x)) {
							failures++;
							if (failures >= 2) throw new Restart();
						} else {
							failures = 0;
							fruitless = 0;
							lastStep = moved;
						}
					}
					run.beginIteration();
				}
			};
			try {
				fminConjugateGradient(objective, new Array<number>(n).fill(0), {
					maxIterations: run.settings.maxIterations - run.iterations + 1,
					history
				});
			} catch (err) {
				if (err instanceof Converged) return conclude(run, err.point, err.reason);
				if (!(err instanceof Restart)) throw err;
			}
			// fmin returned or failed without our test met: restart along −∇f from the best point seen
			// (fmin's strong-Wolfe search rejects points that only decrease f, e.g. next to a kink)
			if (best.f < current.f && best !== current) {
				lastStep = normInf(best.x.map((v, i) => v - current.x[i]));
				run.record(best);
				current = best;
				fruitless = 0;
			}
			if (current === origin && ++fruitless >= 2)
				run.stop('stalled', `line search failed from ${fmt(current.x)}, also after restarts along −∇f (‖projected ∇f‖∞ = ${run.projectedGradNorm(current.x, current.grad).toExponential(2)}): a kink, a step or noise`);
			run.beginIteration();
			restarts++;
			if (restarts === 1) run.notes.push('fmin stopped before the gradient tolerance; restarted along −∇f');
		}
	});
}
