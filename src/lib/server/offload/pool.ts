/**
 * The offload threads: every fit preview, every study launch's fit building and
 * every upload's parsing runs here, so heavy work never holds up the request
 * thread (health checks and other users keep their answers). A task past its
 * time budget has its thread terminated and replaced; a full queue answers
 * "busy, retry"; the threads' heap is capped.
 */
import os from 'node:os';
import path from 'node:path';
import { ThreadLost, ThreadPool } from '../studies/queue/threadPool';
import { StudyRejected } from '../studies/launch';
import { formatBudget, LAUNCH_BUILD_BUDGET_MS, MAX_WAITING } from './limits';
import type { BuildResult, BuildTask, FitTask } from './fitWork';
import type { SurfaceBuildTask } from './surfaceWork';
import type { ParseTask } from './tableWork';
import { PARSE_HEAP_MB } from '../datasets/limits';

/** KINKLESS_FIT_THREADS (default: one less than the cores, one or two). */
const threads = () => Math.max(1, Number(process.env.KINKLESS_FIT_THREADS ?? Math.min(2, Math.max(1, os.availableParallelism() - 1))) || 1);

let pool: ThreadPool | null = null;
let inFlight = 0;

/** The task did not finish within its budget (its thread was stopped). */
export class OffloadOverBudget extends Error {
	constructor(readonly budgetMs: number) {
		super(`did not finish within its ${formatBudget(budgetMs)} budget`);
	}
}
/** Every offload thread is busy and the waiting line is full. */
export class OffloadBusy extends Error {
	constructor() {
		super('every offload thread is busy; retry in a few seconds');
	}
}

function thePool(): ThreadPool {
	pool ??= new ThreadPool(path.join(process.cwd(), 'scripts', 'offload-thread.mjs'), threads(), undefined, undefined, {
		name: 'offload thread',
		resourceLimits: { maxOldGenerationSizeMb: PARSE_HEAP_MB }
	});
	return pool;
}

// A typed array may view a larger buffer; send only its own bytes.
const compact = (a: Float64Array) => (a.byteOffset === 0 && a.byteLength === a.buffer.byteLength ? a : a.slice());

function compactTask(task: FitTask | ParseTask): FitTask | ParseTask {
	if (task.kind === 'parse') return task;
	if (task.kind === 'preview') return { ...task, x: compact(task.x), y: compact(task.y) };
	if (task.kind === 'surface-preview') return { ...task, inputs: task.inputs.map(compact), y: compact(task.y) };
	if (task.kind === 'build-surface') return { ...task, inputs: task.inputs.map(compact), columns: Object.fromEntries(Object.entries(task.columns).map(([k, v]) => [k, compact(v)])) };
	return { ...task, x: compact(task.x), columns: Object.fromEntries(Object.entries(task.columns).map(([k, v]) => [k, compact(v)])) };
}

/** Run `task` on an offload thread within `budgetMs` of thread time. */
export async function runOffThread<R>(task: FitTask | ParseTask, budgetMs: number): Promise<R> {
	const p = thePool();
	if (inFlight >= p.size + MAX_WAITING) throw new OffloadBusy();
	inFlight++;
	try {
		return await p.run<R>(compactTask(task), budgetMs);
	} catch (e) {
		if (e instanceof ThreadLost && e.kind === 'timeout') throw new OffloadOverBudget(budgetMs);
		throw e;
	} finally {
		inFlight--;
	}
}

/**
 * A study launch's fit building on an offload thread, within LAUNCH_BUILD_BUDGET_MS.
 * Over budget, the launch is refused naming the limit (nothing is stored yet).
 */
export async function buildFitsOnThread(task: BuildTask | SurfaceBuildTask): Promise<BuildResult> {
	try {
		return await runOffThread<BuildResult>(task, LAUNCH_BUILD_BUDGET_MS);
	} catch (e) {
		if (e instanceof OffloadOverBudget) {
			const rows = (task.kind === 'build' ? task.x.length : (task.inputs[0]?.length ?? 0)).toLocaleString('en-US');
			throw new StudyRejected([{ field: 'fits', problem: `building ${task.fits.length} fit(s) of ${rows} rows ${e.message} (the limit for one launch); use fewer or cheaper fits, or thin the table` }]);
		}
		if (e instanceof OffloadBusy) throw new StudyRejected([{ field: 'fits', problem: e.message }]);
		throw e;
	}
}

/** Start the offload threads at server start, so the first heavy request does not pay for their start-up. */
export function startOffloadThreads(): Promise<void> {
	return thePool().ready();
}
