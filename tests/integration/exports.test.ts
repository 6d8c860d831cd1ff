// Exports through the API against the real server and database: a study's
// fits (viewer, share link), the dataset fit preview (query and POST body),
// content types and file names, the generated Python run by python3 against
// the fit's value through the API, and every kind of bad input answered 4xx
// in the one error shape.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CAUTION } from '../../src/lib/caution';
import { loadFitExport } from '../../src/lib/numerics/export';
import { Client, json, testDb } from './client';
import { dataset, launch, team, waitFor, type ErrorBody, type StudyBody } from './studiesFixtures';

const dir = mkdtempSync(join(tmpdir(), 'kinkless-exports-'));
afterAll(async () => {
	rmSync(dir, { recursive: true, force: true });
	await testDb().destroy();
});

let t: Awaited<ReturnType<typeof team>>;
let datasetId: string;
let studyId: string;
let study: StudyBody;

beforeAll(async () => {
	t = await team('export');
	datasetId = await dataset(t.editor.client, t.ws.slug);
	studyId = await launch(t.editor.client, t.ws.slug, {
		name: 'Export me',
		datasetId,
		output: 'eta',
		problem: { kind: 'maximize' },
		fits: [{ method: 'pchip' }, { method: 'cubic-natural', options: { extrapolation: 'linear' } }],
		optimizers: [{ method: 'bfgs' }],
		starts: { latinHypercube: 4, seed: 1 }
	});
	study = await waitFor(t.editor.client, studyId);
});

async function expectError(res: Response, status: number, field?: string): Promise<ErrorBody> {
	const body = await json<ErrorBody>(res);
	expect(res.status, JSON.stringify(body)).toBe(status);
	expect(res.headers.get('content-type')).toContain('application/json');
	expect(typeof body.error.code).toBe('string');
	expect(body.error.message.length).toBeGreaterThan(5);
	if (field) expect(body.error.details?.some((d) => d.field === field), JSON.stringify(body)).toBe(true);
	return body;
}

function runPython(path: string, x: number): [number, number, number] {
	const r = spawnSync('/usr/bin/python3', ['-c', `import importlib.util, json\nspec = importlib.util.spec_from_file_location("m", ${JSON.stringify(path)})\nm = importlib.util.module_from_spec(spec); spec.loader.exec_module(m)\nf, g, h = m.evaluate(${x})\nprint(json.dumps([f, float(g[0]), float(h[0, 0])]))`], { encoding: 'utf8' });
	if (r.status !== 0) throw new Error(r.stderr);
	return JSON.parse(r.stdout);
}

describe('study fit export', () => {
	it('a viewer downloads every format, with the right type and a safe file name', async () => {
		expect(study.status, study.error ?? '').toBe('done');
		const fit = study.fits.find((f) => f.method === 'pchip')!;
		const base = `/api/v1/studies/${studyId}/fits/${fit.id}/export`;
		const expected = { json: ['application/json', '.json'], python: ['text/x-python', '.py'], typescript: ['text/plain', '.ts'], csv: ['text/csv', '.csv'] };
		for (const [format, [type, ext]] of Object.entries(expected)) {
			const r = await t.viewer.client.get(`${base}?format=${format}`);
			expect(r.status, format).toBe(200);
			expect(r.headers.get('content-type')).toContain(type);
			const cd = r.headers.get('content-disposition') ?? '';
			expect(cd).toMatch(new RegExp(`^attachment; filename="[A-Za-z0-9._-]+\\${ext}"$`));
			expect(cd).toContain('pchip');
			const text = await r.text();
			if (format !== 'json') expect(text.replace(/\s+/g, ' ')).toContain(CAUTION.slice(0, 60));
			if (format === 'json') {
				const { doc, fit: back } = await loadFitExport(text);
				expect(doc.caution).toBe(CAUTION);
				expect(doc.source.dataset.name).toBe('Coarse prop sweep (invented)');
				expect(doc.source.dataset.sha256).toMatch(/^[0-9a-f]{64}$/);
				expect(doc.source.inputs).toEqual([{ name: 'J', unit: '-' }]);
				expect(back.method).toBe('pchip');
			}
			if (format === 'csv') {
				const lines = text.split('\r\n');
				expect(lines[0]).toBe('J [-],eta [-],deta/dJ [-/-],d2eta/dJ2 [-/-^2]');
				expect(lines.length).toBeGreaterThan(1000);
				expect(lines[1].split(',').map(Number)[0]).toBe(0.1);
			}
			if (format === 'python') {
				// The generated module, run by python3, gives the fit's value through the JSON export.
				const path = join(dir, 'pchip_export.py');
				writeFileSync(path, text);
				const j = await (await t.viewer.client.get(`${base}?format=json`)).text();
				const { fit: engine } = await loadFitExport(j);
				for (const x of [0.1, 0.42, 0.9, 1.5]) {
					const e = engine.evaluate(x);
					expect(runPython(path, x)).toEqual([e.f, e.df, e.d2f]);
				}
			}
		}
	});

	it('through a share link, read-only and without sign-in', async () => {
		const share = await json<{ token: string }>(await t.owner.client.post(`/api/v1/studies/${studyId}/share`));
		const fit = study.fits[1];
		const anon = new Client();
		const r = await anon.get(`/api/v1/shared/${share.token}/fits/${fit.id}/export?format=typescript`);
		expect(r.status).toBe(200);
		expect(await r.text()).toContain('export function evaluate(x: number[])');
		await expectError(await anon.get(`/api/v1/shared/not-a-token/fits/${fit.id}/export?format=json`), 404);
		await expectError(await anon.get(`/api/v1/studies/${studyId}/fits/${fit.id}/export?format=json`), 401);
		await expectError(await t.outsider.client.get(`/api/v1/studies/${studyId}/fits/${fit.id}/export?format=json`), 404);
	});

	it('refuses an unknown format, a fit of another study, a missing fit and a failed study', async () => {
		const fit = study.fits[0];
		await expectError(await t.viewer.client.get(`/api/v1/studies/${studyId}/fits/${fit.id}/export?format=docx`), 400, 'format');
		await expectError(await t.viewer.client.get(`/api/v1/studies/${studyId}/fits/not-a-uuid/export?format=json`), 404, 'fitId');
		await expectError(await t.viewer.client.get(`/api/v1/studies/${studyId}/fits/00000000-0000-4000-8000-000000000000/export`), 404, 'fitId');
		// A second study; its fit is not in the first.
		const other = await launch(t.editor.client, t.ws.slug, {
			name: 'Other',
			datasetId,
			output: 'eta',
			problem: { kind: 'maximize' },
			fits: [{ method: 'linear' }],
			optimizers: [{ method: 'bfgs' }],
			starts: { latinHypercube: 2, seed: 2 }
		});
		const o = await waitFor(t.editor.client, other);
		await expectError(await t.viewer.client.get(`/api/v1/studies/${studyId}/fits/${o.fits[0].id}/export?format=json`), 404, 'fitId');
		// Failed study (state set in the database): 409, and nothing changed.
		await testDb()('studies').where({ id: other }).update({ status: 'failed', error: 'worker lost' });
		const body = await expectError(await t.viewer.client.get(`/api/v1/studies/${other}/fits/${o.fits[0].id}/export?format=python`), 409);
		expect(body.error.message).toContain('worker lost');
	});
});

describe('dataset fit preview export', () => {
	it('by query and by POST body', async () => {
		const q = await t.viewer.client.get(`/api/v1/datasets/${datasetId}/export?output=CT&method=cubic-clamped&slopes=-0.05,-0.08&extrapolation=hold&format=python`);
		expect(q.status).toBe(200);
		expect(q.headers.get('content-disposition')).toMatch(/filename="Coarse_prop_sweep_invented_v1_CT_cubic_clamped\.py"/);
		const text = await q.text();
		expect(text).toContain('EXTRAPOLATION = "hold"');
		const p = await t.viewer.client.post(`/api/v1/datasets/${datasetId}/export`, { output: 'eta', method: 'smoothing-spline', options: { lambda: 0.01 }, format: 'json' });
		expect(p.status).toBe(200);
		const { doc, fit } = await loadFitExport(await p.text());
		expect(fit.method).toBe('smoothing-spline');
		expect(doc.fit.options).toMatchObject({ lambda: 0.01 });
	});

	it('refuses bad options, an unknown output or method, an unknown format', async () => {
		const c = t.viewer.client;
		const base = `/api/v1/datasets/${datasetId}/export`;
		await expectError(await c.get(`${base}?output=eta&method=cubic-clamped&format=json`), 422, 'options.slopes');
		await expectError(await c.get(`${base}?output=eta&method=pchip&degree=3`), 422, 'options.degree');
		await expectError(await c.get(`${base}?output=eta&method=polynomial-least-squares&degree=abc`), 422, 'options.degree');
		await expectError(await c.get(`${base}?output=nope&method=pchip`), 422, 'output');
		await expectError(await c.get(`${base}?output=eta&method=spline9`), 422, 'method');
		await expectError(await c.get(`${base}?output=eta&method=pchip&format=xlsx`), 400, 'format');
		await expectError(await c.get(`${base}?output=eta&method=pchip&options={bad`), 400, 'options');
		await expectError(await c.post(base, 'not json', { 'content-type': 'application/json' }), 400);
		await expectError(await c.post(base, { output: 'eta', method: 'pchip', options: { colour: 'red' } }), 422, 'options');
		await expectError(await t.outsider.client.get(`${base}?output=eta&method=pchip`), 404);
	});
});

describe('study record', () => {
	it('prints as HTML and as PDF, from the study and through a share link, with the caution', async () => {
		const r = await t.viewer.client.get(`/w/${t.ws.slug}/studies/${studyId}/record`);
		expect(r.status).toBe(200);
		expect(r.headers.get('content-type')).toContain('text/html');
		const html = await r.text();
		expect(html.replace(/&#39;/g, "'")).toContain(CAUTION);
		expect(html).toContain('Coarse prop sweep (invented)');
		expect(html).toMatch(/SHA-256 of the upload<\/dt><dd>[0-9a-f]{64}/);
		expect(html).toContain('@media print');
		expect((html.match(/<svg /g) ?? []).length).toBeGreaterThanOrEqual(2);
		const pdf = await t.viewer.client.get(`/w/${t.ws.slug}/studies/${studyId}/record?format=pdf`);
		expect(pdf.status).toBe(200);
		expect(pdf.headers.get('content-type')).toBe('application/pdf');
		expect(pdf.headers.get('content-disposition')).toMatch(/^attachment; filename="study-record-Export-me\.pdf"$/);
		const bytes = Buffer.from(await pdf.arrayBuffer());
		expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
		expect(bytes.length).toBeGreaterThan(5000);
		const share = await json<{ token: string }>(await t.owner.client.post(`/api/v1/studies/${studyId}/share`));
		const shared = await new Client().get(`/shared/${share.token}/record`);
		expect(shared.status).toBe(200);
		expect(await shared.text()).toContain('read-only share link');
		await expectError(await t.viewer.client.get(`/w/${t.ws.slug}/studies/${studyId}/record?format=docx`), 400, 'format');
		await expectError(await t.outsider.client.get(`/w/${t.ws.slug}/studies/${studyId}/record`), 404);
		const anon = await new Client().get(`/w/${t.ws.slug}/studies/${studyId}/record`);
		expect(anon.status).toBe(303);
	});
});
