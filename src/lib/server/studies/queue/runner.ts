/**
 * Executes study jobs: the same code runs in the app's worker threads, in
 * `npm run worker` processes, and synchronously in the demo seed.
 *
 * Exactly once, whole: runs are inserted in one transaction per batch with
 * ON CONFLICT DO NOTHING on (study, fit, optimizer, start), after locking the
 * study row; the study's counters move in the same transaction, so a retried
 * or duplicated job stores nothing twice, and the transaction that stores the
 * last run is the one that marks the study done (and queues its e-mail).
 * A retried job first skips the starts already stored.
 */
import os from 'node:os';
import type { Knex } from 'knex';
import { auditFidelity } from '../../../numerics/audit/fidelity';
import { monotoneStretches } from '../../../numerics/audit/monotoneStretches';
import { auditSmoothness } from '../../../numerics/audit/smoothness';
import { fitFromJSON } from '../../../numerics/fits/fitCurve';
import type { CurveFit } from '../../../numerics/fits/types';
import { auditGridFitFidelity, auditSurfaceSmoothness } from '../../../numerics/audit/surfaceAudit';
import { surfaceFromJSON } from '../../../numerics/fits/surfaceFile';
import type { SurfaceFit } from '../../../numerics/fits/surfaceTypes';
import { TensorGrid } from '../../../numerics/fits/tensorGrid';
import { surfaceProblem } from '../../../domain/surfaceProblem';
import { optimize } from '../../../numerics/optimize/optimize';
import { brokenRun } from '../../../numerics/optimize/run';
import type { OptimizeOptions, OptimizerName, Problem, RunResult } from '../../../numerics/optimize/types';
import { getWithData } from '../../datasets/store';
import { insertJobs } from './boss';
import { mailJob, runsJob, softSeconds, type StudyJob } from './jobs';
import { ACTIVE_STATUSES, isActive } from '../../../domain/lifecycle';
import { packPath } from '../../../domain/pathPack';
import { curveProblem, kinksOf, type ProblemSpec } from '../../../domain/problem';
import { studyReason, type ReasonContext } from '../../../domain/reasonWording';
import { referenceOptimum } from '../../../domain/reference';
import type { StudySpec } from '../../../domain/studySpec';

export type Db = Knex | Knex.Transaction;

export interface JobResult {
	status: string;
	stored: number;
	skipped: number;
	continued?: boolean;
}

export interface RunnerContext {
	db: Knex;
	/** who computed a run (host/pid/thread), stored with it */
	worker?: string;
	/** prepared problems by study and fit, reused across jobs in one thread */
	cache?: Map<string, Prepared>;
	/** how jobs (continuations, the e-mail) are queued; null: queue nothing (the seed runs everything itself) */
	sendJobs?: ((db: Db, jobs: import('pg-boss').JobInsert[]) => Promise<void>) | null;
	/** after this long a runs job hands its remaining starts to a new job (default KINKLESS_JOB_SOFT_SECONDS) */
	softMs?: number;
}

interface Prepared {
	studyId: string;
	queue: string;
	n: number;
	spec: StudySpec;
	starts: number[][];
	fit: CurveFit;
	/** the surface fit, for studies of two or more inputs (fit is then unused) */
	surface?: SurfaceFit;
	problem: Problem;
	/** how reasons are reworded in the study's own sense (reasonWording.ts) */
	wording: ReasonContext;
}

/** methods whose knots are the data's x values (an optimum on a knot is on a data point) */
const KNOTS_ARE_DATA = new Set(['linear', 'cubic-natural', 'cubic-not-a-knot', 'cubic-clamped', 'akima', 'akima-modified', 'pchip', 'local-quadratic', 'local-cubic', 'smoothing-spline']);

const CACHE_LIMIT = 64;
/** store a batch after this many runs or this long */
const BATCH_RUNS = 400;
const BATCH_MS = 1000;
const CANCEL_CHECK_MS = 100;

export function unpackStarts(bytes: Buffer, count: number, n: number): number[][] {
	const a = new Float64Array(count * n);
	new Uint8Array(a.buffer).set(bytes);
	return Array.from({ length: count }, (_, s) => Array.from(a.subarray(s * n, (s + 1) * n)));
}

export function packStarts(starts: number[][], n: number): Buffer {
	const a = new Float64Array(starts.length * n);
	starts.forEach((p, s) => a.set(p, s * n));
	return Buffer.from(a.buffer, a.byteOffset, a.byteLength);
}

/** Options one optimizer runs with: study budgets, then the optimizer's own options. */
export function optionsFor(spec: StudySpec, optimizer: number): OptimizeOptions {
	return { ...spec.budgets, ...(spec.optimizers[optimizer]?.options ?? {}) };
}

function problemSpec(spec: StudySpec): ProblemSpec {
	return { kind: spec.problem.kind, target: spec.problem.target, bounds: spec.problem.bounds, constraints: spec.problem.constraints };
}

async function prepare(ctx: RunnerContext, studyId: string, fitId: string): Promise<Prepared | null> {
	const key = `${studyId}/${fitId}`;
	const hit = ctx.cache?.get(key);
	if (hit) return hit;
	const [study, fitRow] = await Promise.all([
		ctx.db('studies').where({ id: studyId }).first('id', 'queue', 'spec', 'n_inputs', 'start_count', 'starts'),
		ctx.db('study_fits').where({ id: fitId, study_id: studyId }).first('fit', 'constraint_fits')
	]);
	if (!study || !fitRow) return null;
	const spec = study.spec as StudySpec;
	if (spec.dataset?.shape && spec.dataset.shape !== 'curve') return prepareSurface(ctx, key, study, spec, fitRow);
	const fit = fitFromJSON(fitRow.fit);
	const constraintFits = (fitRow.constraint_fits as unknown[]).map((j) => fitFromJSON(j));
	const kinks = kinksOf(fit);
	const measured = fit.knots.length < 3 ? 'Cinf' : (safe(() => auditSmoothness(fit, { worst: 1 }).measured) as { error?: string } | string);
	const wording: ReasonContext = {
		kind: spec.problem.kind,
		bounds: spec.problem.bounds,
		inputName: spec.dataset?.input?.name,
		measured: typeof measured === 'string' ? measured : null,
		kinked: kinks.length > 0,
		dataX: KNOTS_ARE_DATA.has(fit.method) ? fit.knots : undefined,
		method: fit.method
	};
	const prepared: Prepared = {
		studyId,
		queue: study.queue,
		n: study.n_inputs,
		spec,
		starts: unpackStarts(study.starts, study.start_count, study.n_inputs),
		fit,
		problem: curveProblem(fit, constraintFits, problemSpec(spec), kinks),
		wording
	};
	if (ctx.cache) {
		if (ctx.cache.size >= CACHE_LIMIT) ctx.cache.delete(ctx.cache.keys().next().value!);
		ctx.cache.set(key, prepared);
	}
	return prepared;
}

/** A study of two or more inputs: surface fits, the surface problem; kinks from the grid audit. */
function prepareSurface(ctx: RunnerContext, key: string, study: Record<string, unknown>, spec: StudySpec, fitRow: Record<string, unknown>): Prepared {
	const surface = surfaceFromJSON(fitRow.fit);
	const constraintFits = (fitRow.constraint_fits as unknown[]).map((j) => surfaceFromJSON(j));
	const n = study.n_inputs as number;
	const prepared: Prepared = {
		studyId: study.id as string,
		queue: study.queue as string,
		n,
		spec,
		starts: unpackStarts(study.starts as Buffer, study.start_count as number, n),
		fit: null as unknown as CurveFit,
		surface,
		problem: surfaceProblem(surface, constraintFits, problemSpec(spec)),
		wording: { kind: spec.problem.kind, bounds: spec.problem.bounds, measured: surface.continuity, kinked: surface.continuity === 'C0', method: surface.method }
	};
	if (ctx.cache) {
		if (ctx.cache.size >= CACHE_LIMIT) ctx.cache.delete(ctx.cache.keys().next().value!);
		ctx.cache.set(key, prepared);
	}
	return prepared;
}

/** The study's status; a queued study becomes running (one round trip when it already runs). */
async function markRunning(db: Db, studyId: string): Promise<string | null> {
	const row = await db('studies').where({ id: studyId }).first('status');
	if (row?.status !== 'queued') return row?.status ?? null;
	await db('studies').where({ id: studyId, status: 'queued' }).update({ status: 'running', started_at: db.fn.now() });
	return 'running';
}


/**
 * The transition to done, queued with its e-mail in the same transaction. Used
 * after the statement that moved the counters returned 'done'.
 */
async function afterAdvance(ctx: RunnerContext, trx: Knex.Transaction, studyId: string, status: string, queue: string): Promise<void> {
	if (status === 'done' && ctx.sendJobs !== null) await (ctx.sendJobs ?? insertJobs)(trx, [mailJob(queue, { studyId, event: 'done' })]);
}

/** Counters move by these amounts; the study becomes done when both reach their totals. */
const ADVANCE_SQL = `UPDATE studies SET
		runs_done = runs_done + :runs,
		audits_done = audits_done + :audits,
		started_at = coalesce(started_at, now()),
		status = CASE WHEN runs_done + :runs >= runs_total AND audits_done + :audits >= audits_total THEN 'done' ELSE 'running' END,
		finished_at = CASE WHEN runs_done + :runs >= runs_total AND audits_done + :audits >= audits_total THEN now() ELSE finished_at END`;

const RUN_COLUMNS = 'study_id, fit_id, optimizer, start_index, outcome, at_kink, outside_data, reason, iterations, evals_f, evals_grad, evals_hess, x, f, grad_norm, ms, path_length, path, worker';

/** JSON has no NaN or ±Infinity; PostgreSQL's float8 input reads them as text. */
const jnum = (v: number): number | string => (Number.isFinite(v) ? v : String(v));

function runRecord(p: Prepared, fitId: string, optimizer: number, startIndex: number, r: RunResult, worker: string) {
	return {
		study_id: p.studyId,
		fit_id: fitId,
		optimizer,
		start_index: startIndex,
		outcome: r.outcome,
		at_kink: r.atKink,
		outside_data: r.outsideData === true,
		reason: studyReason(r, p.wording).slice(0, 500),
		iterations: r.iterations,
		evals_f: r.evaluations.f,
		evals_grad: r.evaluations.grad,
		evals_hess: r.evaluations.hess,
		x: r.x.map(jnum),
		f: jnum(r.f),
		grad_norm: jnum(r.gradNorm),
		ms: r.ms,
		path_length: r.path.f.length,
		path: packPath(r.path, p.n).toString('base64'),
		worker
	};
}

/**
 * Store a batch of runs in one statement: lock the study row (only while it is
 * queued or running), insert the runs that are not there yet, and move the
 * counters by the number actually inserted. Returns the study's status
 * afterwards, or null when it was no longer active (nothing stored).
 */
async function storeRuns(trx: Knex.Transaction, studyId: string, rows: ReturnType<typeof runRecord>[]): Promise<{ status: string | null; inserted: number }> {
	const { rows: out } = await trx.raw(
		`WITH s AS (
			SELECT id FROM studies WHERE id = :study AND status IN ('queued', 'running') FOR UPDATE
		), ins AS (
			INSERT INTO study_runs (${RUN_COLUMNS})
			SELECT r.study_id, r.fit_id, r.optimizer, r.start_index, r.outcome, r.at_kink, r.outside_data, r.reason, r.iterations, r.evals_f, r.evals_grad, r.evals_hess,
				r.x, r.f, r.grad_norm, r.ms, r.path_length, decode(r.path, 'base64'), r.worker
			FROM json_to_recordset(CAST(:rows AS json)) AS r(study_id uuid, fit_id uuid, optimizer smallint, start_index int, outcome text, at_kink boolean, outside_data boolean, reason text,
				iterations int, evals_f int, evals_grad int, evals_hess int, x float8[], f float8, grad_norm float8, ms real, path_length int, path text, worker text)
			WHERE EXISTS (SELECT 1 FROM s)
			ON CONFLICT (study_id, fit_id, optimizer, start_index) DO NOTHING
			RETURNING 1
		), n AS (SELECT CAST(count(*) AS int) AS inserted FROM ins)
		${ADVANCE_SQL.replace(/:runs/g, '(SELECT inserted FROM n)').replace(/:audits/g, '0')}
		WHERE id IN (SELECT id FROM s)
		RETURNING status, (SELECT inserted FROM n) AS inserted`,
		{ study: studyId, rows: JSON.stringify(rows) }
	);
	return out.length ? { status: out[0].status, inserted: out[0].inserted } : { status: null, inserted: 0 };
}

/**
 * One run that can never fail its study: an error thrown by the fit or the
 * optimizer is stored as a `diverged` run with the error as its reason (and
 * logged), instead of failing the job and, after its retries, the study.
 */
function safeOptimize(problem: Problem, method: OptimizerName, options: OptimizeOptions, start: number[]): RunResult {
	try {
		return optimize(problem, method, options, start);
	} catch (err) {
		console.error(`study run (${method}) failed and is stored as diverged:`, err);
		return brokenRun(problem, method, start, err);
	}
}

async function runRuns(ctx: RunnerContext, job: Extract<StudyJob, { kind: 'runs' }>, attempt: number): Promise<JobResult> {
	const worker = ctx.worker ?? `${os.hostname()}/${process.pid}`;
	const status = await markRunning(ctx.db, job.studyId);
	if (!isActive(status)) return { status: status ?? 'gone', stored: 0, skipped: 0 };
	const p = await prepare(ctx, job.studyId, job.fitId);
	if (!p) return { status: 'gone', stored: 0, skipped: 0 };
	const optimizers = p.spec.optimizers.map((o, i) => ({ index: i, method: o.method as OptimizerName, options: optionsFor(p.spec, i) }));

	// A retried job (its first attempt may have stored some batches) skips what is there.
	const done = new Set<string>();
	if (attempt > 0) {
		const rows = await ctx.db('study_runs').where({ study_id: job.studyId, fit_id: job.fitId }).whereBetween('start_index', [job.from, job.to - 1]).select('optimizer', 'start_index');
		for (const r of rows) done.add(`${r.optimizer}/${r.start_index}`);
	}
	const softMs = ctx.softMs ?? softSeconds() * 1000;
	const t0 = Date.now();
	let lastFlush = t0;
	let batch: ReturnType<typeof runRecord>[] = [];
	let stored = 0;
	let state: string = status!;

	const flush = async (continueFrom: number | null): Promise<boolean> => {
		const rows = batch;
		batch = [];
		return ctx.db.transaction(async (trx) => {
			const r = await storeRuns(trx, job.studyId, rows);
			if (r.status === null) {
				state = 'stopped';
				return false;
			}
			stored += r.inserted;
			state = r.status;
			await afterAdvance(ctx, trx, job.studyId, r.status, p.queue);
			if (continueFrom !== null && ctx.sendJobs !== null) {
				const maxMs = Math.max(...optimizers.map((o) => Number(o.options.maxMilliseconds ?? 2000)));
				await (ctx.sendJobs ?? insertJobs)(trx, [runsJob(p.queue, { ...job, from: continueFrom }, maxMs)]);
			}
			return true;
		});
	};

	// a cancelled (or deleted) study stops this job between two starts, within about CANCEL_CHECK_MS
	let lastCheck = t0;
	for (let s = job.from; s < job.to; s++) {
		if (Date.now() - lastCheck >= CANCEL_CHECK_MS) {
			lastCheck = Date.now();
			const now = await ctx.db('studies').where({ id: job.studyId }).first('status');
			if (!isActive(now?.status)) return { status: now?.status ?? 'gone', stored, skipped: done.size };
		}
		for (const o of optimizers) {
			if (done.has(`${o.index}/${s}`)) continue;
			batch.push(runRecord(p, job.fitId, o.index, s, safeOptimize(p.problem, o.method, o.options, p.starts[s]), worker));
		}
		const now = Date.now();
		if (s < job.to - 1 && now - t0 > softMs) {
			// hand the rest to a new job so this one never outlives its expiry
			await flush(s + 1);
			return { status: state, stored, skipped: done.size, continued: true };
		}
		if (batch.length >= BATCH_RUNS || now - lastFlush >= BATCH_MS) {
			if (!(await flush(null))) return { status: state, stored, skipped: done.size };
			lastFlush = Date.now();
		}
	}
	if (batch.length) await flush(null);
	return { status: state, stored, skipped: done.size };
}

/** Samples of the fitted curve for the chart: evenly over the bounds and the data, knots included. */
function curveSamples(fit: CurveFit, bounds: [number, number], count = 240): { x: number[]; f: (number | null)[] } {
	const lo = Math.min(bounds[0], fit.domain[0]);
	const hi = Math.max(bounds[1], fit.domain[1]);
	const xs = new Set<number>();
	for (let i = 0; i < count; i++) xs.add(lo + ((hi - lo) * i) / (count - 1));
	if (fit.knots.length <= 400) for (const k of fit.knots) if (k >= lo && k <= hi) xs.add(k);
	const x = [...xs].sort((a, b) => a - b);
	const f = x.map((v) => {
		try {
			const y = fit.evaluate(v).f;
			return Number.isFinite(y) ? y : null;
		} catch {
			return null;
		}
	});
	return { x, f };
}

const safe = <T>(fn: () => T): T | { error: string } => {
	try {
		return fn();
	} catch (e) {
		return { error: e instanceof Error ? e.message : String(e) };
	}
};

async function runAudit(ctx: RunnerContext, job: Extract<StudyJob, { kind: 'audit' }>): Promise<JobResult> {
	const status = await markRunning(ctx.db, job.studyId);
	if (!isActive(status)) return { status: status ?? 'gone', stored: 0, skipped: 0 };
	const fitRow = await ctx.db('study_fits').where({ id: job.fitId, study_id: job.studyId }).first('audited_at', 'position');
	if (!fitRow) return { status: 'gone', stored: 0, skipped: 0 };
	if (fitRow.audited_at) return { status, stored: 0, skipped: 1 };
	const p = await prepare(ctx, job.studyId, job.fitId);
	const study = await ctx.db('studies').where({ id: job.studyId }).first('dataset_id', 'output');
	if (!p || !study) return { status: 'gone', stored: 0, skipped: 0 };
	const dataset = await getWithData(ctx.db, study.dataset_id);
	if (!dataset) throw new Error(`dataset ${study.dataset_id} of study ${job.studyId} is gone`);
	const xi = dataset.columns.findIndex((c) => c.role === 'input');
	const yi = dataset.columns.findIndex((c) => c.name === study.output);
	if (p.surface) return storeAudit(ctx, job, p, status!, surfaceAuditSummary(p.surface), { kind: 'none', x: null, f: null, samples: 0, fRange: 0, note: 'the dense reference search covers one-input problems' }, null);
	const fit = p.fit;
	const fitPosition = fitRow.position as number;

	// Smoothness and fidelity depend only on the data and the fit: reuse them from an earlier study of the same fit.
	const cached = await ctx.db('study_fits as f')
		.join('studies as s', 's.id', 'f.study_id')
		.where({ 's.dataset_id': study.dataset_id, 's.output': study.output, 'f.method': fit.method })
		.whereRaw('f.options = ?::jsonb', [JSON.stringify(p.spec.fits[fitPosition]?.options ?? {})])
		.whereNotNull('f.audited_at')
		.whereNot('f.id', job.fitId)
		.first('f.smoothness', 'f.fidelity');
	const smoothness =
		cached?.smoothness ??
		safe(() => {
			const a = auditSmoothness(fit, { worst: 5 });
			return {
				declared: a.declared,
				measured: a.measured,
				maxJumpF: a.maxJumpF,
				maxJumpD1: a.maxJumpD1,
				maxJumpD2: a.maxJumpD2,
				knotsChecked: a.knotsChecked,
				worst: a.worst.map((k) => ({ x: k.x, jumpF: k.jumpF, jumpD1: k.jumpD1, jumpD2: k.jumpD2 }))
			};
		});
	const fidelity =
		cached?.fidelity ??
		safe(() => {
			const a = auditFidelity(fit, dataset.data[xi], dataset.data[yi], { looMaxPoints: 100 });
			return {
				looRmse: a.looRmse,
				looMax: a.looMax,
				looMaxAt: a.looMaxAt,
				looMethod: a.looMethod,
				looPoints: a.looPoints,
				overshoot: a.overshoot,
				overshootRelative: a.overshootRelative,
				dataMonotone: a.dataMonotone,
				monotoneKept: a.monotoneKept,
				spuriousExtrema: a.spuriousExtrema,
				// data that are not monotone as a whole: is each rising or falling stretch kept?
				stretches: a.dataMonotone ? null : monotoneStretches(fit, dataset.data[xi], dataset.data[yi]).map((t) => ({ from: t.from, to: t.to, direction: t.direction, kept: t.kept, worstAt: t.worstAt })),
				notes: a.notes
			};
		});
	// about 20 samples per data interval (at least 4,001); bisection on f′ then makes the optimum exact
	const reference = safe(() => referenceOptimum(p.problem, p.spec.problem.bounds, Math.min(20_001, Math.max(4001, 20 * dataset.rowCount + 1))));
	const samples = curveSamples(fit, p.spec.problem.bounds[0]);

	return storeAudit(ctx, job, p, status!, { smoothness, fidelity }, reference, samples);
}

/** A surface fit's audit summary: the measured class per input and the kinked grid lines (grid fits); RBF leave-one-out. */
function surfaceAuditSummary(fit: SurfaceFit): { smoothness: unknown; fidelity: unknown } {
	const smoothness =
		fit instanceof TensorGrid
			? safe(() => {
					const a = auditSurfaceSmoothness(fit, 5);
					return { declared: fit.continuity, measured: a.overall, perInput: a.perInput, kinkLines: a.kinkLines, worstLines: a.worstLines };
				})
			: { declared: fit.continuity, measured: fit.continuity, perInput: fit.axisContinuity, kinkLines: [], worstLines: [] };
	const loo = fit.stats.looResiduals;
	if (fit instanceof TensorGrid) {
		// grid lines left out one at a time (a grid less one node is no longer a grid)
		const fidelity = safe(() => {
			const a = auditGridFitFidelity(fit);
			return { looRmse: a.count ? a.rms : null, looMax: a.count ? a.max : null, looPoints: a.count, looMethod: 'grid-lines', worstAt: a.worstAt, notes: fit.notes };
		});
		return { smoothness, fidelity };
	}
	const fidelity = loo ? { looRmse: fit.stats.looRms ?? null, looMax: Math.max(...Array.from(loo, Math.abs)), looMethod: 'rippa', condition: fit.stats.condition ?? null, notes: fit.notes } : { looRmse: null, looMax: null, notes: fit.notes };
	return { smoothness, fidelity };
}

async function storeAudit(
	ctx: RunnerContext,
	job: Extract<StudyJob, { kind: 'audit' }>,
	p: Prepared,
	status: string,
	audit: { smoothness: unknown; fidelity: unknown },
	reference: unknown,
	samples: unknown
): Promise<JobResult> {
	const { smoothness, fidelity } = audit;
	let state: string = status;
	let stored = 0;
	await ctx.db.transaction(async (trx) => {
		const locked = await trx('studies').where({ id: job.studyId }).whereIn('status', ACTIVE_STATUSES).forUpdate().first('id');
		if (!locked) {
			state = 'stopped';
			return;
		}
		const n = await trx('study_fits')
			.where({ id: job.fitId })
			.whereNull('audited_at')
			.update({
				smoothness: JSON.stringify(smoothness),
				fidelity: JSON.stringify(fidelity),
				reference: JSON.stringify(reference),
				samples: JSON.stringify(samples),
				audited_at: trx.fn.now()
			});
		stored = n;
		const { rows } = await trx.raw(`${ADVANCE_SQL} WHERE id = :study RETURNING status`, { runs: 0, audits: n, study: job.studyId });
		state = rows[0].status;
		await afterAdvance(ctx, trx, job.studyId, state, p.queue);
	});
	return { status: state, stored, skipped: 0 };
}

/** Run one job; `attempt` is 0 the first time (a retry first skips the runs already stored). */
export function runStudyJob(ctx: RunnerContext, job: StudyJob, attempt = 0): Promise<JobResult> {
	if (job.kind === 'audit') return runAudit(ctx, job);
	if (job.kind === 'runs') return runRuns(ctx, job, attempt);
	throw new Error(`unknown study job ${JSON.stringify(job)}`);
}
