import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api, fail4xx } from '$lib/server/api';
import { workspaceAccess } from '$lib/server/workspaces/access';
import { db } from '$lib/server/db';
import * as datasetStore from '$lib/server/datasets/store';
import { DatasetError, parseDatasetJson, reportErrorBody, type ParsedTable } from '$lib/server/datasets';
import * as upload from '$lib/server/datasets/upload';

export const GET = api<RequestHandler>(async ({ locals, params, url }) => {
	const { workspace } = await workspaceAccess(locals, params.ws, 'viewer');
	const archived = url.searchParams.get('archived') === '1';
	const list = await datasetStore.listForWorkspace(db(), workspace.id, archived);
	return json({
		datasets: list.map((d) => ({
			id: d.id,
			name: d.name,
			version: d.version,
			shape: d.shape,
			rowCount: d.rowCount,
			createdAt: d.createdAt,
			...(archived ? { archivedAt: d.archivedAt } : {})
		}))
	});
});

/**
 * Create a dataset from a JSON body or a multipart upload (`file`, `name`,
 * `roles`, `sheet`); either may say `shape: "scatter"` to take a grid-like
 * table (one with missing cells) as scattered points. `?dryRun=1` answers 200 with the validation report and
 * stores nothing.
 */
export const POST = api<RequestHandler>(async ({ locals, params, request, url }) => {
	// Access first: a viewer or an outsider is refused before the body is read.
	const { workspace, user } = await workspaceAccess(locals, params.ws, 'editor');
	const dryRun = ['1', 'true'].includes(url.searchParams.get('dryRun') ?? '');
	const type = (request.headers.get('content-type') ?? '').toLowerCase();
	// Server-Timing tells a script where an upload's time went (read, parse, validate, store).
	const timing: string[] = [];
	let mark = performance.now();
	const lap = (name: string) => {
		const now = performance.now();
		timing.push(`${name};dur=${(now - mark).toFixed(1)}`);
		mark = now;
	};
	try {
		let name: string;
		let description: string | undefined;
		let parsed: ParsedTable;
		let roles: Record<string, 'input' | 'output'> | undefined;
		let shape: 'scatter' | undefined;
		let bytes: Uint8Array;
		let filename: string | null = null;
		if (type.startsWith('multipart/form-data')) {
			const form = await upload.readMultipart(request);
			const fields = upload.uploadFields(form);
			const source = await upload.uploadSource(form, fields.sheet);
			if (!source || source.kind !== 'file') {
				throw new DatasetError('invalid-body', 'the form has no file; send the table in a field called "file"', [{ field: 'file', problem: 'missing' }]);
			}
			lap('read');
			parsed = await upload.parseSource(source);
			name = fields.name ?? upload.defaultName(source);
			description = fields.description;
			roles = fields.roles;
			shape = fields.shape;
			bytes = source.bytes;
			filename = source.filename;
		} else if (type.startsWith('application/json')) {
			bytes = await upload.readBody(request);
			lap('read');
			let body: unknown;
			try {
				body = JSON.parse(new TextDecoder().decode(bytes));
			} catch {
				fail4xx(400, 'the request body is not valid JSON', 'bad-json');
			}
			({ name, table: parsed } = parseDatasetJson(body));
			const d = (body as { description?: unknown }).description;
			if (d !== undefined && (typeof d !== 'string' || d.length > 2000)) {
				fail4xx(422, 'description must be text of at most 2000 characters', 'invalid', [{ field: 'description', problem: 'must be text of at most 2000 characters' }]);
			}
			description = d;
			const chosen = upload.SHAPE_CHOICE.safeParse((body as { shape?: unknown }).shape);
			if (!chosen.success) fail4xx(422, `shape: ${chosen.error.issues[0].message}`, 'invalid', [{ field: 'shape', problem: chosen.error.issues[0].message }]);
			shape = chosen.data;
		} else {
			fail4xx(400, 'send the table as multipart/form-data (field "file") or as application/json { name, columns, rows }', 'unsupported-content-type');
		}

		lap('parse');
		const report = upload.check(parsed, roles, { shape });
		lap('validate');
		if (dryRun) {
			const version = (await datasetStore.latestVersion(db(), workspace.id, name)) + 1;
			const { head: _head, ...summary } = upload.uploadReport(parsed, report, name, version, filename);
			return json({ dryRun: true, ...summary }, { headers: { 'server-timing': timing.join(', ') } });
		}
		if (!report.ok) return json(reportErrorBody(report), { status: 422 });
		const meta = await upload.save(db(), { workspaceId: workspace.id, userId: user.id, name, description, parsed, report, filename, bytes });
		lap('store');
		return json(
			{
				id: meta.id,
				name: meta.name,
				shape: meta.shape,
				inputs: meta.columns.filter((c) => c.role === 'input').map((c) => c.name),
				outputs: meta.columns.filter((c) => c.role === 'output').map((c) => c.name),
				rowCount: meta.rowCount,
				// what the uploader should know: warnings first, then how the file was read
				warnings: [...meta.warnings, ...meta.notes]
			},
			{ status: 201, headers: { location: `/api/v1/datasets/${meta.id}`, 'server-timing': timing.join(', ') } }
		);
	} catch (e) {
		if (e instanceof DatasetError) return json(e.body(), { status: e.status });
		throw e;
	}
});
