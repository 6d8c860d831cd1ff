/**
 * The replay's own series palette: one colour, dash and mark shape per fit or
 * run, so series are told apart by shape and dash as well as by colour. The
 * colours were chosen to keep WCAG AA contrast (≥ 4.5:1) on white and on the
 * page's paper colour and to stay apart under simulated protanopia,
 * deuteranopia and tritanopia; tests/unit/replay/palette.test.ts measures both
 * (sources in docs/references.md, "Replay").
 */

export const SERIES_COLOURS = ['#3a3fd4', '#6f6a00', '#b0309a', '#007f7a', '#5a1217', '#1d2433'] as const;
/** SVG stroke-dasharray per series ('' = solid). */
export const SERIES_DASHES = ['', '6 3', '2 2', '8 3 2 3', '1 3', '10 4'] as const;
/** Plot symbol names per series. */
export const SERIES_SYMBOLS = ['circle', 'square', 'triangle', 'diamond', 'star', 'cross'] as const;
/** The same shapes as text, for legends and labels. */
export const SERIES_GLYPHS = ['●', '■', '▲', '◆', '★', '✚'] as const;
/** Knots where f′ jumps and the kink a run stalled at. */
export const KINK_COLOUR = '#c2410c';

export interface SeriesStyle {
	colour: string;
	dash: string;
	symbol: (typeof SERIES_SYMBOLS)[number];
	glyph: string;
}

export function seriesStyle(i: number): SeriesStyle {
	const k = ((i % SERIES_COLOURS.length) + SERIES_COLOURS.length) % SERIES_COLOURS.length;
	return { colour: SERIES_COLOURS[k], dash: SERIES_DASHES[k], symbol: SERIES_SYMBOLS[k], glyph: SERIES_GLYPHS[k] };
}

/** SVG path data of a mark shape of radius r centred at (x, y); used by the moving layer. */
export function symbolPath(symbol: SeriesStyle['symbol'], x: number, y: number, r: number): string {
	const f = (v: number) => v.toFixed(1);
	switch (symbol) {
		case 'square':
			return `M${f(x - r * 0.85)},${f(y - r * 0.85)}h${f(1.7 * r)}v${f(1.7 * r)}h${f(-1.7 * r)}Z`;
		case 'triangle':
			return `M${f(x)},${f(y - r * 1.1)}L${f(x + r)},${f(y + r * 0.7)}L${f(x - r)},${f(y + r * 0.7)}Z`;
		case 'diamond':
			return `M${f(x)},${f(y - r * 1.2)}L${f(x + r)},${f(y)}L${f(x)},${f(y + r * 1.2)}L${f(x - r)},${f(y)}Z`;
		case 'star': {
			let d = '';
			for (let k = 0; k < 10; k++) {
				const a = -Math.PI / 2 + (k * Math.PI) / 5;
				const rr = k % 2 ? r * 0.5 : r * 1.2;
				d += `${k ? 'L' : 'M'}${f(x + rr * Math.cos(a))},${f(y + rr * Math.sin(a))}`;
			}
			return `${d}Z`;
		}
		case 'cross': {
			const a = r * 0.35;
			return `M${f(x - a)},${f(y - r)}h${f(2 * a)}v${f(r - a)}h${f(r - a)}v${f(2 * a)}h${f(a - r)}v${f(r - a)}h${f(-2 * a)}v${f(a - r)}h${f(a - r)}v${f(-2 * a)}h${f(r - a)}Z`;
		}
		default:
			return `M${f(x - r)},${f(y)}a${f(r)},${f(r)} 0 1,0 ${f(2 * r)},0a${f(r)},${f(r)} 0 1,0 ${f(-2 * r)},0`;
	}
}

const channel = (c: number) => {
	const s = c / 255;
	return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
};

/** '#rrggbb' → linear-light sRGB in 0…1. */
export function linearRgb(hex: string): [number, number, number] {
	const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
	if (!m) throw new RangeError(`colour must be #rrggbb, got ${hex}`);
	return [channel(parseInt(m[1], 16)), channel(parseInt(m[2], 16)), channel(parseInt(m[3], 16))];
}

/** WCAG 2 relative luminance of linear-light sRGB. */
export const relativeLuminance = ([r, g, b]: readonly number[]) => 0.2126 * r + 0.7152 * g + 0.0722 * b;

/** WCAG 2 contrast ratio of two '#rrggbb' colours (1 … 21). */
export function contrastRatio(a: string, b: string): number {
	const la = relativeLuminance(linearRgb(a));
	const lb = relativeLuminance(linearRgb(b));
	return (Math.max(la, lb) + 0.05) / (Math.min(la, lb) + 0.05);
}
