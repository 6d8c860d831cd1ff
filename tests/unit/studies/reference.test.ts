/**
 * The reference optimum the scorecard measures runs against. Reference values
 * are analytic (exact): the fits below reproduce a parabola or a line exactly,
 * so the optimum, the constraint boundary and the root are known in closed form.
 */
import { describe, expect, it } from 'vitest';
import { fitCurve } from '$lib/numerics/fits';
import { curveProblem } from '$lib/domain/problem';
import { referenceOptimum } from '$lib/domain/reference';
import { expectClose } from '../../reference/tolerance';

// y = 1 − (x − 0.3)² sampled exactly; a least-squares quadratic reproduces it.
const X = [0, 0.1, 0.2, 0.35, 0.5, 0.7, 0.8, 1];
const parabola = fitCurve('polynomial-least-squares', X, X.map((x) => 1 - (x - 0.3) ** 2), { degree: 2 });
// c(x) = 2x reproduced exactly by a line through its points
const line = fitCurve('linear', X, X.map((x) => 2 * x));

describe('referenceOptimum', () => {
	it('finds an interior maximum to rounding level (analytic: x = 0.3, f = 1)', () => {
		const p = curveProblem(parabola, [], { kind: 'maximize', bounds: [[0, 1]], constraints: [] });
		const r = referenceOptimum(p, [[0, 1]]);
		expect(r.kind).toBe('optimum');
		expectClose(r.x![0], 0.3, 1e-12, 'argmax of 1 − (x − 0.3)²');
		expectClose(r.f!, 1, 1e-15, 'max');
		expectClose(r.fRange, 1 - (1 - 0.7 ** 2), 1e-12, 'range of f over [0, 1]');
	});

	it('stops at an active inequality constraint (analytic: 2x ≤ 0.4 ⇒ x = 0.2 when maximizing)', () => {
		const p = curveProblem(parabola, [line], { kind: 'maximize', bounds: [[0, 1]], constraints: [{ output: 'c', op: '<=', value: 0.4 }] });
		const r = referenceOptimum(p, [[0, 1]]);
		expectClose(r.x![0], 0.2, 1e-12, 'constraint boundary');
		expectClose(r.f!, 1 - 0.01, 1e-12);
	});

	it('lands on an equality constraint (analytic: 2x = 1.2 ⇒ x = 0.6)', () => {
		const p = curveProblem(parabola, [line], { kind: 'minimize', bounds: [[0, 1]], constraints: [{ output: 'c', op: '=', value: 1.2 }] });
		const r = referenceOptimum(p, [[0, 1]]);
		expectClose(r.x![0], 0.6, 1e-12);
	});

	it('a minimum on the bound (analytic: x = 1 on [0, 1])', () => {
		const p = curveProblem(parabola, [], { kind: 'minimize', bounds: [[0, 1]], constraints: [] });
		expectClose(referenceOptimum(p, [[0, 1]]).x![0], 1, 1e-15);
	});

	it('solve: every root in the bounds (analytic: 1 − (x − 0.3)² = 0.96 ⇒ x = 0.1, 0.5)', () => {
		const p = curveProblem(parabola, [], { kind: 'solve', target: 0.96, bounds: [[0, 1]], constraints: [] });
		const r = referenceOptimum(p, [[0, 1]]);
		expect(r.kind).toBe('roots');
		expect(r.roots).toHaveLength(2);
		expectClose(r.roots![0], 0.1, 1e-12);
		expectClose(r.roots![1], 0.5, 1e-12);
	});

	it('solve without a root says so and gives the closest approach', () => {
		const p = curveProblem(parabola, [], { kind: 'solve', target: 2, bounds: [[0, 1]], constraints: [] });
		const r = referenceOptimum(p, [[0, 1]]);
		expect(r.roots).toEqual([]);
		expect(r.note).toMatch(/no root/);
		expectClose(r.x![0], 0.3, 1e-4);
	});
});
