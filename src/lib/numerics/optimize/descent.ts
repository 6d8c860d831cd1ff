/**
 * The line-search descent loop shared by BFGS, nonlinear conjugate gradient
 * and steepest descent (Nocedal & Wright, Numerical Optimization, 2nd ed.
 * 2006: Algorithm 6.1 for BFGS; §5.2, eq. 5.44–5.45 for Polak–Ribière with
 * β⁺ = max(β, 0); §3.1 for steepest descent), with the strong-Wolfe search of
 * Algorithms 3.5/3.6.
 *
 * Stopping rules (the same for the three; see README "How a run's outcome is
 * decided"): `converged` when ‖projected ∇f‖∞ ≤ gradTol·max(1, ‖∇f(start)‖∞)
 * and the second-order check passes; `stalled` when a step is below stepTol
 * relative to x, or when over three successive iterations f changes by no
 * more than fTol·max(1, |f(start) − f|) plus its rounding level while the
 * projected gradient does not halve. Every test reads gradients or
 * differences of f, so adding a constant to f changes none of them.
 *
 * Bounds by projection: the start is projected into the box; an input on a
 * bound whose gradient points out of the box is held (its direction component
 * set to zero, and for BFGS the direction uses the principal submatrix of the
 * inverse Hessian on the free inputs, which stays positive definite — the
 * two-metric projection idea of D. P. Bertsekas, "Projected Newton methods for
 * optimization problems with simple constraints", SIAM J. Control Optim.
 * 20(2):221–246, 1982); the search runs up to the longest step that stays in
 * the box, and the accepted point is projected to remove rounding. The stop
 * test uses the projected gradient: the largest ∂f/∂xᵢ left once the inputs held
 * on a bound by their gradient are set aside (Run.projectedGradNorm).
 */
import { allFinite, identity, norm2, normInf } from './linalg';
import { inverseBfgsUpdate } from './quasiNewton';
import { fmt, scaleOf, type Run } from './run';
import { conclude } from './secondOrder';
import type { RunResult } from './types';
import { wolfeLineSearch } from './wolfeLineSearch';

type DescentMethod = 'bfgs' | 'conjugate-gradient' | 'steepest-descent';

export function descend(run: Run, start: number[], method: DescentMethod): RunResult {
	return run.guard(() => {
		const n = run.n;
		const { stepTol, fTol } = run.settings;
		let p = run.evaluate(run.prepareStart(start));
		if (!Number.isFinite(p.f)) run.stop('diverged', `f is not finite at the start ${fmt(p.x)}`, p);
		if (!allFinite(p.grad)) run.stop('diverged', `∇f is not finite at the start ${fmt(p.x)}`, p);
		run.record(p);
		// inverse Hessian approximation; null = identity, scaled by yᵀs/yᵀy at the next update (N&W eq. 6.20)
		let H: number[][] | null = null;
		// conjugate gradient: the previous direction, gradient and free set (restart when the free set changes)
		let dPrev: number[] | null = null;
		let gPrev: number[] | null = null;
		let freePrev: boolean[] | null = null;
		let sinceRestart = 0;
		// previous step length and directional derivative, for the initial trial step (N&W eq. 3.59)
		let alphaPrev = NaN;
		let fPrev = NaN;
		let dphiPrev = NaN;
		let flat = 0;
		let retried = false;
		// a no-progress verdict waits until the new point has had its first-order test
		let stall = '';
		for (;;) {
			const x = p.x;
			const g = p.grad;
			const pg = run.projectedGradNorm(x, g);
			if (run.firstOrderMet(p, pg)) return conclude(run, p, `‖projected ∇f‖∞ = ${pg.toExponential(2)} within tolerance`);
			if (stall) run.stop('stalled', `${stall} (‖projected ∇f‖∞ = ${pg.toExponential(2)})`);
			run.beginIteration();
			const free = new Array<boolean>(n);
			for (let i = 0; i < n; i++) free[i] = !((x[i] <= run.lo[i] && g[i] > 0) || (x[i] >= run.hi[i] && g[i] < 0));
			const d = new Array<number>(n).fill(0);
			for (let i = 0; i < n; i++) {
				if (!free[i]) continue;
				if (method === 'bfgs' && H) {
					let v = 0;
					for (let j = 0; j < n; j++) if (free[j]) v -= H[i][j] * g[j];
					d[i] = v;
				} else d[i] = -g[i];
			}
			const conjugate = method === 'conjugate-gradient' && dPrev && gPrev && freePrev && sinceRestart < n && free.every((v, i) => v === freePrev![i]);
			if (!conjugate) sinceRestart = 0;
			if (conjugate && dPrev && gPrev) {
				// Polak–Ribière⁺ on the free inputs: β = max(0, gᵀ(g − g₋)/‖g₋‖²) (N&W eq. 5.44–5.45)
				let num = 0;
				let den = 0;
				for (let i = 0; i < n; i++) {
					if (!free[i]) continue;
					num += g[i] * (g[i] - gPrev[i]);
					den += gPrev[i] * gPrev[i];
				}
				const beta = den > 0 ? Math.max(0, num / den) : 0;
				if (Number.isFinite(beta) && beta > 0) for (let i = 0; i < n; i++) if (free[i]) d[i] += beta * dPrev[i];
			}
			let dphi0 = 0;
			for (let i = 0; i < n; i++) dphi0 += g[i] * d[i];
			if (!(dphi0 < 0) && method === 'conjugate-gradient' && dPrev) {
				// not a descent direction (β too large for an inexact search): restart along −∇f
				dPrev = null;
				sinceRestart = 0;
				continue;
			}
			if (!(dphi0 < 0)) {
				if (H) {
					// lost positive definiteness to rounding: restart from the gradient
					H = null;
					run.resets++;
					continue;
				}
				run.stop('stalled', `no descent direction at ${fmt(x)} (projected gradient ${pg.toExponential(2)})`);
			}
			let alphaMax = Infinity;
			for (let i = 0; i < n; i++) {
				if (d[i] < 0 && run.lo[i] > -Infinity) alphaMax = Math.min(alphaMax, (run.lo[i] - x[i]) / d[i]);
				else if (d[i] > 0 && run.hi[i] < Infinity) alphaMax = Math.min(alphaMax, (run.hi[i] - x[i]) / d[i]);
			}
			// initial trial step: 1 for quasi-Newton once H has a scale; otherwise the
			// interpolation of N&W eq. 3.60 while the last decrease of f stands well above
			// f's rounding level, else (an offset in f rounds the decrease away) the
			// first-order change kept, α₀ = α₋·φ′₋(0)/φ′(0) (N&W eq. 3.59)
			let alpha0: number;
			if (method === 'bfgs' && H) alpha0 = 1;
			else if (Number.isFinite(fPrev) && fPrev - p.f > 100 * run.fNoise(p.f)) alpha0 = (1.01 * 2 * (p.f - fPrev)) / dphi0;
			else if (Number.isFinite(alphaPrev) && dphiPrev < 0) alpha0 = (alphaPrev * dphiPrev) / dphi0;
			else alpha0 = Math.min(1, 1 / norm2(d));
			if (!(alpha0 > 0) || !Number.isFinite(alpha0)) alpha0 = 1;
			const ls = wolfeLineSearch(run, p, d, { alpha0, alphaMax, c2: method === 'bfgs' ? 0.9 : 0.1 });
			if (!ls.point && method === 'conjugate-gradient' && dPrev) {
				// the conjugate direction failed: restart along −∇f before giving up
				dPrev = null;
				sinceRestart = 0;
				run.resets++;
				continue;
			}
			if (!ls.point) {
				if (ls.status === 'nonfinite') run.stop('diverged', `f is not finite at any trial step from ${fmt(x)}`);
				if (method === 'bfgs' && H && !retried) {
					H = null;
					run.resets++;
					retried = true;
					continue;
				}
				run.stop('stalled', `line search found no decrease from ${fmt(x)} (‖projected ∇f‖∞ = ${pg.toExponential(2)}): a kink, a step or noise`);
			}
			retried = false;
			const q = ls.point;
			if (q.f === -Infinity || normInf(q.x) > 1e150) {
				run.record(q);
				run.stop('diverged', q.f === -Infinity ? 'f → −∞ (unbounded below)' : `iterates diverge (‖x‖∞ = ${normInf(q.x).toExponential(2)})`, q);
			}
			if (method === 'bfgs') {
				const s = q.x.map((v, i) => v - x[i]);
				const gq = q.grad;
				const y = gq.map((v, i) => v - g[i]);
				let sy = 0;
				let yy = 0;
				for (let i = 0; i < n; i++) {
					sy += s[i] * y[i];
					yy += y[i] * y[i];
				}
				if (!H) {
					if (sy > 0 && yy > 0 && Number.isFinite(sy / yy)) {
						H = identity(n, sy / yy);
						if (!inverseBfgsUpdate(H, s, y)) H = null;
					}
				} else if (!inverseBfgsUpdate(H, s, y)) {
					H = null;
					run.resets++;
				}
			}
			if (method === 'conjugate-gradient') {
				dPrev = d;
				gPrev = g;
				freePrev = free;
				sinceRestart++;
			}
			alphaPrev = ls.alpha;
			dphiPrev = dphi0;
			run.record(q);
			const stepInf = normInf(q.x.map((v, i) => v - x[i]));
			const df = Math.abs(q.f - p.f);
			fPrev = p.f;
			p = q;
			if (stepInf <= stepTol * scaleOf(p.x)) stall = `no progress: step ${stepInf.toExponential(2)} below the step tolerance`;
			// f-change test on differences (an offset in f cancels), with f's rounding level
			// allowed; an iteration that still halves the projected gradient is progress
			const pgNew = run.projectedGradNorm(p.x, p.grad);
			flat = df <= fTol * run.fChangeScale(p) + run.fNoise(p.f) && !(pgNew <= 0.5 * pg) ? flat + 1 : 0;
			if (flat >= 3) stall = 'no progress: f unchanged over 3 iterations';
		}
	});
}
