/**
 * Runs that leave the data: with bounds wider than the data and the `hold`
 * rule, the fit is flat beyond the last point and a gradient method may stop
 * there with f′ = 0 — a true stationary point of the fit, not of the data. The
 * run says so (outsideData, and its reason); under `refuse` the step that
 * leaves the data ends the run `left-domain` and is counted as an outside
 * evaluation. Table: invented, an efficiency that rises over the whole sweep
 * (not measured data); common practice, no source.
 */
import { describe, expect, it } from 'vitest';
import { fitCurve } from '$lib/numerics/fits';
import { optimize, type OptimizerName } from '$lib/numerics/optimize';
import { curveObjective } from './curveObjective';

const X = [0.1, 0.3, 0.5, 0.7, 0.9, 1.1, 1.3, 1.5];
const Y = [0.3, 0.45, 0.56, 0.64, 0.7, 0.74, 0.77, 0.79];
const OPTIMIZERS: OptimizerName[] = ['sqp', 'bfgs', 'conjugate-gradient', 'steepest-descent', 'nelder-mead', 'newton'];

describe('end points outside the data', () => {
	it('hold, bounds [0.1, 3]: every run that ends beyond x = 1.5 is flagged outside the data; none is an unflagged converged', () => {
		const fit = fitCurve('pchip', X, Y, { extrapolation: 'hold' });
		const objective = curveObjective(fit, [0.1, 3]);
		let flagged = 0;
		for (const o of OPTIMIZERS) {
			for (const s of [0.2, 0.8, 1.4]) {
				const r = optimize({ kind: 'maximize', objective }, o, {}, [s]);
				const outside = r.x[0] < X[0] || r.x[0] > X[X.length - 1];
				expect(r.outsideData, `${o} from ${s}: ${r.outcome} at ${r.x[0]} (${r.reason})`).toBe(outside);
				if (r.outcome === 'converged' && outside) expect(r.reason).toMatch(/outside the data/);
				if (outside) flagged++;
			}
		}
		// the rising table's maximum lies on the flat extension: most runs end there
		expect(flagged).toBeGreaterThan(0);
	});
	it('inside the data the flag stays off', () => {
		const fit = fitCurve('pchip', X, Y, { extrapolation: 'hold' });
		const r = optimize({ kind: 'maximize', objective: curveObjective(fit) }, 'bfgs', {}, [0.8]);
		expect(r.outsideData).toBe(false);
		expect(r.x[0]).toBe(1.5);
	});
	it('refuse, bounds [0.1, 3]: the first step out of the data ends the run left-domain and is counted', () => {
		const fit = fitCurve('pchip', X, Y, { extrapolation: 'refuse' });
		for (const o of OPTIMIZERS) {
			const r = optimize({ kind: 'maximize', objective: curveObjective(fit, [0.1, 3]) }, o, {}, [1.4]);
			expect(r.outcome, `${o}: ${r.reason}`).toBe('left-domain');
			expect(r.outsideEvaluations, o).toBeGreaterThanOrEqual(1);
			expect(r.outsideData, o).toBe(false);
		}
	});
});
