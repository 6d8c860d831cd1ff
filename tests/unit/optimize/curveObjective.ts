/**
 * Test and benchmark helper: a one-input fit as an optimizer objective, the
 * way the study engine is meant to build it — value, f′ and f″ from one
 * evaluation, bounds and domain from the data, `refuse` mapped to
 * refuseOutside, and kinkAt from the fit's knots and its smoothness audit
 * (the knots whose f′ jump exceeds the audit's threshold).
 * Relative imports so that tsx (the benchmark) resolves them too.
 */
import { auditSmoothness } from '../../../src/lib/numerics/audit/smoothness';
import type { CurveFit } from '../../../src/lib/numerics/fits/types';
import type { Objective } from '../../../src/lib/numerics/optimize/types';

export function curveObjective(fit: CurveFit, bounds: readonly [number, number] = fit.domain): Objective {
	const audit = auditSmoothness(fit, { worst: fit.knots.length });
	const kinks = audit.worst.filter((k) => Math.abs(k.jumpD1) > audit.tolerance.d1).map((k) => k.x);
	const width = fit.domain[1] - fit.domain[0];
	return {
		n: 1,
		evaluate: (x) => {
			const j = fit.evaluate(x[0]);
			return { f: j.f, grad: [j.df], hess: [[j.d2f]], outside: j.outside };
		},
		bounds: [bounds],
		domain: [fit.domain],
		refuseOutside: fit.extrapolation === 'refuse',
		kinkAt: (x) => kinks.some((k) => Math.abs(x[0] - k) <= 1e-6 * width)
	};
}

/**
 * The fit's own optimum on [lo, hi]: a dense search on f, then — when the best
 * sample is interior — bisection on f′ across it (accurate to rounding, where
 * a search on f alone stops near √ε).
 */
export function denseOptimum(fit: CurveFit, lo: number, hi: number, sense: 'min' | 'max', samples = 20001): { x: number; f: number } {
	const s = sense === 'max' ? -1 : 1;
	let bi = 0;
	let bf = Infinity;
	const xs = Array.from({ length: samples }, (_, i) => lo + ((hi - lo) * i) / (samples - 1));
	xs.forEach((x, i) => {
		const v = s * fit.evaluate(x).f;
		if (v < bf) {
			bf = v;
			bi = i;
		}
	});
	if (bi === 0 || bi === samples - 1) return { x: xs[bi], f: fit.evaluate(xs[bi]).f };
	let a = xs[bi - 1];
	let b = xs[bi + 1];
	const da = s * fit.evaluate(a).df;
	if (!(da < 0 && s * fit.evaluate(b).df > 0)) return { x: xs[bi], f: fit.evaluate(xs[bi]).f };
	for (let k = 0; k < 200 && b - a > 0; k++) {
		const m = 0.5 * (a + b);
		if (m === a || m === b) break;
		if (s * fit.evaluate(m).df < 0) a = m;
		else b = m;
	}
	const x = 0.5 * (a + b);
	return { x, f: fit.evaluate(x).f };
}
