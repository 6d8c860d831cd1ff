/**
 * Starting points for the runs of a study: a list, a uniform grid, or a
 * seeded Latin hypercube — the study API's `starts` field
 * (`{ points } | { grid: n } | { latinHypercube: n, seed }`).
 */
import { mulberry32 } from '../math';

export type StartSpec = { points: number[][] } | { grid: number } | { latinHypercube: number; seed: number };

export type Box = readonly (readonly [number, number])[];

/** the most starts one specification may produce */
export const MAX_STARTS = 100_000;

// mulberry32 (numerics/math.ts): deterministic for a seed, so the same seed gives the same study
export { mulberry32 };

function checkBox(bounds: Box, what: string): void {
	if (!bounds.length) throw new RangeError(`${what} needs bounds on at least one input`);
	bounds.forEach(([lo, hi], i) => {
		if (!Number.isFinite(lo) || !Number.isFinite(hi) || lo > hi) throw new RangeError(`${what} needs finite bounds lo ≤ hi; input ${i} has [${lo}, ${hi}]`);
	});
}

/** the given points, checked (length n, finite) and copied */
export function listStarts(points: readonly (readonly number[])[], n: number): number[][] {
	if (!points.length) throw new RangeError('the list of starts is empty');
	if (points.length > MAX_STARTS) throw new RangeError(`at most ${MAX_STARTS} starts`);
	return points.map((p, k) => {
		if (p.length !== n || !p.every(Number.isFinite)) throw new RangeError(`start ${k} must be ${n} finite numbers`);
		return p.slice();
	});
}

/**
 * A uniform grid of `perAxis` points per input at the cell centres
 * lo + (i + ½)(hi − lo)/perAxis — strictly inside the bounds, so no start sits
 * on a bound. Ordered with the first input varying fastest.
 */
export function gridStarts(bounds: Box, perAxis: number): number[][] {
	checkBox(bounds, 'a grid of starts');
	if (!Number.isInteger(perAxis) || perAxis < 1) throw new RangeError('grid: points per axis must be a positive integer');
	const total = perAxis ** bounds.length;
	if (total > MAX_STARTS) throw new RangeError(`grid: ${perAxis}^${bounds.length} = ${total} starts exceeds ${MAX_STARTS}`);
	const out: number[][] = [];
	for (let k = 0; k < total; k++) {
		let r = k;
		out.push(
			bounds.map(([lo, hi]) => {
				const i = r % perAxis;
				r = Math.floor(r / perAxis);
				return lo + ((i + 0.5) * (hi - lo)) / perAxis;
			})
		);
	}
	return out;
}

/**
 * Latin hypercube sample of `count` points in the box (M. D. McKay,
 * R. J. Beckman, W. J. Conover, "A comparison of three methods for selecting
 * values of input variables in the analysis of output from a computer code",
 * Technometrics 21(2):239–245, 1979): each input's range is cut into `count`
 * equal strata, every stratum is used exactly once per input (a Fisher–Yates
 * permutation), and the point is uniform within its stratum. Deterministic
 * for a seed.
 */
export function latinHypercubeStarts(bounds: Box, count: number, seed: number): number[][] {
	checkBox(bounds, 'a Latin hypercube');
	if (!Number.isInteger(count) || count < 1 || count > MAX_STARTS) throw new RangeError(`latin hypercube: count must be an integer in 1…${MAX_STARTS}`);
	if (!Number.isFinite(seed)) throw new RangeError('latin hypercube: seed must be a finite number');
	const rand = mulberry32(seed);
	const out: number[][] = Array.from({ length: count }, () => new Array<number>(bounds.length));
	bounds.forEach(([lo, hi], j) => {
		const perm = Array.from({ length: count }, (_, i) => i);
		for (let i = count - 1; i > 0; i--) {
			const k = Math.floor(rand() * (i + 1));
			[perm[i], perm[k]] = [perm[k], perm[i]];
		}
		for (let i = 0; i < count; i++) out[i][j] = lo + ((perm[i] + rand()) * (hi - lo)) / count;
	});
	return out;
}

/** the starts a study specification asks for */
export function makeStarts(spec: StartSpec, n: number, bounds?: Box): number[][] {
	if ('points' in spec) return listStarts(spec.points, n);
	if (!bounds || bounds.length !== n) throw new RangeError(`grid and Latin-hypercube starts need bounds on all ${n} inputs`);
	if ('grid' in spec) return gridStarts(bounds, spec.grid);
	return latinHypercubeStarts(bounds, spec.latinHypercube, spec.seed);
}
