/**
 * Studies in PostgreSQL: the verbs routes, pages and scripts use. Each takes
 * a `db` handle so the caller owns the transaction; snake_case columns are
 * mapped to camelCase here.
 */
import type { Knex } from 'knex';
import { newSecret, sha256 } from '../tokens';
import { queueName } from './queue/boss';
import { unpackPath, type StoredPath } from '../../domain/pathPack';
import { unpackStarts } from './queue/runner';
import type { StudySpec } from '../../domain/studySpec';
import type { RunColumns, RunRow, StudyFit, StudyPick } from '../../domain/wire';
export type { RunColumns, RunRow, StudyFit } from '../../domain/wire';

type Db = Knex | Knex.Transaction;
import { ACTIVE_STATUSES, type StudyStatus } from '../../domain/lifecycle';
export { isActive, type StudyStatus } from '../../domain/lifecycle';
export { isUuid } from '../../text';
import { isUuid } from '../../text';

export interface Study {
	id: string;
	workspaceId: string;
	name: string;
	datasetId: string;
	output: string;
	spec: StudySpec;
	nInputs: number;
	startCount: number;
	status: StudyStatus;
	progress: { done: number; total: number };
	audits: { done: number; total: number };
	queue: string;
	error: string | null;
	createdBy: { id: string; name: string } | null;
	createdAt: Date;
	startedAt: Date | null;
	finishedAt: Date | null;
	pick: StudyPick | null;
}

const STUDY_COLUMNS = [
	's.id', 's.workspace_id', 's.name', 's.dataset_id', 's.output', 's.spec', 's.n_inputs', 's.start_count', 's.status', 's.runs_total', 's.runs_done',
	's.audits_total', 's.audits_done', 's.queue', 's.error', 's.created_by', 's.created_at', 's.started_at', 's.finished_at', 's.pick_fit_id',
	's.pick_rationale', 's.picked_at', 'cu.name as created_by_name', 'pu.name as picked_by_name'
];

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toStudy(r: any): Study {
	return {
		id: r.id,
		workspaceId: r.workspace_id,
		name: r.name,
		datasetId: r.dataset_id,
		output: r.output,
		spec: r.spec,
		nInputs: r.n_inputs,
		startCount: r.start_count,
		status: r.status,
		progress: { done: r.runs_done, total: r.runs_total },
		audits: { done: r.audits_done, total: r.audits_total },
		queue: r.queue,
		error: r.error,
		createdBy: r.created_by ? { id: r.created_by, name: r.created_by_name ?? '' } : null,
		createdAt: r.created_at,
		startedAt: r.started_at,
		finishedAt: r.finished_at,
		pick: r.pick_fit_id ? { fitId: r.pick_fit_id, rationale: r.pick_rationale, by: r.picked_by_name ?? null, at: r.picked_at } : null
	};
}

export async function get(db: Db, id: string): Promise<Study | null> {
	if (!isUuid(id)) return null;
	const row = await db('studies as s')
		.leftJoin('users as cu', 'cu.id', 's.created_by')
		.leftJoin('users as pu', 'pu.id', 's.picked_by')
		.where('s.id', id)
		.first(STUDY_COLUMNS);
	return row ? toStudy(row) : null;
}

type StudyListItem = { id: string; name: string; status: StudyStatus; createdAt: Date; progress: { done: number; total: number }; dataset: string; output: string; createdBy: string | null };

export async function listForWorkspace(db: Db, workspaceId: string, limit = 200): Promise<StudyListItem[]> {
	const rows = await db('studies as s')
		.leftJoin('users as u', 'u.id', 's.created_by')
		.where('s.workspace_id', workspaceId)
		.orderBy('s.created_at', 'desc')
		.limit(limit)
		.select('s.id', 's.name', 's.status', 's.created_at', 's.runs_done', 's.runs_total', 's.output', db.raw(`s.spec->'dataset'->>'name' as dataset`), 'u.name as created_by');
	return rows.map((r) => ({
		id: r.id,
		name: r.name,
		status: r.status,
		createdAt: r.created_at,
		progress: { done: r.runs_done, total: r.runs_total },
		dataset: r.dataset,
		output: r.output,
		createdBy: r.created_by
	}));
}

export type Progress = { id: string; status: StudyStatus; done: number; total: number; audits: { done: number; total: number }; error: string | null };

export async function progressOf(db: Db, ids: string[]): Promise<Progress[]> {
	const rows = await db('studies').whereIn('id', ids.filter(isUuid)).select('id', 'status', 'runs_done', 'runs_total', 'audits_done', 'audits_total', 'error');
	return rows.map((r) => ({ id: r.id, status: r.status, done: r.runs_done, total: r.runs_total, audits: { done: r.audits_done, total: r.audits_total }, error: r.error }));
}


export async function fits(db: Db, studyId: string, withSamples = false): Promise<StudyFit[]> {
	const cols = ['id', 'position', 'method', 'options', 'continuity', 'smoothness', 'fidelity', 'reference', ...(withSamples ? ['samples'] : [])];
	return (await db('study_fits').where({ study_id: studyId }).orderBy('position').select(cols)) as StudyFit[];
}


const finite = (v: number | null) => (v !== null && Number.isFinite(v) ? v : null);

export async function runs(db: Db, study: Pick<Study, 'id' | 'spec' | 'nInputs' | 'startCount'>, filter: { fitId?: string; optimizer?: number; limit?: number; offset?: number } = {}): Promise<RunRow[]> {
	const q = db('study_runs as r')
		.join('study_fits as sf', 'sf.id', 'r.fit_id')
		.where('r.study_id', study.id)
		.orderBy([{ column: 'sf.position' }, { column: 'r.optimizer' }, { column: 'r.start_index' }])
		.select('r.public_id as id', 'r.fit_id', 'sf.method', 'r.optimizer', 'r.start_index', 'r.outcome', 'r.at_kink', 'r.outside_data', 'r.reason', 'r.iterations', 'r.evals_f', 'r.evals_grad', 'r.x', 'r.f', 'r.grad_norm', 'r.ms');
	if (filter.fitId) q.where('r.fit_id', filter.fitId);
	if (filter.optimizer !== undefined) q.where('r.optimizer', filter.optimizer);
	if (filter.limit !== undefined) q.limit(filter.limit);
	if (filter.offset) q.offset(filter.offset);
	const [rows, startsRow] = await Promise.all([q, db('studies').where({ id: study.id }).first('starts')]);
	const starts = unpackStarts(startsRow.starts, study.startCount, study.nInputs);
	return rows.map((r) => ({
		id: r.id as string,
		fitId: r.fit_id,
		method: r.method,
		optimizer: study.spec.optimizers[r.optimizer]?.method ?? String(r.optimizer),
		optimizerIndex: r.optimizer,
		startIndex: r.start_index,
		start: starts[r.start_index],
		outcome: r.outcome,
		atKink: r.at_kink,
		outsideData: r.outside_data,
		reason: r.reason,
		iterations: r.iterations,
		evaluations: { f: r.evals_f, grad: r.evals_grad },
		x: (r.x as number[]).map((v) => finite(v) as number),
		f: finite(r.f),
		gradNorm: finite(r.grad_norm),
		ms: Math.round(r.ms * 1000) / 1000
	}));
}


export async function runColumns(db: Db, study: Pick<Study, 'id' | 'spec' | 'nInputs' | 'startCount'>, fitIds: string[]): Promise<RunColumns> {
	const [rows, startsRow] = await Promise.all([
		db('study_runs as r')
			.join('study_fits as sf', 'sf.id', 'r.fit_id')
			.where('r.study_id', study.id)
			.orderBy([{ column: 'sf.position' }, { column: 'r.optimizer' }, { column: 'r.start_index' }])
			.select('r.public_id as id', 'sf.position', 'r.optimizer', 'r.start_index', 'r.outcome', 'r.at_kink', 'r.outside_data', 'r.reason', 'r.iterations', 'r.evals_f', 'r.evals_grad', 'r.x', 'r.f', 'r.grad_norm', 'r.ms'),
		db('studies').where({ id: study.id }).first('starts')
	]);
	const a = new Float64Array(study.startCount * study.nInputs);
	new Uint8Array(a.buffer).set(startsRow.starts);
	const out: RunColumns = {
		n: study.nInputs,
		fitIds,
		optimizers: study.spec.optimizers.map((o) => o.method),
		starts: Array.from(a),
		id: [],
		fit: [],
		optimizer: [],
		start: [],
		outcome: [],
		atKink: [],
		outsideData: [],
		reason: [],
		iterations: [],
		evalsF: [],
		evalsGrad: [],
		x: [],
		f: [],
		gradNorm: [],
		ms: []
	};
	for (const r of rows) {
		out.id.push(r.id as string);
		out.fit.push(r.position);
		out.optimizer.push(r.optimizer);
		out.start.push(r.start_index);
		out.outcome.push(r.outcome);
		out.atKink.push(r.at_kink);
		out.outsideData.push(r.outside_data);
		out.reason.push(r.reason);
		out.iterations.push(r.iterations);
		out.evalsF.push(r.evals_f);
		out.evalsGrad.push(r.evals_grad);
		for (const v of r.x as number[]) out.x.push(finite(v));
		out.f.push(finite(r.f));
		out.gradNorm.push(finite(r.grad_norm));
		out.ms.push(Math.round(r.ms * 1000) / 1000);
	}
	return out;
}

/** A run's path with the study it belongs to (for the access check). */
export async function runPath(db: Db, runId: string): Promise<{ studyId: string; path: StoredPath } | null> {
	if (!isUuid(runId)) return null;
	const row = await db('study_runs as r').join('studies as s', 's.id', 'r.study_id').where('r.public_id', runId).first('r.study_id', 'r.path', 'r.path_length', 's.n_inputs');
	if (!row) return null;
	return { studyId: row.study_id, path: unpackPath(row.path, row.n_inputs, row.path_length) };
}

/**
 * Cancel a queued or running study. Runs already stored stay. Its jobs still waiting in
 * the queue are cancelled in the same transaction, so they never hold a worker thread
 * (before, every one of a large study's jobs was still fetched and skipped, one by one,
 * ahead of other studies' work); a job in flight notices between two starts (runner.ts).
 */
export async function cancel(db: Db, id: string, userId: string | null): Promise<boolean> {
	return db.transaction(async (trx) => {
		const n = await trx('studies').where({ id }).whereIn('status', ACTIVE_STATUSES).update({ status: 'cancelled', finished_at: trx.fn.now(), cancelled_by: userId });
		if (n > 0 && (await trx.raw(`SELECT to_regclass('pgboss.job') AS t`)).rows[0].t) {
			await trx.raw(`UPDATE pgboss.job SET state = 'cancelled', completed_on = now() WHERE name = ? AND state < 'active' AND data->>'studyId' = ?`, [queueName(), id]);
		}
		return n > 0;
	});
}

export async function pick(db: Db, studyId: string, fitId: string, rationale: string, userId: string): Promise<boolean> {
	const fit = await db('study_fits').where({ id: fitId, study_id: studyId }).first('id');
	if (!fit) return false;
	await db('studies').where({ id: studyId }).update({ pick_fit_id: fitId, pick_rationale: rationale, picked_by: userId, picked_at: db.fn.now() });
	return true;
}

// ---------------------------------------------------------------- share links

export interface Share {
	id: string;
	createdAt: Date;
	expiresAt: Date | null;
	createdBy: string | null;
	/** link holders see member names (who launched, who picked) */
	showNames: boolean;
}

/** The study's live link, if any (the token itself is never stored). */
export async function activeShare(db: Db, studyId: string): Promise<Share | null> {
	const row = await db('study_shares as sh')
		.leftJoin('users as u', 'u.id', 'sh.created_by')
		.where('sh.study_id', studyId)
		.whereNull('sh.revoked_at')
		.where((q) => q.whereNull('sh.expires_at').orWhere('sh.expires_at', '>', db.fn.now()))
		.orderBy('sh.created_at', 'desc')
		.first('sh.id', 'sh.created_at', 'sh.expires_at', 'sh.show_names', 'u.name');
	return row ? { id: row.id, createdAt: row.created_at, expiresAt: row.expires_at, createdBy: row.name ?? null, showNames: row.show_names === true } : null;
}

/** A new read-only link (256-bit token, stored hashed); any earlier link of the study is revoked. */
export async function createShare(
	db: Knex,
	studyId: string,
	userId: string,
	expiresInDays?: number,
	showNames = false
): Promise<{ token: string; expiresAt: Date | null; showNames: boolean }> {
	const token = newSecret(32);
	const expiresAt = expiresInDays ? new Date(Date.now() + expiresInDays * 86_400_000) : null;
	await db.transaction(async (trx) => {
		await trx('study_shares').where({ study_id: studyId }).whereNull('revoked_at').update({ revoked_at: trx.fn.now() });
		await trx('study_shares').insert({ study_id: studyId, token_hash: sha256(token), created_by: userId, expires_at: expiresAt, show_names: showNames });
	});
	return { token, expiresAt, showNames };
}

/** Show or hide member names on the study's live link; false when the study has no live link. */
export async function setShareNames(db: Db, studyId: string, showNames: boolean): Promise<boolean> {
	const n = await db('study_shares')
		.where({ study_id: studyId })
		.whereNull('revoked_at')
		.where((q) => q.whereNull('expires_at').orWhere('expires_at', '>', db.fn.now()))
		.update({ show_names: showNames });
	return n > 0;
}

export async function revokeShares(db: Db, studyId: string): Promise<number> {
	return db('study_shares').where({ study_id: studyId }).whereNull('revoked_at').update({ revoked_at: db.fn.now() });
}

/** The study a share token opens and whether it shows member names, checked on every request (so revoking takes effect at once). */
export async function shareForToken(db: Db, token: string): Promise<{ studyId: string; showNames: boolean } | null> {
	if (!/^[A-Za-z0-9_-]{20,200}$/.test(token)) return null;
	const row = await db('study_shares')
		.where({ token_hash: sha256(token) })
		.whereNull('revoked_at')
		.where((q) => q.whereNull('expires_at').orWhere('expires_at', '>', db.fn.now()))
		.first('study_id', 'show_names');
	return row ? { studyId: row.study_id, showNames: row.show_names === true } : null;
}
