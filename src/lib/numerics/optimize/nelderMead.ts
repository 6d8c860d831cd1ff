/**
 * Nelder–Mead downhill simplex (J. A. Nelder, R. Mead, "A simplex method for
 * function minimization", Comput. J. 7(4):308–313, 1965), the derivative-free
 * baseline, run by fmin's `nelderMead` (0.0.4) inside a wrapper that counts
 * evaluations, records the path and enforces the budgets.
 *
 * How the wrapper drives fmin
 * - Variables: fmin starts from u = (1, …, 1) with `nonZeroDelta: 2`, and the
 *   wrapper maps u to x = P(b + h∘(u − 1)), so the first simplex is b and
 *   b + hᵢeᵢ. Step hᵢ: 5 % of |bᵢ|, at least 0.00025 (SciPy's rule, with the
 *   floor also for tiny nonzero bᵢ), pointed into the box.
 * - Bounds by projection: every point fmin asks for is clamped into the box P
 *   before the objective sees it (fmin minimizes f∘P, flat outside the box);
 *   the simplex size is measured between the projected points.
 * - Shrink steps are done by restart. fmin 0.0.4's shrink loop assigns an
 *   undeclared variable and throws a ReferenceError under strict ES modules,
 *   so fmin is called with `sigma: 1`, which makes it return instead of
 *   shrinking; the wrapper then restarts it around the best vertex with
 *   hᵢ halved relative to the last simplex's extent — the shrink toward the
 *   best vertex, with the simplex re-squared along the axes.
 * - Stop test (ours, checked on fmin's per-iteration `history` hook; fmin's own
 *   test is disabled by a 1e-300 tolerance): simplex diameter
 *   ≤ stepTol·(1 + ‖x‖∞) (default 1e-8; 1e-13 for `solve`) and spread of f
 *   ≤ fTol·max(1, |f(start) − f|) plus f's rounding level (differences of f
 *   only, so adding a constant to f changes nothing); then the derivative-free second-order check. A `solve`
 *   run also stops as soon as the best vertex meets the residual tolerance. Budgets are enforced by the run
 *   throwing its sentinel from inside the objective or the hook.
 * - Stagnation: when the end-point check finds a descent direction (Nelder–Mead
 *   can stall at a non-stationary point of a non-smooth function, McKinnon
 *   1998), the wrapper restarts with a fresh simplex of the initial size, at
 *   most twice (the remedy of C. T. Kelley, "Detection and remediation of
 *   stagnation in the Nelder–Mead algorithm using a sufficient decrease
 *   condition", SIAM J. Optim. 10(1):43–55, 1999, simplified); then `stalled`.
 * - Non-finite f is passed to fmin as +∞ (the worst vertex), so NaN cannot
 *   corrupt its sort.
 * Counting: Nelder–Mead reads no gradients, so evaluations.grad is 0.
 */
import { nelderMead as fminNelderMead } from 'fmin/index.js';
import { fmt, Run, scaleOf, type Point } from './run';
import { checkSecondOrder, conclude } from './secondOrder';
import type { OptimizeOptions, Problem, RunResult } from './types';

/** private: thrown from the history hook when our stop test is met */
class Converged extends Error {
	constructor(readonly reason: string) {
		super(reason);
	}
}

interface HistoryState {
	x: number[];
	fx: number;
	simplex: (number[] & { fx: number })[];
}

export function nelderMead(problem: Problem, options: OptimizeOptions, start: number[]): RunResult {
	const n = problem.objective.n;
	// a `solve` run as least squares needs a finer simplex to bring |f − target| to its tolerance
	const stepTol = problem.kind === 'solve' ? 1e-13 : 1e-8;
	const run: Run = new Run(problem, 'nelder-mead', options, { maxIterations: 200 * Math.max(1, n), stepTol, fTol: 1e-12 });
	return run.guard(() => {
		const { stepTol, fTol } = run.settings;
		const first = run.evaluate(run.prepareStart(start));
		if (!Number.isFinite(first.f)) run.stop('diverged', `f is not finite at the start ${fmt(first.x)}`, first);
		run.record(first);
		let best: Point = first;
		let b = first.x.slice();
		// at least 0.00025 per axis (a tiny or denormal coordinate would give a degenerate simplex)
		let h = b.map((v) => Math.max(0.05 * Math.abs(v), 0.00025));
		let restarts = 0;
		let rescues = 0;
		for (;;) {
			for (let i = 0; i < n; i++) if (b[i] + h[i] > run.hi[i]) h[i] = -h[i];
			const base = b.slice();
			const step = h.slice();
			const center = best;
			const toX = (u: ArrayLike<number>) => {
				const y = new Array<number>(n);
				for (let i = 0; i < n; i++) y[i] = base[i] + step[i] * (u[i] - 1);
				return run.project(y);
			};
			let firstCall = true;
			const objective = (u: number[]) => {
				if (firstCall) {
					firstCall = false;
					// fmin re-evaluates its start u = 1, which is the known best point
					if (u.every((v) => v === 1)) return center.f;
				}
				const q = run.evaluate(toX(u));
				if (q.f < best.f || (Number.isNaN(best.f) && Number.isFinite(q.f))) best = q;
				return Number.isNaN(q.f) ? Infinity : q.f;
			};
			let pushes = 0;
			let lastSimplex: number[][] = [];
			const history = {
				push(state: HistoryState) {
					if (pushes++ > 0) run.record(best);
					if (best.f === -Infinity) run.stop('diverged', 'f → −∞ (unbounded below)', best);
					if (run.mode === 'least-squares' && run.residualMet(best)) throw new Converged('f = target within tolerance');
					const verts = state.simplex.map((v) => toX(v));
					lastSimplex = verts;
					const xb = best.x;
					let diam = 0;
					let fmax = -Infinity;
					let fmin = Infinity;
					for (let k = 0; k < verts.length; k++) {
						for (let i = 0; i < n; i++) diam = Math.max(diam, Math.abs(verts[k][i] - xb[i]));
						fmax = Math.max(fmax, state.simplex[k].fx);
						fmin = Math.min(fmin, state.simplex[k].fx);
					}
					const spread = fmax - fmin;
					// spread of f against the change of f over the run (differences: an offset cancels) plus f's rounding level
					const fTolNow = fTol * run.fChangeScale(best) + run.fNoise(Math.max(Math.abs(fmax), Math.abs(fmin)));
					if (diam <= stepTol * scaleOf(xb) && spread <= fTolNow)
						throw new Converged(`simplex diameter ${diam.toExponential(2)} and f spread ${spread.toExponential(2)} within tolerance`);
					// on a bound f may keep its slope, so the spread over a collapsed simplex is |∇f|·diameter:
					// let the end-point check (which probes from the bound into the box) decide
					if (diam <= stepTol * scaleOf(xb) && run.activeBounds(xb).length > 0)
						throw new Converged(`simplex diameter ${diam.toExponential(2)} within tolerance on the bound${run.activeBounds(xb).length > 1 ? 's' : ''} ${run.activeBounds(xb).join(', ')}`);
					run.beginIteration();
				}
			};
			try {
				fminNelderMead(objective, new Array<number>(n).fill(1), {
					maxIterations: run.settings.maxIterations - run.iterations + 2,
					nonZeroDelta: 2,
					zeroDelta: 1,
					minErrorDelta: 1e-300,
					sigma: 1,
					history
				});
			} catch (err) {
				if (!(err instanceof Converged)) throw err;
				// the end-point check found descent (a stagnated simplex): restart with a fresh one, at most twice
				if (rescues < 2 && run.settings.secondOrderCheck && run.mode !== 'least-squares') {
					const verdict = checkSecondOrder(run, best, { derivativeFree: true });
					if (verdict.ok) return run.finish(best, 'converged', `${err.reason}; ${verdict.detail}`);
					rescues++;
					run.notes.push(`simplex stagnated at ${fmt(best.x)} (${verdict.detail}); restarted with a fresh simplex`);
					b = best.x.slice();
					h = b.map((v) => Math.max(0.05 * Math.abs(v), 0.00025));
					run.beginIteration();
					run.record(best);
					continue;
				}
				return conclude(run, best, err.reason, { derivativeFree: true });
			}
			// fmin returned: it wanted to shrink. Count the shrink as an iteration and restart smaller.
			run.beginIteration();
			run.record(best);
			restarts++;
			const xb = best.x;
			const floor = 0.01 * stepTol * scaleOf(best.x);
			const next = h.map((hi, i) => {
				let ext = 0;
				for (const v of lastSimplex) ext = Math.max(ext, Math.abs(v[i] - xb[i]));
				// never let one axis collapse to zero while others are still open
				return Math.max(ext > 0 ? 0.5 * ext : 0.5 * Math.abs(hi), floor);
			});
			if (h.every((v) => Math.abs(v) <= floor) && next.every((v) => v <= floor))
				run.stop('stalled', `the simplex collapsed to ${fmt(best.x)} without meeting the f tolerance: a step or discontinuity`);
			b = xb.slice();
			h = next;
			if (restarts === 1) run.notes.push('simplex shrinks are done by restarting fmin around the best vertex');
		}
	});
}
