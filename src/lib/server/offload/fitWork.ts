/**
 * The fit work that runs on an offload thread: a dataset fit preview (fit, audits,
 * dense samples) and the fits a study launch builds. Pure computation on
 * arrays, answering plain data (never throwing for a user's mistake), so the
 * same code runs on a thread and, for the seed and benchmarks, in-process.
 */
import type { FitPreview } from '../../fitMethods';
import { auditFidelity } from '../../numerics/audit/fidelity';
import { auditSmoothness } from '../../numerics/audit/smoothness';
import { FitError, type FitErrorCode } from '../../numerics/fits/fitError';
import { fitCurve } from '../../numerics/fits/fitCurve';
import type { CurveFitOptions, CurveMethod } from '../../numerics/fits/types';
import { sizeProblem } from './limits';
import { surfacePreview, type SurfacePreviewResult, type SurfacePreviewTask } from './surfacePreview';
import { buildSurfaceFits, type SurfaceBuildTask } from './surfaceWork';

// Evenly spaced samples across the domain; the knots are added when there are
// not too many, so f′ and f″ break exactly where the fit does.
const SAMPLES = 400;
const MAX_KNOTS_SAMPLED = 2000;
const WORST_LISTED = 25;
// Past this many rows the fidelity audit samples: fewer leave-one-out refits
// (each costs a whole fit) and fewer probes per interval, so a preview of a
// 100,000-row table answers in about a second rather than tens.
const LARGE = 5000;

function fidelityOptions(n: number) {
	if (n <= LARGE) return {};
	return { looMaxPoints: Math.max(10, Math.min(200, Math.round(1e6 / n))), samplesPerInterval: 2, derivativePoints: 100 };
}

const nullIfNaN = (v: number): number | null => (Number.isFinite(v) ? v : null);

/** Sorted, distinct sample points: an even grid over the domain plus the knots. */
function samplePoints(lo: number, hi: number, knots: Float64Array): Float64Array {
	const pts: number[] = [];
	for (let i = 0; i <= SAMPLES; i++) pts.push(i === SAMPLES ? hi : lo + ((hi - lo) * i) / SAMPLES);
	if (knots.length <= MAX_KNOTS_SAMPLED) for (const k of knots) if (k >= lo && k <= hi) pts.push(k);
	const sorted = Float64Array.from(pts).sort();
	let m = 0;
	for (let i = 0; i < sorted.length; i++) if (i === 0 || sorted[i] !== sorted[m - 1]) sorted[m++] = sorted[i];
	return sorted.slice(0, m);
}

/** A user's problem with a fit request, as data: which part failed and why. */
export type FitProblem =
	| { kind: 'fit'; code: FitErrorCode; message: string }
	| { kind: 'size'; message: string }
	| { kind: 'at'; index: number; message: string };

type PreviewTask = { kind: 'preview'; x: Float64Array; y: Float64Array; method: CurveMethod; options: CurveFitOptions; at?: number[] };
export type BuildTask = {
	kind: 'build';
	x: Float64Array;
	/** the output columns the fits need, by name */
	columns: Record<string, Float64Array>;
	fits: { method: CurveMethod; options: CurveFitOptions; outputs: string[] }[];
};
export type FitTask = PreviewTask | BuildTask | SurfaceBuildTask | SurfacePreviewTask;

export type PreviewResult = { ok: true; preview: FitPreview } | { ok: false; problem: FitProblem };
/** Per study fit: the fit files (JSON) of each output in order, or the first problem. */
export type BuildResult = { ok: true; fits: string[][] } | { ok: false; index: number; output: string; problem: FitProblem };

const asProblem = (e: unknown): FitProblem => {
	if (e instanceof FitError) return { kind: 'fit', code: e.code, message: e.message };
	throw e;
};

export function previewFit(task: PreviewTask): PreviewResult {
	const { x, y, method, options } = task;
	const tooBig = sizeProblem(method, x.length);
	if (tooBig) return { ok: false, problem: { kind: 'size', message: tooBig } };
	try {
		const fit = fitCurve(method, x, y, options);
		const smooth = auditSmoothness(fit, { worst: WORST_LISTED });
		const fid = auditFidelity(fit, x, y, fidelityOptions(x.length));
		const [lo, hi] = fit.domain;
		const sx = samplePoints(lo, hi, fit.knots);
		const s = fit.evaluateMany(sx);
		const preview: FitPreview = {
			method: fit.method,
			continuity: {
				declared: smooth.declared,
				measured: smooth.measured,
				worst: smooth.worst.map((w) => ({ x: w.x, jumpD1: w.jumpD1, jumpD2: w.jumpD2 }))
			},
			fidelity: {
				looRmse: nullIfNaN(fid.looRmse),
				looMax: nullIfNaN(fid.looMax),
				overshoot: fid.overshoot,
				monotoneKept: fid.monotoneKept,
				spuriousExtrema: fid.spuriousExtrema
			},
			samples: { x: Array.from(sx), f: Array.from(s.f), df: Array.from(s.df), d2f: Array.from(s.d2f) }
		};
		if (task.at) {
			const at = { x: task.at, f: [] as number[], df: [] as number[], d2f: [] as number[] };
			for (let k = 0; k < task.at.length; k++) {
				let jet;
				try {
					jet = fit.evaluate(task.at[k]);
				} catch (e) {
					return { ok: false, problem: { kind: 'at', index: k, message: asProblem(e).message } };
				}
				at.f.push(jet.f);
				at.df.push(jet.df);
				at.d2f.push(jet.d2f);
			}
			preview.at = at;
		}
		return { ok: true, preview };
	} catch (e) {
		return { ok: false, problem: asProblem(e) };
	}
}

export function buildFits(task: BuildTask): BuildResult {
	const out: string[][] = [];
	for (let i = 0; i < task.fits.length; i++) {
		const spec = task.fits[i];
		const tooBig = sizeProblem(spec.method, task.x.length);
		if (tooBig) return { ok: false, index: i, output: spec.outputs[0], problem: { kind: 'size', message: tooBig } };
		const files: string[] = [];
		for (const output of spec.outputs) {
			try {
				files.push(JSON.stringify(fitCurve(spec.method, task.x, task.columns[output], spec.options).toJSON()));
			} catch (e) {
				return { ok: false, index: i, output, problem: asProblem(e) };
			}
		}
		out.push(files);
	}
	return { ok: true, fits: out };
}

export function runFitTask(task: FitTask): PreviewResult | BuildResult | SurfacePreviewResult {
	if (task.kind === 'build-surface') return buildSurfaceFits(task);
	if (task.kind === 'surface-preview') return surfacePreview(task);
	return task.kind === 'preview' ? previewFit(task) : buildFits(task);
}
