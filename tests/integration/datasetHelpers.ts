// Shared set-up for the dataset integration tests: a workspace with an owner,
// an editor-less viewer and an outsider, multipart uploads, and row counts.
import { expect } from 'vitest';
import { Client, json, newUser, newWorkspace, testDb } from './client';

export type ErrorBody = { error: { code: string; message: string; details?: { row?: number; column?: string; field?: string; problem: string }[] } };
export type Created = { id: string; name: string; shape: string; inputs: string[]; outputs: string[]; rowCount: number; warnings: string[] };

export async function team(tag = 'ds') {
	const owner = await newUser(`${tag}-owner`);
	const ws = await newWorkspace(owner.client, `Datasets ${tag}`);
	const viewer = await newUser(`${tag}-viewer`);
	await testDb()('memberships').insert({ workspace_id: ws.id, user_id: viewer.id, role: 'viewer' });
	const outsider = await newUser(`${tag}-outsider`);
	return { owner: owner.client, ownerId: owner.id, viewer: viewer.client, outsider: outsider.client, ws };
}

/** A multipart upload of `content` as a file called `filename`, plus extra form fields. */
export function uploadForm(content: string | Uint8Array, filename: string, fields: Record<string, string> = {}): FormData {
	const form = new FormData();
	form.set('file', new Blob([content as BlobPart]), filename);
	for (const [k, v] of Object.entries(fields)) form.set(k, v);
	return form;
}

/** Multipart upload through a client; cookie clients send our own Origin, as a browser would. */
export function upload(c: Client, slug: string, content: string | Uint8Array, filename: string, fields: Record<string, string> = {}, query = '') {
	const origin: Record<string, string> = c.bearer ? {} : { origin: new URL(process.env.KINKLESS_TEST_URL!).origin };
	return c.post(`/api/v1/workspaces/${slug}/datasets${query}`, uploadForm(content, filename, fields), origin);
}

export async function countDatasets(workspaceId: string): Promise<number> {
	const [{ n }] = await testDb()('datasets').where({ workspace_id: workspaceId }).count<{ n: string }[]>('* as n');
	return Number(n);
}

/**
 * Runs `attempt`, expects `status` with the error shape, and checks that no
 * dataset was stored. Returns the error body for further checks.
 */
export async function refused(workspaceId: string, status: number, attempt: () => Promise<Response>): Promise<ErrorBody> {
	const before = await countDatasets(workspaceId);
	const res = await attempt();
	const body = await json<ErrorBody>(res);
	expect(res.status, JSON.stringify(body)).toBe(status);
	expect(typeof body.error?.code).toBe('string');
	expect(typeof body.error?.message).toBe('string');
	expect(await countDatasets(workspaceId)).toBe(before);
	return body;
}

export const csv = (...lines: string[]) => lines.join('\n') + '\n';
