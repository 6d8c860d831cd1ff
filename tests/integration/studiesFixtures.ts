// Shared set-up for the study integration tests: a team with every role, an
// invented coarse curve dataset created through the datasets API, and helpers
// that wait on a study through the studies API.
import type { RunRow } from '../../src/lib/domain/wire';
import { expect } from 'vitest';
import { Client, json, newUser, newWorkspace, testDb } from './client';

export type ErrorBody = { error: { code: string; message: string; details?: { field?: string; problem: string }[] } };
export type StudyBody = {
	id: string;
	name: string;
	status: string;
	progress: { done: number; total: number };
	scorecard: {
		rank: number;
		fitId: string;
		method: string;
		optimizer: string;
		runs: number;
		successRate: number;
		medianIterations: number | null;
		medianEvaluations: number | null;
		best: { x: number[]; f: number } | null;
		reachesReference: boolean | null;
		atKink: number;
		outcomes: Record<string, number>;
	}[];
	pick: null | { fitId: string; rationale: string; by: string | null; at: string };
	fits: { id: string; method: string; continuity: { declared: string; measured: string | null }; fidelity: { looRmse?: number } | null; reference: { x: number[] | null; f: number | null } | null }[];
	error: string | null;
};
/** A run as the API sends it (the shape lives in domain/wire.ts). */
export type RunBody = RunRow;

/**
 * INVENTED table (not measured): a coarse propeller sweep, efficiency and
 * thrust coefficient against advance ratio, 8 points — coarse enough that the
 * linear fit's corner at the peak traps a gradient-based optimizer.
 */
export const PROP = {
	name: 'Coarse prop sweep (invented)',
	columns: [
		{ name: 'J', unit: '-', role: 'input' },
		{ name: 'eta', unit: '-', role: 'output' },
		{ name: 'CT', unit: '-', role: 'output' }
	],
	rows: [
		[0.1, 0.3, 0.095],
		[0.3, 0.58, 0.085],
		[0.5, 0.74, 0.072],
		[0.7, 0.83, 0.058],
		[0.9, 0.86, 0.043],
		[1.1, 0.8, 0.027],
		[1.3, 0.62, 0.012],
		[1.5, 0.3, -0.004]
	]
};

export async function team(tag = 'st') {
	const owner = await newUser(`${tag}-owner`);
	const ws = await newWorkspace(owner.client, `Studies ${tag}`);
	const editor = await newUser(`${tag}-editor`);
	const viewer = await newUser(`${tag}-viewer`);
	await testDb()('memberships').insert([
		{ workspace_id: ws.id, user_id: editor.id, role: 'editor' },
		{ workspace_id: ws.id, user_id: viewer.id, role: 'viewer' }
	]);
	const outsider = await newUser(`${tag}-outsider`);
	return { owner, editor, viewer, outsider, ws };
}

export async function dataset(c: Client, slug: string, body: { name: string; columns: unknown[]; rows: number[][] } = PROP): Promise<string> {
	const r = await c.post(`/api/v1/workspaces/${slug}/datasets`, body);
	const j = await json<{ id: string }>(r);
	expect(r.status, JSON.stringify(j)).toBe(201);
	return j.id;
}

export async function launch(c: Client, slug: string, body: unknown): Promise<string> {
	const r = await c.post(`/api/v1/workspaces/${slug}/studies`, body);
	const j = await json<{ id: string; status: string } & ErrorBody>(r);
	expect(r.status, JSON.stringify(j)).toBe(202);
	expect(j.status).toBe('queued');
	return j.id;
}

/** Poll the study until it leaves queued/running (or `until` holds). */
export async function waitFor(c: Client, id: string, until: (s: StudyBody) => boolean = (s) => !['queued', 'running'].includes(s.status), timeoutMs = 90_000): Promise<StudyBody> {
	const t0 = Date.now();
	for (;;) {
		const r = await c.get(`/api/v1/studies/${id}`);
		const s = await json<StudyBody>(r);
		expect(r.status, JSON.stringify(s)).toBe(200);
		if (until(s)) return s;
		if (Date.now() - t0 > timeoutMs) throw new Error(`study ${id} still ${s.status} (${s.progress.done}/${s.progress.total}) after ${timeoutMs} ms`);
		await new Promise((res) => setTimeout(res, 150));
	}
}

/** What a refused launch must not leave behind: studies, their fits, and queued jobs for studies that do not exist. */
export async function stored(workspaceId: string) {
	const db = testDb();
	const [studies] = await db('studies').where({ workspace_id: workspaceId }).count<{ n: number }[]>('* as n');
	const [fits] = await db('study_fits as f').join('studies as s', 's.id', 'f.study_id').where('s.workspace_id', workspaceId).count<{ n: number }[]>('* as n');
	const hasBoss = (await db.raw(`SELECT 1 FROM information_schema.tables WHERE table_schema = 'pgboss' AND table_name = 'job'`)).rows.length > 0;
	const orphanJobs = hasBoss
		? Number((await db.raw(`SELECT count(*) AS n FROM pgboss.job j WHERE j.data \\? 'studyId' AND NOT EXISTS (SELECT 1 FROM studies s WHERE s.id::text = j.data->>'studyId')`)).rows[0].n)
		: 0;
	return { studies: Number(studies.n), fits: Number(fits.n), orphanJobs };
}
