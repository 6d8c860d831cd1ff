/**
 * The shapes the server sends to pages and scripts: a study's fits, runs (as
 * rows and column by column), scorecard rows, a run's path and the study page's
 * data. The server builds them (server/studies) and the components read them;
 * both import them from here, so a field is added in one place.
 */
import type { StudyStatus } from './lifecycle';
import type { Outcome } from './outcomes';
import type { StudySpec } from './studySpec';
import type { Verdict } from './verdict';

/** One fit of a study as stored: its method, options, audit and reference optimum (and, on the page, samples of f). */
export interface StudyFit {
	id: string;
	position: number;
	method: string;
	options: Record<string, unknown>;
	continuity: string;
	smoothness: null | { declared?: string; measured?: string; maxJumpD1?: number; maxJumpD2?: number; worst?: { x: number; jumpD1: number; jumpD2: number }[]; error?: string; /** grid fits: per input, the grid values where the slope jumps */ kinkLines?: number[][] };
	fidelity: null | { looRmse?: number; looMax?: number; looPoints?: number; overshoot?: number; overshootRelative?: number; monotoneKept?: boolean; dataMonotone?: string | null; stretches?: { from: number; to: number; direction: string; kept: boolean; worstAt: number | null }[] | null; spuriousExtrema?: number; error?: string };
	reference: null | { kind: string; x: number[] | null; f: number | null; roots?: number[]; fRange: number; note?: string; error?: string };
	samples?: { x: number[]; f: (number | null)[] } | null;
	/** studies over two inputs, on the page: f over the bounds' box, f[j][i] at (x[i], y[j]); null outside the data under the refuse rule */
	map?: { x: number[]; y: number[]; f: (number | null)[][] } | null;
}

/** One run: where it started and ended, how, and what it cost. */
export interface RunRow {
	/** the run's public id (random; the sequential key stays in the database) */
	id: string;
	fitId: string;
	method: string;
	optimizer: string;
	optimizerIndex: number;
	startIndex: number;
	start: number[];
	outcome: string;
	atKink: boolean;
	/** the end point lies outside the data's range (on the fit's extrapolation) */
	outsideData: boolean;
	reason: string;
	iterations: number;
	evaluations: { f: number; grad: number };
	x: number[];
	f: number | null;
	gradNorm: number | null;
	ms: number;
}

/**
 * The runs of a study column by column, for the study page: arrays of
 * numbers serialise and load several times faster than thousands of small
 * objects. The page turns them back into rows (`runRows` in components/study/runs.ts).
 */
export interface RunColumns {
	n: number;
	fitIds: string[];
	optimizers: string[];
	/** start points, n numbers each, by start index */
	starts: number[];
	id: string[];
	fit: number[];
	optimizer: number[];
	start: number[];
	outcome: string[];
	atKink: boolean[];
	outsideData: boolean[];
	reason: string[];
	iterations: number[];
	evalsF: number[];
	evalsGrad: number[];
	/** end points, n numbers each */
	x: (number | null)[];
	f: (number | null)[];
	gradNorm: (number | null)[];
	ms: number[];
}

/** A run's whole path (`GET /api/v1/runs/:id/path`): one entry per iterate; NaN is sent as null. */
export interface PathJson {
	x: (number | null)[][];
	f: (number | null)[];
	grad: (number | null)[][];
	step: (number | null)[];
	violation: (number | null)[];
}

/** Monotonicity as the scorecard states it. */
export type Monotone =
	| { applies: 'whole'; direction: string; kept: boolean }
	| { applies: 'stretches'; total: number; kept: number; broken: { from: number; to: number }[] }
	| { applies: 'no'; reason: string }
	| null;

/** One fit × optimizer row of the scorecard. */
export interface ScorecardRow {
	rank: number;
	fitId: string;
	method: string;
	optimizer: string;
	optimizerIndex: number;
	runs: number;
	/** share of runs that converged away from a kink */
	successRate: number;
	medianIterations: number | null;
	medianEvaluations: number | null;
	best: { x: number[]; f: number; runId: number; converged: boolean } | null;
	outcomes: Record<Outcome, number>;
	atKink: number;
	/** runs whose end point lies outside the data's range (on the fit's extrapolation) */
	outsideData: number;
	/** range of x* (first input) and of f* over the converged runs; `inputs`: the range of each input (two or more inputs) */
	spread: { x: number; f: number; inputs?: number[] } | null;
	reference: { x: number[] | null; f: number | null } | null;
	/** how far the best end point is from the reference: |Δx| and the shortfall in f (0 when it matches or beats it) */
	gap: { x: number | null; f: number } | null;
	reachesReference: boolean | null;
	continuity: { declared: string; measured: string | null };
	fidelity: { looRmse: number | null; overshoot: number | null; overshootRelative?: number | null; monotoneKept: boolean | null; spuriousExtrema: number | null } | null;
	/** whole-curve monotonicity when the data are monotone, else per monotone stretch of the data */
	monotone: Monotone;
	/** separate places the converged runs ended (first coordinate; `point`: every input, for two or more), with the share of converged runs at each */
	optima: { x: number; point?: number[]; share: number }[] | null;
	verdict: Verdict;
}

/** The fit the team picked, with the reason. */
export interface StudyPick {
	fitId: string;
	rationale: string;
	by: string | null;
	at: Date;
}

/** What the study page and the shared page load (paths excluded: they are fetched when a run is opened). */
export interface StudyPage {
	study: {
		id: string;
		name: string;
		status: StudyStatus;
		progress: { done: number; total: number };
		audits: { done: number; total: number };
		error: string | null;
		output: string;
		spec: StudySpec;
		createdBy: string | null;
		createdAt: string;
		startedAt: string | null;
		finishedAt: string | null;
		pick: StudyPick | null;
	};
	fits: StudyFit[];
	scorecard: ScorecardRow[];
	runs: RunColumns | null;
	data: { x: number[]; y: number[]; inputs?: number[][] } | null;
}

/** The dataset page's fit preview of a grid or scattered table (`POST /api/v1/datasets/:id/fit-preview` on a dataset of two or more inputs). */
export interface SurfacePreview {
	method: string;
	dimension: number;
	domain: [number, number][];
	through: number[];
	continuity: {
		declared: string;
		measured: string;
		/** per input: the class measured along it and (grid fits) its worst grid lines, largest slope jump first */
		perInput: { declared: string; measured: string; worst: { at: number; slopeJump: number; curvatureJump: number }[]; kinks: number; kinkAt: number[] }[];
	};
	fidelity: {
		/** 'grid-lines': interior grid lines left out one at a time and predicted; 'rippa': RBF leave-one-out in closed form */
		method: 'grid-lines' | 'rippa' | 'none';
		looRmse: number | null;
		looMax: number | null;
		worstAt: number[] | null;
		points: number;
		/** RBF: estimate of the condition number of the solved system */
		condition: number | null;
	};
	/** f over inputs map[0] × map[1] (the others at `through`); f[j][i] at (x[i], y[j]); null outside the data under the refuse rule */
	map: { inputs: [number, number]; x: number[]; y: number[]; f: (number | null)[][] };
	/** along each input through `through`: value and slope along it */
	slices: { input: number; x: number[]; f: (number | null)[]; df: (number | null)[] }[];
	notes: string[];
}
