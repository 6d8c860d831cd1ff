/**
 * Smoothness audit: exact one-sided limits at interior knots. Reference
 * values: docs/references.md, "Continuity, measured" (computed: right limit minus
 * left limit at interior knots).
 */
import { describe, expect, it } from 'vitest';
import { expectAllClose, expectClose } from '../../reference/tolerance';
import { auditSmoothness, compareContinuity } from '../../../src/lib/numerics/audit/smoothness';
import { curveMethods, fitCurve } from '../../../src/lib/numerics/fits';
import type { CurveFit, CurveMethod } from '../../../src/lib/numerics/fits';
import { AKIMA, RPN14, unevenRough } from '../fits/fixtures';

/** Largest |f″ jump| and where, from the audit's worst list ordering by curvature for C1 fits. */
function maxD2(fit: CurveFit): { value: number; x: number } {
	const a = auditSmoothness(fit, { worst: 1000 });
	let best = { value: 0, x: NaN };
	for (const j of a.worst) if (Math.abs(j.jumpD2) > best.value) best = { value: Math.abs(j.jumpD2), x: j.x };
	expect(best.value).toBe(a.maxJumpD2);
	return best;
}

describe('measured f″ jumps (computed, docs/references.md)', () => {
	it('RPN 14: PCHIP 19.488142613283706 at 8.09; Akima 4.8752623205853425 at 8.19', () => {
		const p = maxD2(fitCurve('pchip', RPN14.x, RPN14.y));
		expectClose(p.value, 19.488142613283706, 1e-12, 'pchip');
		expect(p.x).toBe(8.09);
		const a = maxD2(fitCurve('akima', RPN14.x, RPN14.y));
		expectClose(a.value, 4.8752623205853425, 1e-12, 'akima');
		expect(a.x).toBe(8.19);
	});
	it("Akima's data: PCHIP 140.2914205344585 at 7; Akima 129.73227884462588 at 7", () => {
		const p = maxD2(fitCurve('pchip', AKIMA.x, AKIMA.y));
		expectClose(p.value, 140.2914205344585, 1e-12, 'pchip');
		expect(p.x).toBe(7);
		const a = maxD2(fitCurve('akima', AKIMA.x, AKIMA.y));
		expectClose(a.value, 129.73227884462588, 1e-12, 'akima');
		expect(a.x).toBe(7);
	});
	it('natural and not-a-knot: f″ jumps at rounding level (≤ 1.1e-14 on RPN 14, ≤ 4.3e-14 on Akima’s data) → C2', () => {
		for (const [d, bound] of [
			[RPN14, 1.1e-14],
			[AKIMA, 4.3e-14]
		] as const) {
			for (const m of ['cubic-natural', 'cubic-not-a-knot'] as CurveMethod[]) {
				const a = auditSmoothness(fitCurve(m, d.x, d.y));
				expect(a.maxJumpD2).toBeLessThanOrEqual(bound * 4); // same order as the reference's rounding
				expect(a.measured).toBe('C2');
			}
		}
	});
	it("linear's f′ jumps on Akima's data: 0.5, 4, 30.5, −25, 15 at x = 5…9 (computed)", () => {
		const a = auditSmoothness(fitCurve('linear', AKIMA.x, AKIMA.y), { worst: 100 });
		const byX = new Map(a.worst.map((j) => [j.x, j.jumpD1]));
		expectAllClose(
			[5, 6, 7, 8, 9].map((x) => byX.get(x)!),
			[0.5, 4, 30.5, -25, 15],
			1e-15,
			'jump f′'
		);
		for (const x of [1, 2, 3, 4]) expect(byX.get(x)).toBe(0);
		expect(a.measured).toBe('C0');
		// most severe first: the largest slope jump
		expect(a.worst[0].x).toBe(7);
	});
	it('every cubic method: value and f′ jumps ≤ 2e-14 on both data sets (computed)', () => {
		for (const d of [RPN14, AKIMA]) {
			for (const m of ['cubic-natural', 'cubic-not-a-knot', 'akima', 'akima-modified', 'pchip'] as CurveMethod[]) {
				const a = auditSmoothness(fitCurve(m, d.x, d.y));
				expect(a.maxJumpF).toBeLessThanOrEqual(2e-14);
				expect(a.maxJumpD1).toBeLessThanOrEqual(2e-14);
			}
		}
	});
});

describe('measured class', () => {
	it('is scale-free: the same class after changing the units of x and y', () => {
		const { x, y } = unevenRough(25, 4);
		for (const m of Object.keys(curveMethods) as CurveMethod[]) {
			const o = m === 'cubic-clamped' ? { slopes: [1, -1] as [number, number] } : m === 'smoothing-spline' ? { lambda: 0.1 } : {};
			const a = auditSmoothness(fitCurve(m, x, y, o));
			const xs = x.map((v) => 1e-3 * v + 300);
			const ys = y.map((v) => 1e6 * v);
			const o2 = m === 'cubic-clamped' ? { slopes: [1e9, -1e9] as [number, number] } : m === 'smoothing-spline' ? { lambda: 0.1 * 1e-9 } : {};
			const b = auditSmoothness(fitCurve(m, xs, ys, o2));
			expect(b.measured).toBe(a.measured);
		}
	});
	it('can exceed the declared class on data that happen to be simple', () => {
		const x = [0, 1, 2.5, 3, 4.2];
		const a = auditSmoothness(
			fitCurve(
				'pchip',
				x,
				x.map((v) => 2 * v + 1)
			)
		);
		expect(a.declared).toBe('C1');
		expect(a.measured).toBe('C2');
		expect(compareContinuity(a.measured, a.declared)).toBeGreaterThan(0);
	});
	it('global forms have no interior knot and are C∞', () => {
		const a = auditSmoothness(fitCurve('polynomial-global', [0, 1, 2, 3], [1, 0, 2, 1]));
		expect(a.measured).toBe('Cinf');
		expect(a.knotsChecked).toBe(0);
	});
	it('softened linear: f″ steps by (m_r − m_l)/w at both fillet ends, f′ continuous', () => {
		const fit = fitCurve('softened-linear', [0, 2, 4], [0, 2, 0], { width: 1 });
		const a = auditSmoothness(fit, { worst: 10 });
		expect(a.measured).toBe('C1');
		const jumps = a.worst.map((j) => [j.x, j.jumpD2]).sort((p, q) => p[0] - q[0]);
		// m_l = 1, m_r = −1, w = 1: f″ goes 0 → −2 at x = 1.5 and −2 → 0 at x = 2.5
		expect(jumps).toEqual([
			[1.5, -2],
			[2.5, 2]
		]);
		expect(a.maxJumpD1).toBeLessThan(1e-15);
	});
	it('reports the thresholds it used, relative to the fit’s magnitudes', () => {
		const a = auditSmoothness(fitCurve('cubic-natural', AKIMA.x, AKIMA.y));
		expect(a.tolerance.f).toBeCloseTo(85e-9, 15);
		expect(a.tolerance.d1).toBeGreaterThanOrEqual(85e-9);
		expect(a.tolerance.d2).toBeGreaterThanOrEqual(85e-9);
		expect(a.knotsChecked).toBe(9);
	});
});
