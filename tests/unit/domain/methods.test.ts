// One label per method: the catalogue covers every method the numerics
// registry and the optimizers offer, and the fit preview's picker reads its
// labels from it (common practice, no source).
import { describe, expect, it } from 'vitest';
import { CURVE_METHOD_CATALOGUE, OPTIMIZER_CATALOGUE, continuityText, methodLabel } from '../../../src/lib/domain/methods';
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
	it('writes continuity as people do', () => {
		expect(continuityText('Cinf')).toBe('C∞');
		expect(continuityText('C1')).toBe('C1');
		expect(continuityText(null)).toBe('—');
	});
});
