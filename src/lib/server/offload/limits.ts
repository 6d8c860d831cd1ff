/**
 * Cost limits of fit building, in one place. Every fit preview and every fit a
 * study launch builds runs on an offload thread (never on the request thread) within
 * a time budget; methods whose cost or meaning breaks down past a size are
 * refused up front with the reason.
 */
import type { CurveMethod } from '../../numerics/fits/types';

/** Wall-clock budget of one fit preview (fit, audits, samples) on an offload thread (KINKLESS_FIT_BUDGET_MS). */
export const PREVIEW_BUDGET_MS = Number(process.env.KINKLESS_FIT_BUDGET_MS) > 0 ? Number(process.env.KINKLESS_FIT_BUDGET_MS) : 20_000;
/** Wall-clock budget for reading one uploaded table (CSV, TSV, XLSX). */
export const PARSE_BUDGET_MS = 30_000;
/** Wall-clock budget for building all the fits of one study launch. */
export const LAUNCH_BUILD_BUDGET_MS = 30_000;
/** Requests waiting for an offload thread before new ones are told to retry (503). */
export const MAX_WAITING = 8;

/** Largest number of data points per method, with the reason a user reads. */
const METHOD_MAX_POINTS: Partial<Record<CurveMethod, { max: number; why: string }>> = {
	'polynomial-global': {
		max: 40,
		why: 'an interpolating polynomial through more points than this rings between them (Runge’s phenomenon) and means nothing as a model of the table; use a spline, or polynomial-least-squares for a low-degree trend'
	},
	'polynomial-least-squares': { max: 200_000, why: 'the least-squares system grows with rows × (degree + 1); thin the table or use a spline' },
	'smoothing-spline': { max: 200_000, why: 'choosing λ by generalised cross-validation refits the spline many times; thin the table or give lambda' }
};

/** The refusal message for `method` on `n` points, or null when the size is fine. */
export function sizeProblem(method: CurveMethod, n: number): string | null {
	const cap = METHOD_MAX_POINTS[method];
	if (!cap || n <= cap.max) return null;
	return `${method} takes at most ${cap.max.toLocaleString('en-US')} points and this table has ${n.toLocaleString('en-US')}: ${cap.why}`;
}

/** A budget as people say it: "300 ms", "20 s". */
export const formatBudget = (ms: number) => (ms < 1000 ? `${Math.round(ms)} ms` : `${Number((ms / 1000).toPrecision(3))} s`);
