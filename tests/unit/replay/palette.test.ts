// The replay palette: WCAG AA contrast on the page backgrounds, and series
// still apart under simulated colour-vision deficiencies. Sources: WCAG 2.1
// relative luminance and contrast ratio; Machado, Oliveira & Fernandes (2009)
// simulation matrices at severity 1.0 (from memory of the published table);
// CIE 1976 L*a*b* with the D65 white. See docs/references.md, "Replay".
import { describe, expect, it } from 'vitest';
import { contrastRatio, KINK_COLOUR, linearRgb, SERIES_COLOURS, SERIES_DASHES, SERIES_SYMBOLS, seriesStyle, symbolPath } from '$lib/replay/palette';

const WHITE = '#ffffff';
const PAPER = '#fbfaf7';

// Machado et al. 2009, severity 1.0, applied to linear-light RGB
const SIMULATIONS: Record<string, number[][]> = {
	protanopia: [
		[0.152286, 1.052583, -0.204868],
		[0.114503, 0.786281, 0.099216],
		[-0.003882, -0.048116, 1.051998]
	],
	deuteranopia: [
		[0.367322, 0.860646, -0.227968],
		[0.280085, 0.672501, 0.047413],
		[-0.01182, 0.04294, 0.968881]
	],
	tritanopia: [
		[1.255528, -0.076749, -0.178779],
		[-0.078411, 0.930809, 0.147602],
		[0.004733, 0.691367, 0.3039]
	]
};

function lab([r, g, b]: number[]): [number, number, number] {
	// sRGB (D65) → XYZ → CIELAB
	const X = 0.4124 * r + 0.3576 * g + 0.1805 * b;
	const Y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
	const Z = 0.0193 * r + 0.1192 * g + 0.9505 * b;
	const f = (t: number) => (t > 216 / 24389 ? Math.cbrt(t) : ((24389 / 27) * t + 16) / 116);
	const [fx, fy, fz] = [f(X / 0.95047), f(Y), f(Z / 1.08883)];
	return [116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)];
}
const simulate = (m: number[][], c: number[]) => m.map((row) => Math.min(1, Math.max(0, row[0] * c[0] + row[1] * c[1] + row[2] * c[2])));
const deltaE = (a: number[], b: number[]) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);

describe('replay palette', () => {
	it('computes WCAG contrast as published', () => {
		// WCAG 2.1: black on white is 21:1; #767676 on white is the well-known 4.54:1 (just AA)
		expect(contrastRatio('#000000', WHITE)).toBeCloseTo(21, 9);
		expect(contrastRatio('#767676', WHITE)).toBeCloseTo(4.54, 2);
		expect(contrastRatio(WHITE, WHITE)).toBe(1);
		// symmetric
		expect(contrastRatio('#3a3fd4', PAPER)).toBe(contrastRatio(PAPER, '#3a3fd4'));
		expect(() => linearRgb('blue')).toThrow(/#rrggbb/);
	});

	it('every series colour and the kink colour reach AA (4.5:1) on white and on paper', () => {
		for (const c of [...SERIES_COLOURS, KINK_COLOUR]) {
			expect(contrastRatio(c, WHITE), c).toBeGreaterThanOrEqual(4.5);
			expect(contrastRatio(c, PAPER), c).toBeGreaterThanOrEqual(4.5);
		}
	});

	it('series stay apart (ΔE*ab ≥ 15) for normal vision and under protanopia, deuteranopia and tritanopia', () => {
		const conditions = { normal: [[1, 0, 0], [0, 1, 0], [0, 0, 1]], ...SIMULATIONS };
		for (const [name, m] of Object.entries(conditions)) {
			const labs = SERIES_COLOURS.map((c) => lab(simulate(m, linearRgb(c))));
			for (let a = 0; a < labs.length; a++)
				for (let b = a + 1; b < labs.length; b++) expect(deltaE(labs[a], labs[b]), `${name}: ${SERIES_COLOURS[a]} vs ${SERIES_COLOURS[b]}`).toBeGreaterThanOrEqual(15);
		}
		// the simulation itself: a grey stays grey (rows of each matrix sum to 1)
		for (const m of Object.values(SIMULATIONS)) for (const v of simulate(m, [0.5, 0.5, 0.5])) expect(v).toBeCloseTo(0.5, 5);
	});

	it('each series also has its own dash and mark shape, so colour is never the only cue', () => {
		expect(new Set(SERIES_DASHES).size).toBe(SERIES_COLOURS.length);
		expect(new Set(SERIES_SYMBOLS).size).toBe(SERIES_COLOURS.length);
		expect(seriesStyle(SERIES_COLOURS.length + 1)).toEqual(seriesStyle(1));
		expect(seriesStyle(-1)).toEqual(seriesStyle(SERIES_COLOURS.length - 1));
		for (const s of SERIES_SYMBOLS) expect(symbolPath(s, 10, 10, 4)).toMatch(/^M[\d.]+,[\d.]+.*(Z|0)$/);
	});
});
