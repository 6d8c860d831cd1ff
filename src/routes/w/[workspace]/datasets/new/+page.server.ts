import { fail, redirect } from '@sveltejs/kit';
import { workspaceAccess } from '$lib/server/workspaces/access';
import { db } from '$lib/server/db';
import * as drafts from '$lib/server/datasets/drafts';
import * as datasetStore from '$lib/server/datasets/store';
import { DatasetError, MAX_COLUMNS, MAX_FILE_BYTES, MAX_ROWS } from '$lib/server/datasets';
import * as upload from '$lib/server/datasets/upload';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ locals, params, url }) => {
	if (!locals.user) redirect(303, `/login?next=${encodeURIComponent(url.pathname)}`);
	const { workspace, role } = await workspaceAccess(locals, params.workspace, 'editor');
	return {
		workspace: { slug: workspace.slug, name: workspace.name },
		role,
		limits: { bytes: MAX_FILE_BYTES, rows: MAX_ROWS, columns: MAX_COLUMNS }
	};
}) satisfies PageServerLoad;

const field = (form: FormData, key: string): string | undefined => {
	const v = form.get(key);
	return typeof v === 'string' && v.trim() !== '' ? v.trim() : undefined;
};

/**
 * "check" parses and validates, keeps the upload as a draft, and returns the
 * report; "save" does the same and, when the table passes, stores it and opens
 * the dataset. A new file replaces the draft; without one the draft is used,
 * so the file travels once and changing roles or the sheet needs no re-upload.
 */
async function checkOrSave(mode: 'check' | 'save', { request, locals, params }: Parameters<Actions[string]>[0]) {
	const { workspace, user } = await workspaceAccess(locals, params.workspace, 'editor');
	try {
		const form = await upload.readMultipart(request);
		const fields = upload.uploadFields(form);
		let source = await upload.uploadSource(form, fields.sheet);
		let draftId = source ? undefined : field(form, 'draft');
		if (!source && draftId) {
			const draft = await drafts.get(db(), draftId, workspace.id, user.id);
			if (!draft) return fail(422, { message: 'the checked upload has expired (drafts are kept for a day); choose the file again' });
			source =
				draft.kind === 'file'
					? { kind: 'file', bytes: draft.bytes, filename: draft.filename ?? 'upload', sheet: fields.sheet }
					: { kind: 'paste', text: new TextDecoder().decode(draft.bytes) };
		}
		if (!source) return fail(422, { message: 'choose a file (CSV, TSV or XLSX), drop one on the page, or paste cells' });

		const parsed = await upload.parseSource(source);
		const bytes = upload.sourceBytes(source);
		const filename = source.kind === 'file' ? source.filename : null;
		draftId ??= await drafts.create(db(), { workspaceId: workspace.id, userId: user.id, kind: source.kind, filename, bytes });
		const report = upload.check(parsed, upload.rolesFor(parsed, fields.roles), { shape: fields.shape });
		const name = fields.name ?? upload.defaultName(source);

		if (mode === 'save' && report.ok) {
			const meta = await upload.save(db(), {
				workspaceId: workspace.id,
				userId: user.id,
				name,
				description: fields.description,
				parsed,
				report,
				filename,
				bytes,
				draftId
			});
			redirect(303, `/w/${workspace.slug}/datasets/${meta.id}`);
		}
		const version = (await datasetStore.latestVersion(db(), workspace.id, name)) + 1;
		const result = { draftId, description: fields.description ?? '', report: upload.uploadReport(parsed, report, name, version, filename) };
		if (mode === 'save') return fail(422, { ...result, message: 'the table has problems; fix them (or the column roles) and check again before saving' });
		return result;
	} catch (e) {
		if (e instanceof DatasetError) return fail(e.status, { message: e.message, details: e.details });
		throw e;
	}
}

export const actions = {
	check: (event) => checkOrSave('check', event),
	save: (event) => checkOrSave('save', event)
} satisfies Actions;
