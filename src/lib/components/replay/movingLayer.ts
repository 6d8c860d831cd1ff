// The moving layer of a replay chart: for each run, the trail so far, the
// current iterate and the step being taken as an arrow, drawn into the SVG of
// a static Observable Plot chart. Pixel positions are computed once; each
// display frame rewrites a few attributes, never the chart.
import type { ReplayClock } from '$lib/replay/clock';
import { symbolPath, type SeriesStyle } from '$lib/replay/palette';

export interface Track {
	/** data coordinates per iteration (non-finite values hold the previous point) */
	xs: ArrayLike<number>;
	ys: ArrayLike<number>;
	style: SeriesStyle;
	/** which path of the clock this track follows */
	clockIndex: number;
}

export interface LayerOptions {
	/** draw the trail of past iterates */
	trail?: boolean;
	/** draw the step to the next iterate as an arrow */
	arrow?: boolean;
	/** a vertical rule through the current iterate (derivative and convergence panels) */
	rule?: boolean;
	/** whole frames only: no movement between iterates */
	reducedMotion?: boolean;
	/** mark radius in px */
	r?: number;
	/** top and bottom of the plotting area in px (where the rule runs) */
	span?: readonly [number, number];
}

type Scale = (v: number) => number;
const SVG = 'http://www.w3.org/2000/svg';
let uid = 0;

function el<K extends keyof SVGElementTagNameMap>(name: K, attrs: Record<string, string | number>): SVGElementTagNameMap[K] {
	const e = document.createElementNS(SVG, name);
	for (const [k, v] of Object.entries(attrs)) e.setAttribute(k, String(v));
	return e;
}

/** Pixel positions with non-finite entries replaced by the previous finite one (or the next, at the start). */
function pixels(vs: ArrayLike<number>, s: Scale): Float64Array {
	const out = new Float64Array(vs.length);
	let last = NaN;
	for (let i = 0; i < vs.length; i++) {
		const p = Number.isFinite(vs[i]) ? s(vs[i]) : NaN;
		out[i] = Number.isFinite(p) ? (last = p) : last;
	}
	const first = out.findIndex((v) => Number.isFinite(v));
	for (let i = 0; i < first; i++) out[i] = out[first];
	return out;
}

export function movingLayer(svg: SVGSVGElement, sx: Scale, sy: Scale, tracks: Track[], clock: ReplayClock, options: LayerOptions = {}): () => void {
	const { trail = true, arrow = true, rule = false, reducedMotion = false, r = 5, span } = options;
	const id = `mv${++uid}`;
	const g = el('g', { class: 'replay-moving', 'aria-hidden': 'true', 'pointer-events': 'none' });
	const defs = el('defs', {});
	g.append(defs);
	const [top, bottom] = span ?? [0, Number(svg.getAttribute('height')) || svg.viewBox.baseVal.height];
	const parts = tracks.map((t, i) => {
		const px = pixels(t.xs, sx);
		const py = pixels(t.ys, sy);
		const colour = t.style.colour;
		const marker = el('marker', { id: `${id}-a${i}`, viewBox: '0 0 10 10', refX: 9, refY: 5, markerWidth: 7, markerHeight: 7, orient: 'auto-start-reverse' });
		marker.append(el('path', { d: 'M0,0L10,5L0,10Z', fill: colour }));
		defs.append(marker);
		const ruleEl = rule ? el('line', { stroke: colour, 'stroke-width': 1, 'stroke-dasharray': '3 3', 'stroke-opacity': 0.7, y1: top, y2: bottom }) : null;
		// the trail is thin and solid with a dot per iterate, so it never reads as the (dashed) fitted curve beside it
		const trailEl = trail ? el('path', { fill: 'none', stroke: colour, 'stroke-width': 1.1, 'stroke-opacity': 0.6 }) : null;
		const dotsEl = trail ? el('path', { fill: colour, 'fill-opacity': 0.7, stroke: 'white', 'stroke-width': 0.6 }) : null;
		const arrowEl = arrow ? el('line', { stroke: colour, 'stroke-width': 1.8, 'marker-end': `url(#${id}-a${i})` }) : null;
		const markEl = el('path', { fill: colour, stroke: 'white', 'stroke-width': 1.5 });
		for (const e of [ruleEl, trailEl, dotsEl, arrowEl, markEl]) if (e) g.append(e);
		return { t, px, py, ruleEl, trailEl, dotsEl, arrowEl, markEl, lastKey: '', trailK: -1, trailD: '' };
	});
	svg.append(g);
	const f1 = (v: number) => (Number.isFinite(v) ? v.toFixed(1) : '0');

	const draw = () => {
		for (const p of parts) {
			const n = p.px.length;
			// not on the clock yet (its lengths are set right after the charts are built): nothing to draw
			if (!n || !Number.isFinite(p.px[0]) || p.t.clockIndex >= clock.lengths.length) {
				p.markEl.setAttribute('d', '');
				continue;
			}
			const pos = reducedMotion ? clock.frameOf(p.t.clockIndex) : clock.positionOf(p.t.clockIndex);
			const k = Math.min(n - 1, Math.floor(pos + 1e-9));
			const frac = k < n - 1 ? pos - k : 0;
			// skip the work when nothing visible changed (a run that has ended, a paused clock)
			const key = `${k}:${frac.toFixed(3)}`;
			if (key === p.lastKey) continue;
			p.lastKey = key;
			const cx = p.px[k] + (k < n - 1 ? (p.px[k + 1] - p.px[k]) * frac : 0);
			const cy = p.py[k] + (k < n - 1 ? (p.py[k + 1] - p.py[k]) * frac : 0);
			if (p.trailEl && p.dotsEl) {
				// the trail up to the current iterate and its dots change only with the whole frame;
				// between frames only the last piece of the trail moves
				if (k !== p.trailK) {
					let d = `M${f1(p.px[0])},${f1(p.py[0])}`;
					let dots = '';
					for (let i = 1; i <= k; i++) d += `L${f1(p.px[i])},${f1(p.py[i])}`;
					for (let i = 0; i < k; i++) dots += `M${f1(p.px[i] - 2.5)},${f1(p.py[i])}a2.5,2.5 0 1,0 5,0a2.5,2.5 0 1,0 -5,0`;
					p.trailD = d;
					p.trailK = k;
					p.dotsEl.setAttribute('d', dots);
				}
				p.trailEl.setAttribute('d', frac > 0 ? `${p.trailD}L${f1(cx)},${f1(cy)}` : p.trailD);
			}
			if (p.arrowEl) {
				const next = k + 1 < n ? k + 1 : -1;
				const show = next >= 0 && Math.hypot(p.px[next] - cx, p.py[next] - cy) > 3;
				p.arrowEl.setAttribute('visibility', show ? 'visible' : 'hidden');
				if (show) {
					p.arrowEl.setAttribute('x1', f1(cx));
					p.arrowEl.setAttribute('y1', f1(cy));
					p.arrowEl.setAttribute('x2', f1(p.px[next]));
					p.arrowEl.setAttribute('y2', f1(p.py[next]));
				}
			}
			if (p.ruleEl) {
				p.ruleEl.setAttribute('x1', f1(cx));
				p.ruleEl.setAttribute('x2', f1(cx));
			}
			p.markEl.setAttribute('d', symbolPath(p.t.style.symbol, cx, cy, r));
		}
	};
	const off = clock.subscribe(draw);
	return () => {
		off();
		g.remove();
	};
}
