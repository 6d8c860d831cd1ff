/**
 * Audits of grid fits (common practice, no source): the continuity class
 * measured along each input, with the worst grid lines named, and fidelity by
 * leaving out interior grid lines.
 *
 * Smoothness: across each interior grid line of input k, ∂f/∂x_k and
 * ∂²f/∂x_k² are compared on both sides at sample points along the line (the
 * nodes of the other inputs and their cell mid-points). Both sides are
 * evaluated δ = 1e-7 of the neighbouring cell widths away, so a jump is
 * reported when it exceeds what that offset explains (δ times the size of
 * the next derivative), relative to the data's scale.
 *
 * Fidelity: a grid with one node missing is no longer a grid, so instead of
 * leaving out one point we leave out one interior grid line (all its nodes)
 * at a time, refit on the remaining grid and predict the nodes left out.
 */
import type { Continuity } from '../fits/types';
import type { GridMethod } from '../fits/surfaceTypes';
import { fitGrid } from '../fits/fitGrid';
import type { TensorGrid } from '../fits/tensorGrid';

export interface LineJump {
	/** input (0-based) and grid line index along it */
	input: number;
	line: number;
	/** the grid value of the line */
	at: number;
	/** largest |jump| of ∂f/∂x_k and of ∂²f/∂x_k² across the line */
	slopeJump: number;
	curvatureJump: number;
}

export interface SurfaceSmoothnessAudit {
	/** measured class along each input */
	perInput: Continuity[];
	/** weakest over the inputs */
	overall: Continuity;
	/** up to `worst` lines per input, largest slope jump first (then curvature jump) */
	worstLines: LineJump[][];
	/** per input, the grid values of every interior line where the slope jumps (kinks), sorted */
	kinkLines: number[][];
}

function samplesAlong(axis: Float64Array): number[] {
	const out: number[] = [];
	for (let i = 0; i < axis.length; i++) {
		out.push(axis[i]);
		if (i + 1 < axis.length) out.push(0.5 * (axis[i] + axis[i + 1]));
	}
	return out;
}

export function auditSurfaceSmoothness(fit: TensorGrid, worst = 3): SurfaceSmoothnessAudit {
	const d = fit.dimension;
	let fScale = 0;
	for (let i = 0; i < fit.data.length; i += fit.cubic ? 1 << d : 1) fScale = Math.max(fScale, Math.abs(fit.data[i]));
	fScale = Math.max(fScale, 1e-300);
	const perInput: Continuity[] = [];
	const worstLines: LineJump[][] = [];
	const kinkLines: number[][] = [];
	for (let k = 0; k < d; k++) {
		const a = fit.axes[k];
		const others = fit.axes.map((ax, j) => (j === k ? [0] : samplesAlong(ax)));
		// the sample points along a line: the product of the other inputs' samples (capped for large grids)
		const combos: number[][] = [[]];
		for (let j = 0; j < d; j++) {
			const next: number[][] = [];
			const vals = others[j];
			const step = Math.max(1, Math.floor(vals.length / 12));
			for (const c of combos) for (let q = 0; q < vals.length; q += step) next.push([...c, vals[q]]);
			combos.splice(0, combos.length, ...next);
		}
		const jumps: LineJump[] = [];
		const kinks: number[] = [];
		let cls: Continuity = 'C2';
		for (let i = 1; i < a.length - 1; i++) {
			const hmin = Math.min(a[i] - a[i - 1], a[i + 1] - a[i]);
			const delta = 1e-7 * hmin;
			let s1 = 0;
			let s2 = 0;
			for (const c of combos) {
				const pl = c.slice();
				const pr = c.slice();
				pl[k] = a[i] - delta;
				pr[k] = a[i] + delta;
				const L = fit.evaluate(pl);
				const R = fit.evaluate(pr);
				s1 = Math.max(s1, Math.abs(L.grad[k] - R.grad[k]));
				s2 = Math.max(s2, Math.abs(L.hess[k * d + k] - R.hess[k * d + k]));
			}
			jumps.push({ input: k, line: i, at: a[i], slopeJump: s1, curvatureJump: s2 });
			// thresholds: a slope of the data's size per cell width, times 1e-6
			const h = a[a.length - 1] - a[0];
			if (s1 > 1e-6 * (fScale / h)) {
				cls = 'C0';
				kinks.push(a[i]);
			}
			else if (cls === 'C2' && s2 > 1e-4 * (fScale / (hmin * h))) cls = 'C1';
		}
		perInput.push(cls);
		kinkLines.push(kinks);
		jumps.sort((p, q) => q.slopeJump - p.slopeJump || q.curvatureJump - p.curvatureJump);
		worstLines.push(jumps.slice(0, worst));
	}
	const order: Continuity[] = ['C0', 'C1', 'C2', 'Cinf'];
	const overall = perInput.reduce((w, c) => (order.indexOf(c) < order.indexOf(w) ? c : w), 'C2' as Continuity);
	return { perInput, overall, worstLines, kinkLines };
}

export interface SurfaceFidelityAudit {
	/** RMS and largest |error| at the nodes of the lines left out */
	rms: number;
	max: number;
	/** where the largest error sits: the node's inputs */
	worstAt: number[];
	/** nodes predicted */
	count: number;
	/** grid lines left out (input, line) */
	linesLeftOut: number;
}

/** The data values at the nodes of a grid fit (row-major, last input fastest): slot 0 of each node of the cubic representation. */
export function gridNodeValues(fit: TensorGrid): Float64Array {
	const stride = fit.cubic ? 1 << fit.dimension : 1;
	const out = new Float64Array(fit.data.length / stride);
	for (let i = 0; i < out.length; i++) out[i] = fit.data[i * stride];
	return out;
}

/** Leave-one-grid-line-out fidelity of a fitted grid (its own method, axes and node values). */
export function auditGridFitFidelity(fit: TensorGrid, maxLinesPerInput = 12): SurfaceFidelityAudit {
	return auditSurfaceFidelity(fit.method as GridMethod, fit.axes, gridNodeValues(fit), maxLinesPerInput);
}

/**
 * Leave-one-grid-line-out fidelity of a grid method on (axes, values), up to
 * `maxLinesPerInput` interior lines per input (evenly chosen).
 */
export function auditSurfaceFidelity(method: GridMethod, axes: readonly ArrayLike<number>[], values: ArrayLike<number>, maxLinesPerInput = 12): SurfaceFidelityAudit {
	const d = axes.length;
	const sizes = axes.map((a) => a.length);
	let ss = 0;
	let max = 0;
	let worstAt: number[] = [];
	let count = 0;
	let lines = 0;
	for (let k = 0; k < d; k++) {
		const n = sizes[k];
		const interior = Array.from({ length: n - 2 }, (_, i) => i + 1);
		const step = Math.max(1, Math.ceil(interior.length / maxLinesPerInput));
		for (let q = 0; q < interior.length; q += step) {
			const drop = interior[q];
			const keptAxes = axes.map((a, j) => (j === k ? Array.from(a).filter((_, i) => i !== drop) : Array.from(a)));
			const keptValues: number[] = [];
			const left: { p: number[]; v: number }[] = [];
			const idx = new Array<number>(d).fill(0);
			const total = values.length;
			for (let node = 0; node < total; node++) {
				const p = idx.map((i, j) => axes[j][i]);
				if (idx[k] === drop) left.push({ p, v: values[node] });
				else keptValues.push(values[node]);
				for (let j = d - 1; j >= 0; j--) {
					if (++idx[j] < sizes[j]) break;
					idx[j] = 0;
				}
			}
			let fit;
			try {
				fit = fitGrid(method, keptAxes, keptValues);
			} catch {
				continue; // too few lines left for the method along this input
			}
			lines++;
			for (const { p, v } of left) {
				const e = Math.abs(fit.value(p) - v);
				ss += e * e;
				count++;
				if (e > max) {
					max = e;
					worstAt = p;
				}
			}
		}
	}
	return { rms: count ? Math.sqrt(ss / count) : NaN, max, worstAt, count, linesLeftOut: lines };
}
