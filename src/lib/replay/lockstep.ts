/**
 * Which runs a replay shows and the series it draws from their paths. Plain
 * TypeScript: the study page's replay and the tests use it alike.
 *
 * Lockstep: one start and one optimizer, the run of every fit from there, in
 * the fits' order (the same problem over every fit). Overlay: any chosen runs
 * on one chart.
 */
import type { PathJson, RunRow } from '../domain/wire';

/** The fields of a run the replay needs. */
export type ReplayRun = Pick<RunRow, 'id' | 'fitId' | 'optimizerIndex' | 'startIndex' | 'start' | 'outcome' | 'atKink' | 'iterations' | 'x' | 'f'>;

/** A path as the API sends it (non-finite numbers are null). */
export type ReplayPath = PathJson;

/** What a scorecard row or a runs-table row asks the replay to open. */
export interface ReplayRequest {
	optimizerIndex: number;
	startIndex?: number | null;
	/** the fit whose panel is brought forward (scorecard row) */
	fitId?: string | null;
	/** one run (runs-table row): its start and optimizer */
	runId?: string | null;
	/** changes on every request, so asking for the same thing again still opens it */
	seq: number;
}

/** The runs of every fit from one start with one optimizer, in the order of `fitIds`; a fit without such a run is left out. */
export function lockstepRuns<R extends ReplayRun>(runs: readonly R[], fitIds: readonly string[], startIndex: number, optimizerIndex: number): R[] {
	const byFit = new Map<string, R>();
	for (const r of runs) if (r.startIndex === startIndex && r.optimizerIndex === optimizerIndex && !byFit.has(r.fitId)) byFit.set(r.fitId, r);
	return fitIds.flatMap((id) => (byFit.has(id) ? [byFit.get(id)!] : []));
}

/** The starts the runs used, by index, with the start point of each (ascending index). */
export function startsOf(runs: readonly ReplayRun[]): { index: number; x: number[] }[] {
	const m = new Map<number, number[]>();
	for (const r of runs) if (!m.has(r.startIndex)) m.set(r.startIndex, r.start);
	return [...m.entries()].sort((a, b) => a[0] - b[0]).map(([index, x]) => ({ index, x }));
}

/**
 * The start a first look should open with, for one optimizer: the one whose
 * fits disagree most (most distinct outcomes, then most runs at a kink), ties to
 * the lowest index. That is where the replay has something to show.
 */
export function tellingStart(runs: readonly ReplayRun[], optimizerIndex: number): number | null {
	const by = new Map<number, { outcomes: Set<string>; kinks: number }>();
	for (const r of runs) {
		if (r.optimizerIndex !== optimizerIndex) continue;
		const e = by.get(r.startIndex) ?? { outcomes: new Set(), kinks: 0 };
		e.outcomes.add(r.outcome);
		if (r.atKink) e.kinks++;
		by.set(r.startIndex, e);
	}
	let best: number | null = null;
	let score = -1;
	for (const [i, e] of [...by.entries()].sort((a, b) => a[0] - b[0])) {
		const s = e.outcomes.size * 1000 + e.kinks;
		if (s > score) {
			score = s;
			best = i;
		}
	}
	return best;
}

/** Euclidean norm; null when any entry is missing. */
export function norm(v: readonly (number | null)[]): number | null {
	let s = 0;
	for (const c of v) {
		if (c === null || !Number.isFinite(c)) return null;
		s += c * c;
	}
	return Math.sqrt(s);
}

/** One input's coordinate per iteration (non-finite → NaN, which the moving layer holds over). */
export function inputSeries(path: ReplayPath, input = 0): Float64Array {
	return Float64Array.from(path.x, (row) => row[input] ?? NaN);
}

/** The fit's value per iteration. */
export function valueSeries(path: ReplayPath): Float64Array {
	return Float64Array.from(path.f, (v) => v ?? NaN);
}

export interface ConvergenceRow {
	iteration: number;
	/** |f − f*| (null where f is missing) */
	gap: number | null;
	/** ‖∇f‖ */
	grad: number | null;
	/** largest constraint violation */
	violation: number | null;
}

/**
 * What a convergence plot draws for one path: |f − f*| and ‖∇f‖ (and the
 * constraint violation) per iteration. Zeros stay zeros here; a log-scale chart
 * leaves them out (they have no place on a log axis).
 */
export function convergenceRows(path: ReplayPath, fStar: number): ConvergenceRow[] {
	if (!Number.isFinite(fStar)) throw new RangeError(`f* must be a finite number, got ${fStar}`);
	return path.f.map((f, i) => ({
		iteration: i,
		gap: f === null || !Number.isFinite(f) ? null : Math.abs(f - fStar),
		grad: norm(path.grad[i] ?? []),
		violation: path.violation[i] ?? null
	}));
}

/** Whether any iterate of the path breaks a constraint (then the violation is plotted instead of ‖∇f‖). */
export const hasViolation = (path: ReplayPath) => path.violation.some((v) => v !== null && v > 0);

/**
 * The f* a run's gap is measured against: the target for a `solve`, else the
 * fit's own optimum found by the dense reference search when there is one,
 * else the best value any of the given runs reached for that fit.
 */
export function fStarOf(kind: string, target: number | undefined, reference: { f: number | null; error?: string } | null | undefined, runs: readonly Pick<ReplayRun, 'f'>[]): number | null {
	if (kind === 'solve') return Number.isFinite(target) ? (target as number) : null;
	if (reference && !reference.error && reference.f !== null && Number.isFinite(reference.f)) return reference.f;
	const fs = runs.map((r) => r.f).filter((v): v is number => v !== null && Number.isFinite(v));
	if (!fs.length) return null;
	return kind === 'maximize' ? Math.max(...fs) : Math.min(...fs);
}
