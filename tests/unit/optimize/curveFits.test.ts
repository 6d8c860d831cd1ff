/**
 * Optimizers on fitted curves (the fits module's `fitCurve`): why smoothness
 * matters to a gradient-based optimizer and to Newton.
 */
import { describe, expect, it } from 'vitest';
import { fitCurve } from '$lib/numerics/fits';
import { auditSmoothness } from '$lib/numerics/audit/smoothness';
import { optimize, type RunResult } from '$lib/numerics/optimize';
import { expectClose } from '../../reference/tolerance';
import { curveObjective, denseOptimum } from './curveObjective';

/**
 * INVENTED table (not measured data): a coarse propeller-efficiency sweep,
 * 8 points of a smooth hump, efficiency vs advance ratio. Maximize.
 */
const PROP_J = [0.1, 0.3, 0.5, 0.7, 0.9, 1.1, 1.3, 1.5];
const PROP_ETA = [0.3, 0.58, 0.74, 0.83, 0.86, 0.8, 0.62, 0.3];
const STARTS = [0.2, 0.45, 0.6, 1.2, 1.4];

function runAll(method: 'linear' | 'pchip' | 'akima' | 'cubic-natural', optimizer: 'sqp' | 'bfgs') {
	const fit = fitCurve(method, PROP_J, PROP_ETA);
	const objective = curveObjective(fit);
	return { fit, runs: STARTS.map((s) => optimize({ kind: 'maximize', objective }, optimizer, {}, [s])) };
}

const median = (v: number[]) => {
	const s = [...v].sort((a, b) => a - b);
	return s[Math.floor(s.length / 2)];
};

describe('SQP on an invented coarse efficiency table (8 points, maximize)', () => {
	it('on the linear fit: stalls at the peak knot, flagged at-kink (or hits its limit), never converged', () => {
		const { runs } = runAll('linear', 'sqp');
		for (const r of runs) {
			expect(r.outcome, r.reason).not.toBe('converged');
			if (r.outcome === 'stalled') {
				expect(r.atKink, r.reason).toBe(true);
				expectClose(r.x[0], 0.9, 1e-9, 'the peak knot of the invented table');
			} else expect(r.outcome).toBe('iteration-limit');
			// f′ does not vanish there: it jumps from +0.15 to −0.3
			expect(r.gradNorm).toBeGreaterThan(0.1);
		}
	});

	it.each(['pchip', 'akima', 'cubic-natural'] as const)('on the %s fit: converges to the fit’s own optimum (dense search) in a handful of iterations', (method) => {
		const { fit, runs } = runAll(method, 'sqp');
		const best = denseOptimum(fit, 0.1, 1.5, 'max');
		for (const r of runs) {
			expect(r.outcome, r.reason).toBe('converged');
			expect(r.atKink).toBe(false);
			expectClose(r.x[0], best.x, 1e-7, `${method} argmax`);
			expectClose(r.f, best.f, 1e-12, `${method} max`);
			expect(r.iterations).toBeLessThanOrEqual(12);
		}
	});

	it('the linear fit costs more iterations than every smooth fit, and still fails', () => {
		const lin = median(runAll('linear', 'sqp').runs.map((r) => r.iterations));
		for (const m of ['pchip', 'akima', 'cubic-natural'] as const) {
			expect(lin).toBeGreaterThan(median(runAll(m, 'sqp').runs.map((r) => r.iterations)));
		}
	});

	it('BFGS behaves the same way: at-kink on linear, converged on the smooth fits', () => {
		for (const r of runAll('linear', 'bfgs').runs) {
			expect(r.outcome).toBe('stalled');
			expect(r.atKink).toBe(true);
		}
		for (const m of ['pchip', 'akima', 'cubic-natural'] as const) {
			const { fit, runs } = runAll(m, 'bfgs');
			const best = denseOptimum(fit, 0.1, 1.5, 'max');
			for (const r of runs) {
				expect(r.outcome, r.reason).toBe('converged');
				expectClose(r.x[0], best.x, 1e-7, `${m} argmax`);
			}
		}
	});

	it('Nelder–Mead, derivative-free, finds the linear fit’s peak itself (a kink is no obstacle without gradients)', () => {
		const fit = fitCurve('linear', PROP_J, PROP_ETA);
		const r = optimize({ kind: 'maximize', objective: curveObjective(fit) }, 'nelder-mead', {}, [0.45]);
		expect(r.outcome, r.reason).toBe('converged');
		expectClose(r.x[0], 0.9, 1e-7, 'peak knot');
		expect(r.evaluations.grad).toBe(0);
	});
});

/**
 * INVENTED table (not measured data): 7 unevenly spaced points of a smooth
 * hump (an L/D-like curve). Akima's fit is C1: its f″ jumps at the knots 1.9
 * and 2.2 around the peak (the audit measures it), and on the flank piece
 * [2.2, 3.5] f″ ≈ −0.23 while near the peak it is ≈ −1.0.
 */
const HUMP_X = [0, 0.4, 1.5, 1.9, 2.2, 3.5, 4];
const HUMP_Y = [0.1, 0.45, 0.9, 0.97, 0.95, 0.55, 0.2];
const FLANK_STARTS = [2.5, 2.6, 2.7, 2.8, 2.9, 3.0];

describe('Newton for a stationary point (uses f″): C1 vs C2 on an invented uneven table', () => {
	it('the Akima fit is C1 with f″ jumping at the knots next to the peak', () => {
		const fit = fitCurve('akima', HUMP_X, HUMP_Y);
		const audit = auditSmoothness(fit, { worst: 10 });
		expect(audit.measured).toBe('C1');
		const at = (x: number) => audit.worst.find((w) => Math.abs(w.x - x) < 1e-12)!;
		expect(Math.abs(at(1.9).jumpD2)).toBeGreaterThan(0.1);
		expect(Math.abs(at(2.2).jumpD2)).toBeGreaterThan(0.1);
	});

	it('on the Akima fit, from the flank, Newton cycles — and says so (stalled, never converged)', () => {
		const fit = fitCurve('akima', HUMP_X, HUMP_Y);
		for (const s of FLANK_STARTS) {
			const r = optimize({ kind: 'maximize', objective: curveObjective(fit) }, 'newton', {}, [s]);
			expect(r.outcome, `start ${s}: ${r.reason}`).toBe('stalled');
			expect(r.reason).toMatch(/cycle/);
			expect(r.gradNorm).toBeGreaterThan(1e-3);
		}
	});

	it('on the natural cubic (C2) fit of the same table, from the same starts, Newton converges quadratically to the fit’s maximum', () => {
		const fit = fitCurve('cubic-natural', HUMP_X, HUMP_Y);
		const best = denseOptimum(fit, 0, 4, 'max');
		for (const s of FLANK_STARTS) {
			const r = optimize({ kind: 'maximize', objective: curveObjective(fit) }, 'newton', {}, [s]);
			expect(r.outcome, `start ${s}: ${r.reason}`).toBe('converged');
			expectClose(r.x[0], best.x, 1e-9, 'natural cubic argmax');
			expect(r.iterations).toBeLessThanOrEqual(12);
		}
	});

	it('the failure is about curvature, not the fit: started near the peak, Newton converges on the Akima fit too', () => {
		const fit = fitCurve('akima', HUMP_X, HUMP_Y);
		const best = denseOptimum(fit, 0, 4, 'max');
		for (const s of [1.8, 1.9, 2.0]) {
			const r = optimize({ kind: 'maximize', objective: curveObjective(fit) }, 'newton', {}, [s]);
			expect(r.outcome, r.reason).toBe('converged');
			expectClose(r.x[0], best.x, 1e-9, 'Akima argmax');
		}
	});

	it('on the linear fit f″ = 0: Newton stops at once, honestly (singular)', () => {
		const fit = fitCurve('linear', HUMP_X, HUMP_Y);
		const r = optimize({ kind: 'maximize', objective: curveObjective(fit) }, 'newton', {}, [2.7]);
		expect(r.outcome).toBe('stalled');
		expect(r.reason).toMatch(/singular/);
	});
});

/**
 * IAPWS-IF97 saturation line as a real table. Source: IAPWS R7-97(2012) §8,
 * eq. (30) and Table 34 coefficients (corroborated); the backward value
 * T_s(1 MPa) = 453.035632 K is Table 36 (corroborated). Tabulate p_s on
 * 280–640 K every 20 K (docs/references.md's recipe), fit it, and solve "the
 * temperature where the fitted p_s equals 1 MPa".
 */
const N = [
	0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2, 0.12020824702470e5, -0.32325550322333e7, 0.14915108613530e2, -0.48232657361591e4,
	0.40511340542057e6, -0.23855557567849, 0.65017534844798e3
];
function saturationPressure(T: number): number {
	const th = T + N[8] / (T - N[9]);
	const A = th * th + N[0] * th + N[1];
	const B = N[2] * th * th + N[3] * th + N[4];
	const C = N[5] * th * th + N[6] * th + N[7];
	return ((2 * C) / (-B + Math.sqrt(B * B - 4 * A * C))) ** 4;
}

describe('Newton solve on a fitted IAPWS-IF97 saturation table', () => {
	const T = Array.from({ length: 19 }, (_, i) => 280 + 20 * i);
	const p = T.map(saturationPressure);

	it('reproduces the equation at the Table 35 check point (source check)', () => {
		expectClose(saturationPressure(500), 2.63889776, 1e-8, 'p_s(500 K), IAPWS Table 35 (corroborated)');
	});

	it.each(['cubic-natural', 'pchip', 'linear'] as const)('%s fit: finds T where the fit equals 1 MPa, within the fit’s own error of Table 36’s 453.035632 K', (method) => {
		const fit = fitCurve(method, T, p);
		const r: RunResult = optimize({ kind: 'solve', target: 1, objective: curveObjective(fit) }, 'newton', {}, [400]);
		expect(r.outcome, r.reason).toBe('converged');
		expect(Math.abs(r.f - 1)).toBeLessThanOrEqual(1e-10);
		// the fit's own error near the root, converted to temperature by the slope
		const fitError = Math.abs(fit.evaluate(453.035632).f - saturationPressure(453.035632));
		const slope = fit.evaluate(453.035632).df;
		expect(Math.abs(r.x[0] - 453.035632)).toBeLessThanOrEqual(2 * (fitError / slope) + 1e-6);
		expect(r.iterations).toBeLessThanOrEqual(12);
	});

	it('the smooth fit is far closer than the linear one', () => {
		const solveWith = (m: 'cubic-natural' | 'linear') =>
			optimize({ kind: 'solve', target: 1, objective: curveObjective(fitCurve(m, T, p)) }, 'newton', {}, [400]).x[0];
		expect(Math.abs(solveWith('cubic-natural') - 453.035632)).toBeLessThan(Math.abs(solveWith('linear') - 453.035632) / 10);
	});
});
