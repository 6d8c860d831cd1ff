/**
 * The grid fits' side-by-side slope sweeps (rule.across: many grid lines per
 * step, in place in the node data) against the one-line passes they replace,
 * bit for bit. The one-line passes are the ones checked against SciPy 1.10
 * (CubicSpline, Akima1DInterpolator, PchipInterpolator) in scipy.test.ts and
 * splineLineSolver.test.ts, and the grid fits built with the sweeps are checked
 * against SciPy live in tests/unit/surfaces/grid.test.ts; this file holds the
 * sweeps to exactly the same arithmetic, so that a fit's slopes do not depend
 * on which path computed them (a fit file rebuilt on another path must give
 * the same bits).
 *
 * Data include ties, flat runs and sign changes (PCHIP's zero slopes, Akima's
 * equal-secant fallback), not only smooth values.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { GRID_SLOPE_RULES, fillHermiteSlots, type LineSlopeRule } from '../../../src/lib/numerics/fits';
import { rng, unevenAxis } from '../surfaces/helpers';

type CubicMethod = keyof typeof GRID_SLOPE_RULES;
const METHODS = Object.keys(GRID_SLOPE_RULES) as CubicMethod[];
const MIN_KNOTS: Record<CubicMethod, number> = { 'grid-cubic-natural': 2, 'grid-cubic-not-a-knot': 2, 'grid-akima': 3, 'grid-pchip': 2 };

/** The same rule without its side-by-side sweep: fillHermiteSlots then takes the one-line path. */
function oneLineOnly(rule: LineSlopeRule): LineSlopeRule {
	return (x, y, yo, yStep, out, oo, os, oStep, count) => rule(x, y, yo, yStep, out, oo, os, oStep, count);
}

/** Bit-for-bit equality, reporting the first index that differs. */
function expectSameBits(got: Float64Array, want: Float64Array): void {
	expect(got.length).toBe(want.length);
	for (let i = 0; i < want.length; i++) {
		if (!Object.is(got[i], want[i])) expect({ index: i, got: got[i] }).toEqual({ index: i, got: want[i] });
	}
}

const axisArb = (minKnots: number) =>
	fc
		.array(fc.double({ min: 0.01, max: 3, noNaN: true }), { minLength: minKnots - 1, maxLength: 30 })
		.map((h) => Float64Array.from(h.reduce<number[]>((a, s) => [...a, a[a.length - 1] + s], [-2])));

/** A value: mostly smooth doubles, some small integers (ties, flat runs, zero secants, sign changes). */
const valueArb = fc.oneof(fc.double({ min: -50, max: 50, noNaN: true }), fc.integer({ min: -2, max: 2 }).map((v) => v * 1.0));

describe('rule.across gives the one-line slopes bit for bit', () => {
	for (const method of METHODS) {
		it(`${method}: random axes, 1–9 lines, knots adjacent or lines adjacent, other slots untouched`, () => {
			fc.assert(
				fc.property(
					axisArb(MIN_KNOTS[method]),
					fc.integer({ min: 1, max: 9 }),
					fc.boolean(),
					fc.integer({ min: 2, max: 5 }),
					fc.integer({ min: 0, max: 7 }),
					fc.array(valueArb, { minLength: 30 * 9 * 5 + 40, maxLength: 30 * 9 * 5 + 40 }),
					(x, count, knotsAdjacent, slots, base, pool) => {
						const n = x.length;
						const from = 0;
						const to = 1 + ((base + count) % (slots - 1));
						// knots adjacent: line c's knot i at node c·n + i; lines adjacent: at node i·count + c
						const iStride = knotsAdjacent ? slots : count * slots;
						const lineStride = knotsAdjacent ? n * slots : slots;
						const size = base + n * count * slots;
						const data = Float64Array.from({ length: size }, (_, i) => pool[i % pool.length]);
						const before = data.slice();
						const rule = GRID_SLOPE_RULES[method]();
						expect(rule.across).toBeTypeOf('function');
						const applied = rule.across!(x, data, base, iStride, lineStride, count, from, to);
						// the spline's sweep declines three knots or fewer (its system has no interior chain)
						const declines = method.startsWith('grid-cubic') && n <= 3;
						expect(applied).toBe(!declines);
						const want = before.slice();
						if (!declines) {
							const y = new Float64Array(n * count);
							for (let c = 0; c < count; c++) for (let i = 0; i < n; i++) y[c * n + i] = before[base + c * lineStride + i * iStride + from];
							GRID_SLOPE_RULES[method]()(x, y, 0, n, want, base + to, iStride, lineStride, count);
						}
						expectSameBits(data, want);
					}
				),
				{ numRuns: 300, seed: 17 }
			);
		});
	}
});

describe('fillHermiteSlots: the node data with and without the sweeps are the same bits', () => {
	const SHAPES: number[][] = [
		[2, 2],
		[3, 2],
		[2, 7],
		[3, 3],
		[4, 5],
		[11, 9],
		[37, 5],
		[5, 70], // more than one 32-line batch of the last input
		[2, 3, 4],
		[3, 3, 3],
		[6, 4, 9],
		[3, 2, 5, 4],
		[4, 5, 3, 6]
	];
	for (const method of METHODS) {
		for (const sizes of SHAPES) {
			if (sizes.some((n) => n < MIN_KNOTS[method])) continue;
			it(`${method} on a ${sizes.join(' × ')} grid`, () => {
				const seed = sizes.reduce((p, n) => 31 * p + n, 7);
				const axes = sizes.map((n, k) => Float64Array.from(unevenAxis(n, -1 - k, 2 + k, seed + k)));
				const total = sizes.reduce((p, n) => p * n, 1);
				const slots = 1 << sizes.length;
				const r = rng(seed);
				const withSweeps = new Float64Array(total * slots);
				// smooth values with a flat patch and ties, so the monotone and Akima fallbacks are taken somewhere
				for (let i = 0; i < total; i++) withSweeps[i * slots] = i % 5 === 0 ? Math.round(2 * r()) : 10 * r() - 5;
				const oneLine = withSweeps.slice();
				fillHermiteSlots(axes, withSweeps, GRID_SLOPE_RULES[method]());
				fillHermiteSlots(axes, oneLine, oneLineOnly(GRID_SLOPE_RULES[method]()));
				expectSameBits(withSweeps, oneLine);
				// and the slots were filled: every derivative slot somewhere non-zero
				for (let S = 1; S < slots; S++) {
					let any = false;
					for (let i = 0; i < total && !any; i++) any = withSweeps[i * slots + S] !== 0;
					expect(any, `slot ${S}`).toBe(true);
				}
			});
		}
	}
});
