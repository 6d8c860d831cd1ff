// One label per method: the catalogue covers every method the numerics
// registry and the optimizers offer, and the fit preview's picker reads its
// labels from it (common practice, no source).
import { describe, expect, it } from 'vitest';
import { CURVE_METHOD_CATALOGUE, OPTIMIZER_CATALOGUE, SURFACE_METHOD_CATALOGUE, continuityText, methodLabel } from '../../../src/lib/domain/methods';
import { fitGrid, gridMethods } from '../../../src/lib/numerics/fits/fitGrid';
import { fitScatter } from '../../../src/lib/numerics/fits';
import type { ScatterMethod } from '../../../src/lib/numerics/fits/surfaceTypes';
import { curveMethods } from '../../../src/lib/numerics/fits/fitCurve';
import { OPTIMIZERS } from '../../../src/lib/numerics/optimize/optimize';
import { CURVE_METHOD_CHOICES } from '../../../src/lib/fitMethods';

describe('method catalogue', () => {
	it('names every curve method and every optimizer, each label distinct', () => {
		expect(Object.keys(CURVE_METHOD_CATALOGUE).sort()).toEqual(Object.keys(curveMethods).sort());
		expect(Object.keys(OPTIMIZER_CATALOGUE).sort()).toEqual(Object.keys(OPTIMIZERS).sort());
		const labels = Object.values(CURVE_METHOD_CATALOGUE).map((m) => m.label);
		expect(new Set(labels).size).toBe(labels.length);
	});
	it('is where the preview picker takes its labels from', () => {
		for (const c of CURVE_METHOD_CHOICES) expect(c.label).toBe(methodLabel(c.id));
		expect(methodLabel('cubic-natural')).toBe('Cubic spline, natural ends');
		expect(methodLabel('no-such-method')).toBe('no-such-method');
	});
	it('states each surface method once: the grid registry and the built fits carry the catalogue\'s continuity and minimum', () => {
		const grid = Object.entries(SURFACE_METHOD_CATALOGUE).filter(([, e]) => e.kind === 'grid');
		expect(grid.map(([m]) => m).sort()).toEqual(Object.keys(gridMethods).sort());
		// a 4 × 4 grid of f = x·y (invented), enough points for every grid method
		const axes = [[0, 1, 2, 3], [0, 1, 2, 3]];
		const values = axes[0].flatMap((x) => axes[1].map((y) => x * y));
		for (const [m, e] of grid) {
			expect(gridMethods[m as keyof typeof gridMethods].minPoints).toBe(e.minPoints);
			expect(fitGrid(m as keyof typeof gridMethods, axes, values).continuity).toBe(e.continuity);
		}
		const points = [[0, 0], [1, 0], [0, 1], [1, 1], [0.5, 0.4], [0.2, 0.8]];
		for (const [m, e] of Object.entries(SURFACE_METHOD_CATALOGUE).filter(([, e]) => e.kind === 'scatter')) {
			expect(fitScatter(m as ScatterMethod, points, points.map(([x, y]) => x + 2 * y)).continuity).toBe(e.continuity);
		}
		expect(methodLabel('grid-linear')).toBe('Multilinear');
		const labels = [...Object.values(CURVE_METHOD_CATALOGUE), ...Object.values(SURFACE_METHOD_CATALOGUE)].map((m) => m.label);
		expect(new Set(labels).size).toBe(labels.length);
	});
	it('writes continuity as people do', () => {
		expect(continuityText('Cinf')).toBe('C∞');
		expect(continuityText('C1')).toBe('C1');
		expect(continuityText(null)).toBe('—');
	});
});
