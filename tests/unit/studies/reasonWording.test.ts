// Reasons in the study's own sense. Real runs of our optimizers on real fits
// (problems built exactly as the runner builds them), reworded by studyReason.
// What counts as a maximum, a minimum, a bound or a data point is elementary
// calculus (common practice, no source); the fits' shapes are checked against
// SciPy's own interpolators where the wording depends on them.
import { describe, expect, it } from 'vitest';
import { auditSmoothness } from '$lib/numerics/audit/smoothness';
import { fitCurve } from '$lib/numerics/fits';
import type { CurveMethod } from '$lib/numerics/fits/types';
import { optimize, type OptimizerName } from '$lib/numerics/optimize';
import { curveProblem, kinksOf } from '$lib/domain/problem';
import { boundNote, dataPointAt, studyReason, type ReasonContext } from '$lib/domain/reasonWording';
import { runScipy } from '../../reference/scipy';

const X = [0, 1, 2, 3, 4];

function study(method: CurveMethod, y: number[], kind: 'maximize' | 'minimize', optimizer: OptimizerName, start: number) {
	const fit = fitCurve(method, X, y);
	const problem = curveProblem(fit, [], { kind, bounds: [[0, 4]], constraints: [] });
	const run = optimize(problem, optimizer, {}, [start]);
	const ctx: ReasonContext = { kind, bounds: [[0, 4]], inputName: 'J', measured: auditSmoothness(fit).measured, kinked: kinksOf(fit).length > 0, dataX: fit.knots, method };
	return { fit, run, reason: studyReason(run, ctx) };
}

describe('reasons in the study’s own sense', () => {
	it('a maximize run at a minimum of f says minimum, not the optimizer’s internal “maximum”', () => {
		// valley data, started exactly at its bottom: the first-order test passes, the second-order check refuses
		const { run, reason } = study('cubic-natural', [4, 1, 0, 1, 4], 'maximize', 'bfgs', 2);
		expect(run.outcome).toBe('stalled');
		expect(run.reason).toMatch(/a maximum, not a minimum/); // the optimizer's own sense (it minimizes −f)
		expect(reason).toMatch(/a minimum of f, not a maximum/);
		expect(reason).toMatch(/curvature of f \+1\.71/); // the sign flipped with the sense
		expect(reason).not.toMatch(/negative curvature/);
	});

	it('a maximize run pinned at a bound names the bound', () => {
		// increasing data: the maximum of f over [0, 4] is at the upper bound
		const { run, reason } = study('cubic-natural', [1, 2, 3, 4, 5], 'maximize', 'sqp', 1);
		expect(run.outcome).toBe('converged');
		expect(run.x[0]).toBe(4);
		expect(reason).toMatch(/ends on the upper bound J = 4/);
		// converged runs in a maximize study report f's curvature with its own sign
		const { reason: peak } = study('cubic-natural', [0, 1, 3, 1.5, 0], 'maximize', 'sqp', 1.5);
		expect(peak).toMatch(/curvature of f ≤ −/);
		expect(boundNote([0], { bounds: [[0, 4]], inputName: 'J' })).toBe('ends on the lower bound J = 0');
		expect(boundNote([2], { bounds: [[0, 4]] })).toBeNull();
	});

	it('never blames a kink on a fit without one, and names it on a fit with one', () => {
		const smooth: ReasonContext = { kind: 'minimize', bounds: [[0, 4]], measured: 'Cinf', kinked: false };
		const stalled = { outcome: 'stalled', x: [1.2], atKink: false, reason: 'line search found no decrease from (1.2) (‖projected ∇f‖∞ = 1.10e-6): a kink, a step or noise' };
		const onSmooth = studyReason(stalled, smooth);
		expect(onSmooth).not.toMatch(/kink,|a step/);
		expect(onSmooth).toMatch(/the fit has no kink \(measured C∞\)/);
		const kinked = studyReason({ ...stalled, atKink: true }, { ...smooth, measured: 'C0', kinked: true });
		expect(kinked).toMatch(/at a kink of the fit/);
		// a real stall at the peak knot of a linear fit (measured C0) keeps the kink
		const { run, reason } = study('linear', [0, 1, 3, 1.5, 0], 'maximize', 'sqp', 1.5);
		if (run.outcome === 'stalled' && run.atKink) expect(reason).toMatch(/kink/);
		expect(run.outcome).not.toBe('converged');
	});

	it('says so when the optimum sits on a data point (PCHIP at a peak of the data), and not otherwise', () => {
		// SciPy's PCHIP on the same data: its slope at the peak row is exactly 0, so the maximum is the data point (2, 3)
		const slope = runScipy<number[]>('from scipy.interpolate import PchipInterpolator\nout = PchipInterpolator(data["x"], data["y"]).derivative()(data["x"])', { x: X, y: [0, 1, 3, 1.5, 0] });
		expect(slope[2]).toBe(0);
		const { run, reason } = study('pchip', [0, 1, 3, 1.5, 0], 'maximize', 'bfgs', 1.5);
		expect(run.outcome).toBe('converged');
		expect(reason).toMatch(/the maximum sits on the data point J = 2: pchip puts this extremum at a data point/);
		// the natural cubic spline's maximum is between rows (SciPy's CubicSpline, natural ends, agrees it is past 2)
		const peak = runScipy<number>(
			'from scipy.interpolate import CubicSpline\nfrom scipy.optimize import minimize_scalar\ns = CubicSpline(data["x"], data["y"], bc_type="natural")\nout = minimize_scalar(lambda t: -s(t), bounds=(1, 3), method="bounded", options={"xatol": 1e-10}).x',
			{ x: X, y: [0, 1, 3, 1.5, 0] }
		);
		const natural = study('cubic-natural', [0, 1, 3, 1.5, 0], 'maximize', 'bfgs', 1.5);
		expect(natural.run.x[0]).toBeCloseTo(peak, 6);
		expect(natural.reason).not.toMatch(/data point/);
		expect(dataPointAt(2 + 1e-9, X)).toBe(2);
		expect(dataPointAt(2.06, X)).toBeNull();
	});
});
