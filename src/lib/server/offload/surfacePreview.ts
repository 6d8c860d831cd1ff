/**
 * The dataset page's fit preview for tables of two or more inputs (grids and
 * scattered points), run on an offload thread like the curve preview in
 * fitWork.ts: fit one output, then a map of the fit over two inputs, slices
 * through a chosen point along every input (value and slope), the smoothness
 * audit per input with the worst grid lines, and fidelity by leave-one-out
 * (grid lines left out for grid fits; Rippa's closed form for RBF fits).
 * Answers plain data and never throws for a user's mistake.
 */
import { auditGridFitFidelity, auditSurfaceSmoothness } from '../../numerics/audit/surfaceAudit';
import { FitError } from '../../numerics/fits/fitError';
import { TensorGrid } from '../../numerics/fits/tensorGrid';
import type { SurfaceFit, SurfaceFitOptions, SurfaceMethod } from '../../numerics/fits/surfaceTypes';
import type { SurfacePreview } from '../../domain/wire';
import type { FitProblem } from './fitWork';
import { fitSurfaceTable, surfaceSizeProblem } from './surfaceWork';

/** samples along each slice (the grid values of that input are added, so a kink shows where it is) */
const SLICE_SAMPLES = 200;
const WORST_LINES = 5;

export type SurfacePreviewTask = {
	kind: 'surface-preview';
	/** one column per input, rows in the table's order */
	inputs: Float64Array[];
	y: Float64Array;
	method: SurfaceMethod;
	options: SurfaceFitOptions;
	/** the point the slices (and the map, for three or more inputs) pass through; null: the centre of the data's box */
	through: number[] | null;
	/** the two inputs the map spans (0-based) */
	map: [number, number];
	/** map points per input */
	resolution: number;
};

export type { SurfacePreview };
export type SurfacePreviewResult = { ok: true; preview: SurfacePreview } | { ok: false; problem: FitProblem };

const finite = (v: number): number | null => (Number.isFinite(v) ? v : null);

function linspace(lo: number, hi: number, n: number): number[] {
	return Array.from({ length: n }, (_, i) => (i === n - 1 ? hi : lo + ((hi - lo) * i) / (n - 1)));
}

function smoothness(fit: SurfaceFit): SurfacePreview['continuity'] {
	if (!(fit instanceof TensorGrid)) {
		return { declared: fit.continuity, measured: fit.continuity, perInput: fit.axisContinuity.map((c) => ({ declared: c, measured: c, worst: [], kinks: 0, kinkAt: [] })) };
	}
	const a = auditSurfaceSmoothness(fit, WORST_LINES);
	return {
		declared: fit.continuity,
		measured: a.overall,
		perInput: a.perInput.map((measured, k) => ({
			declared: fit.axisContinuity[k],
			measured,
			worst: a.worstLines[k].map((l) => ({ at: l.at, slopeJump: l.slopeJump, curvatureJump: l.curvatureJump })),
			kinks: a.kinkLines[k].length,
			kinkAt: a.kinkLines[k]
		}))
	};
}

function fidelity(fit: SurfaceFit): SurfacePreview['fidelity'] {
	if (fit instanceof TensorGrid) {
		const f = auditGridFitFidelity(fit);
		return { method: 'grid-lines', looRmse: f.count ? f.rms : null, looMax: f.count ? f.max : null, worstAt: f.count ? f.worstAt : null, points: f.count, condition: null };
	}
	const loo = fit.stats.looResiduals;
	if (!loo) return { method: 'none', looRmse: null, looMax: null, worstAt: null, points: 0, condition: fit.stats.condition ?? null };
	let worst = 0;
	for (let i = 1; i < loo.length; i++) if (Math.abs(loo[i]) > Math.abs(loo[worst])) worst = i;
	return { method: 'rippa', looRmse: fit.stats.looRms ?? null, looMax: Math.abs(loo[worst]), worstAt: null, points: loo.length, condition: fit.stats.condition ?? null };
}

export function surfacePreview(task: SurfacePreviewTask): SurfacePreviewResult {
	const rows = task.y.length;
	const tooBig = surfaceSizeProblem(task.method, rows);
	if (tooBig) return { ok: false, problem: { kind: 'size', message: tooBig } };
	let fit: SurfaceFit;
	try {
		fit = fitSurfaceTable(task.method, task.inputs, task.y, task.options);
	} catch (e) {
		if (e instanceof FitError) return { ok: false, problem: { kind: 'fit', code: e.code, message: e.message } };
		throw e;
	}
	const d = fit.dimension;
	const domain = fit.domain.map(([lo, hi]) => [lo, hi] as [number, number]);
	const through = task.through ?? domain.map(([lo, hi]) => 0.5 * (lo + hi));
	for (let k = 0; k < d; k++) {
		const [lo, hi] = domain[k];
		if (fit.extrapolation === 'refuse' && (through[k] < lo || through[k] > hi)) {
			return { ok: false, problem: { kind: 'at', index: k, message: `${through[k]} lies outside the data [${lo}, ${hi}] of input ${k + 1} and ${task.method} uses the refuse extrapolation rule` } };
		}
	}
	const value = (p: number[]): number | null => {
		try {
			return finite(fit.value(p));
		} catch (e) {
			if (e instanceof FitError) return null;
			throw e;
		}
	};

	const [a, b] = task.map;
	const mx = linspace(domain[a][0], domain[a][1], task.resolution);
	const my = linspace(domain[b][0], domain[b][1], task.resolution);
	const p = through.slice();
	const f = my.map((yv) =>
		mx.map((xv) => {
			p[a] = xv;
			p[b] = yv;
			return value(p);
		})
	);

	const grad = new Float64Array(d);
	const slices = domain.map(([lo, hi], k) => {
		const pts = new Set(linspace(lo, hi, SLICE_SAMPLES + 1));
		if (fit instanceof TensorGrid) for (const v of fit.axes[k]) pts.add(v);
		const x = [...pts].sort((u, v) => u - v);
		const q = through.slice();
		const fs: (number | null)[] = [];
		const dfs: (number | null)[] = [];
		for (const v of x) {
			q[k] = v;
			try {
				fs.push(finite(fit.valueGradient(q, grad)));
				dfs.push(finite(grad[k]));
			} catch (e) {
				if (!(e instanceof FitError)) throw e;
				fs.push(null);
				dfs.push(null);
			}
		}
		return { input: k, x, f: fs, df: dfs };
	});

	return {
		ok: true,
		preview: {
			method: task.method,
			dimension: d,
			domain,
			through,
			continuity: smoothness(fit),
			fidelity: fidelity(fit),
			map: { inputs: [a, b], x: mx, y: my, f },
			slices,
			notes: [...fit.notes]
		}
	};
}
