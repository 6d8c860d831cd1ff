/**
 * No option value the study schema accepts can break a run: tolerances far
 * below what double precision can reach (1e-300) are raised to the smallest
 * honoured value and noted, and every run ends with one of the five outcomes.
 * Every `converged` is re-checked on the fit itself (|f′| small, measured here).
 * An error raised inside the run's own arithmetic ends it `diverged`.
 * Table: the invented coarse efficiency sweep of curveFits.test.ts (not
 * measured data).
 */
import { describe, expect, it } from 'vitest';
import { fitCurve } from '$lib/numerics/fits';
import { brokenRun, MIN_GRAD_TOL, optimize, type Objective, type OptimizerName } from '$lib/numerics/optimize';
import { curveObjective } from './curveObjective';

const OPTIMIZERS: OptimizerName[] = ['sqp', 'bfgs', 'conjugate-gradient', 'steepest-descent', 'nelder-mead', 'newton'];
const OUTCOMES = ['converged', 'stalled', 'iteration-limit', 'left-domain', 'diverged'];
const J = [0.1, 0.3, 0.5, 0.7, 0.9, 1.1, 1.3, 1.5];
const ETA = [0.3, 0.58, 0.74, 0.83, 0.86, 0.8, 0.62, 0.3];
const TINY = [{ gradTol: 1e-300 }, { stepTol: 1e-300 }, { fTol: 1e-300 }, { feasTol: 1e-300 }, { residualTol: 1e-300 }, { gradTol: 1e-300, stepTol: 1e-300, fTol: 1e-300 }];

describe('tolerances below double precision', () => {
	for (const method of ['cubic-natural', 'pchip', 'linear'] as const) {
		const fit = fitCurve(method, J, ETA);
		for (const o of OPTIMIZERS) {
			it(`${o} on the ${method} fit: every tiny tolerance ends runs with an honest outcome`, () => {
				for (const options of TINY) {
					for (const kind of ['maximize', 'solve'] as const) {
						for (const s of [0.2, 0.6, 1.4]) {
							const r = optimize({ kind, target: 0.7, objective: curveObjective(fit) }, o, { ...options, maxMilliseconds: 5000 }, [s]);
							const label = `${o} ${kind} ${JSON.stringify(options)} from ${s}: ${r.outcome} (${r.reason})`;
							expect(OUTCOMES, label).toContain(r.outcome);
							expect(Number.isFinite(r.x[0]), label).toBe(true);
							if (options.gradTol) expect(r.notes.join(' '), label).toMatch(/gradTol 1e-300 is below what double precision can reach/);
							if (r.outcome !== 'converged') continue;
							if (r.atKink) {
								// a derivative-free run may end on the corner of the linear fit: flagged, on a knot
								expect(J.some((k) => Math.abs(k - r.x[0]) <= 1e-6), label).toBe(true);
								continue;
							}
							const e = fit.evaluate(r.x[0]);
							if (kind === 'solve') expect(Math.abs(e.f - 0.7), label).toBeLessThanOrEqual(1e-9);
							else if (r.x[0] > J[0] && r.x[0] < J[J.length - 1]) {
								// interior maximum: f′ within the clamped first-order test (and far tighter than the default)
								const g0 = Math.abs(fit.evaluate(s).df);
								const tol = o === 'nelder-mead' ? 1e-6 : 1.01 * Math.max(MIN_GRAD_TOL, 1e-8) * Math.max(1, g0);
								expect(Math.abs(e.df), label).toBeLessThanOrEqual(tol);
							}
						}
					}
				}
			});
		}
	}
});

describe('errors inside a run', () => {
	it('an objective that returns something that is not a number (inside the run, after the start) ends the run diverged, not thrown', () => {
		let calls = 0;
		const objective: Objective = {
			n: 1,
			evaluate: ([x]) => (++calls > 3 ? ({ f: 'oops' } as unknown as { f: number; grad: number[] }) : { f: (x - 1) ** 2, grad: [2 * (x - 1)] })
		};
		for (const o of OPTIMIZERS) {
			calls = 0;
			const r = optimize({ kind: 'minimize', objective }, o, {}, [5]);
			expect(r.outcome, `${o}: ${r.reason}`).toBe('diverged');
			expect(r.reason).toMatch(/broke down/);
		}
	});
	it('brokenRun: what a study stores when the objective itself throws — diverged at the start, the error in the reason', () => {
		const objective: Objective = { n: 2, evaluate: () => ({ f: 0, grad: [0, 0] }) };
		const r = brokenRun({ kind: 'minimize', objective }, 'bfgs', [1, 2], new Error('the fit failed'));
		expect(r.outcome).toBe('diverged');
		expect(r.reason).toMatch(/the fit failed/);
		expect(r.x).toEqual([1, 2]);
		expect(r.path.x).toEqual([[1, 2]]);
	});
});
