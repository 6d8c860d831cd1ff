import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { gridStarts, latinHypercubeStarts, listStarts, makeStarts, mulberry32 } from '$lib/numerics/optimize';

describe('mulberry32', () => {
	it('is deterministic for a seed, in [0, 1), and differs between seeds', () => {
		const a = mulberry32(42);
		const b = mulberry32(42);
		const c = mulberry32(43);
		const xa = Array.from({ length: 100 }, () => a());
		expect(Array.from({ length: 100 }, () => b())).toEqual(xa);
		expect(Array.from({ length: 100 }, () => c())).not.toEqual(xa);
		for (const v of xa) expect(v >= 0 && v < 1).toBe(true);
	});
});

describe('grid', () => {
	it('puts n points per axis at the cell centres, first input fastest', () => {
		expect(gridStarts([[0, 1], [10, 20]], 2)).toEqual([
			[0.25, 12.5],
			[0.75, 12.5],
			[0.25, 17.5],
			[0.75, 17.5]
		]);
		expect(gridStarts([[0, 4]], 1)).toEqual([[2]]);
	});
	it('refuses open bounds and explosive sizes', () => {
		expect(() => gridStarts([[0, Infinity]], 3)).toThrow(RangeError);
		expect(() => gridStarts(Array.from({ length: 6 }, () => [0, 1] as [number, number]), 10)).toThrow(RangeError);
	});
});

describe('Latin hypercube (McKay, Beckman & Conover 1979)', () => {
	it('uses every stratum exactly once per input, inside the box, deterministically for a seed', () => {
		fc.assert(
			fc.property(fc.integer({ min: 1, max: 4 }), fc.integer({ min: 1, max: 40 }), fc.integer(), (dims, count, seed) => {
				const box = Array.from({ length: dims }, (_, j) => [-j - 1, 2 * j + 3] as [number, number]);
				const pts = latinHypercubeStarts(box, count, seed);
				expect(pts.length).toBe(count);
				expect(latinHypercubeStarts(box, count, seed)).toEqual(pts);
				box.forEach(([lo, hi], j) => {
					const strata = pts.map((p) => Math.floor(((p[j] - lo) / (hi - lo)) * count)).sort((a, b) => a - b);
					expect(strata).toEqual(Array.from({ length: count }, (_, i) => i));
					for (const p of pts) expect(p[j] >= lo && p[j] <= hi).toBe(true);
				});
			}),
			{ numRuns: 100, seed: 7 }
		);
	});
	it('differs between seeds', () => {
		expect(latinHypercubeStarts([[0, 1], [0, 1]], 8, 1)).not.toEqual(latinHypercubeStarts([[0, 1], [0, 1]], 8, 2));
	});
});

describe('makeStarts (the study API’s starts field)', () => {
	const box: [number, number][] = [
		[0, 1],
		[0, 2]
	];
	it('dispatches points, grid and latinHypercube', () => {
		expect(makeStarts({ points: [[0.5, 0.5]] }, 2)).toEqual([[0.5, 0.5]]);
		expect(makeStarts({ grid: 3 }, 2, box)).toHaveLength(9);
		expect(makeStarts({ latinHypercube: 5, seed: 9 }, 2, box)).toEqual(latinHypercubeStarts(box, 5, 9));
	});
	it('validates', () => {
		expect(() => listStarts([[1, 2, 3]], 2)).toThrow(RangeError);
		expect(() => listStarts([], 2)).toThrow(RangeError);
		expect(() => makeStarts({ grid: 3 }, 2)).toThrow(RangeError);
	});
});
