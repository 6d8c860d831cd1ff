/** Shared helpers for the surface tests: a seeded generator, uneven axes, tabulation on a grid. */
import { mulberry32 } from '../../../src/lib/numerics/math';

/** mulberry32 (the project's seeded generator, numerics/math.ts): tests must be repeatable. */
export const rng = mulberry32;

/** n strictly increasing values from lo to hi with uneven spacing. */
export function unevenAxis(n: number, lo: number, hi: number, seed: number): number[] {
	const r = rng(seed);
	const steps = Array.from({ length: n - 1 }, () => 0.4 + r());
	const total = steps.reduce((p, s) => p + s, 0);
	const a = [lo];
	for (const s of steps) a.push(a[a.length - 1] + ((hi - lo) * s) / total);
	a[n - 1] = hi;
	return a;
}

/** Values of f on the grid, row-major (last input fastest). */
export function tabulate(axes: number[][], f: (x: number[]) => number): number[] {
	const out: number[] = [];
	const d = axes.length;
	const idx = new Array<number>(d).fill(0);
	const total = axes.reduce((p, a) => p * a.length, 1);
	for (let n = 0; n < total; n++) {
		out.push(f(idx.map((i, k) => axes[k][i])));
		for (let k = d - 1; k >= 0; k--) {
			if (++idx[k] < axes[k].length) break;
			idx[k] = 0;
		}
	}
	return out;
}

/** count random points inside the box (margin: fraction of each span kept clear of the edges). */
export function randomPoints(axes: number[][], count: number, seed: number, margin = 0): number[][] {
	const r = rng(seed);
	return Array.from({ length: count }, () =>
		axes.map((a) => {
			const lo = a[0];
			const hi = a[a.length - 1];
			const span = hi - lo;
			return lo + margin * span + r() * span * (1 - 2 * margin);
		})
	);
}
