/**
 * Surface audits. References: the classes the methods guarantee by
 * construction (multilinear C0, Hermite with shared corner slopes C1, tensor
 * spline C2; common practice, no source) and, for fidelity, an independent
 * refit computed here by hand for one line.
 */
import { describe, expect, it } from 'vitest';
import { auditSurfaceFidelity, auditSurfaceSmoothness } from '../../../src/lib/numerics/audit';
import { fitGrid } from '../../../src/lib/numerics/fits';
import { tabulate, unevenAxis } from './helpers';

const axes = [unevenAxis(9, 0, 3, 1), unevenAxis(8, -1, 2, 2)];
const f = ([x, y]: number[]) => Math.sin(2 * x) * Math.cos(1.5 * y) + 0.3 * x * y;
const values = tabulate(axes, f);

describe('surface smoothness audit', () => {
	it('measures C0 along both inputs for grid-linear and names the worst lines', () => {
		const a = auditSurfaceSmoothness(fitGrid('grid-linear', axes, values));
		expect(a.perInput).toEqual(['C0', 'C0']);
		expect(a.overall).toBe('C0');
		expect(a.worstLines[0].length).toBe(3);
		expect(a.worstLines[0][0].slopeJump).toBeGreaterThan(0.01);
		expect(a.worstLines[0][0].slopeJump).toBeGreaterThanOrEqual(a.worstLines[0][1].slopeJump);
		expect(axes[0]).toContain(a.worstLines[0][0].at);
	});
	it('C1 for grid-akima and grid-pchip, C2 for the tensor splines', () => {
		expect(auditSurfaceSmoothness(fitGrid('grid-akima', axes, values)).perInput).toEqual(['C1', 'C1']);
		expect(auditSurfaceSmoothness(fitGrid('grid-pchip', axes, values)).perInput).toEqual(['C1', 'C1']);
		expect(auditSurfaceSmoothness(fitGrid('grid-cubic-natural', axes, values)).perInput).toEqual(['C2', 'C2']);
		expect(auditSurfaceSmoothness(fitGrid('grid-cubic-not-a-knot', axes, values)).overall).toBe('C2');
	});
	it('a grid mixing a linear-in-x table is still classed per input: a kink along y only', () => {
		const v = tabulate(axes, ([x, y]) => x * x + Math.abs(y - axes[1][3]));
		const a = auditSurfaceSmoothness(fitGrid('grid-cubic-natural', axes, v));
		// the data's kink at y = axes[1][3] is a node: the spline is still C2 by construction
		expect(a.perInput).toEqual(['C2', 'C2']);
		const lin = auditSurfaceSmoothness(fitGrid('grid-linear', axes, v));
		// x² is not piecewise linear (slopes jump along x); along y the worst line is the data's kink
		expect(lin.worstLines[1][0].line).toBe(3);
	});
});

describe('surface fidelity audit (leave one grid line out)', () => {
	it('matches a by-hand refit for the first line of input 1, and smooth fits beat grid-linear on smooth data', () => {
		const a = auditSurfaceFidelity('grid-cubic-not-a-knot', axes, values, 100);
		expect(a.linesLeftOut).toBe(7 + 6);
		expect(a.count).toBe(7 * 8 + 6 * 9);
		// independent: leave out line 1 of input 1 ourselves
		const kept = [axes[0].filter((_, i) => i !== 1), axes[1]];
		const fit = fitGrid('grid-cubic-not-a-knot', kept, tabulate(kept, f));
		let m = 0;
		for (const y of axes[1]) m = Math.max(m, Math.abs(fit.value([axes[0][1], y]) - f([axes[0][1], y])));
		expect(a.max).toBeGreaterThanOrEqual(m);
		const lin = auditSurfaceFidelity('grid-linear', axes, values, 100);
		expect(a.rms).toBeLessThan(lin.rms);
		expect(lin.rms).toBeGreaterThan(0);
	});
});
