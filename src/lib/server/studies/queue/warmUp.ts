/**
 * Every fit (and, in a worker thread, its audit and a few runs of every
 * optimizer) on a small invented curve, so V8 has compiled the hot code
 * before the first real study: each thread compiles its own, and the app's
 * main thread builds every fit of a study when it launches it.
 */
import { auditFidelity } from '../../../numerics/audit/fidelity';
import { curveMethods, fitCurve } from '../../../numerics/fits/fitCurve';
import type { CurveMethod } from '../../../numerics/fits/types';
import { optimize } from '../../../numerics/optimize/optimize';
import { curveProblem } from '../../../domain/problem';
import { referenceOptimum } from '../../../domain/reference';

export function warmUp(full: boolean, budgetMs = 4000): void {
	const x = Array.from({ length: 120 }, (_, i) => i / 15);
	const y = x.map((v) => Math.sin(v / 2.5) + 0.01 * Math.cos(7 * v));
	const t0 = Date.now();
	for (let round = 0; round < (full ? 2 : 1); round++) {
		for (const method of Object.keys(curveMethods) as CurveMethod[]) {
			if (Date.now() - t0 > budgetMs) return;
			const fit = fitCurve(method, x, y, method === 'cubic-clamped' ? { slopes: [0, 0] } : {});
			fit.toJSON();
			if (!full) continue;
			auditFidelity(fit, x, y, { looMaxPoints: 40 });
			const problem = curveProblem(fit, [], { kind: 'maximize', bounds: [[0, x[x.length - 1]]], constraints: [] });
			referenceOptimum(problem, [[0, x[x.length - 1]]], 2001);
			for (const o of ['sqp', 'bfgs', 'conjugate-gradient', 'nelder-mead', 'steepest-descent', 'newton'] as const) {
				for (const s of [0.5, 3.5, 6.5]) optimize(problem, o, { maxMilliseconds: 50 }, [s]);
			}
		}
	}
}
