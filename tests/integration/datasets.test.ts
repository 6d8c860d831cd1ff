// Datasets through the API against the real server and database: shapes of
// the answers, storage (bytes, hash, packed columns, versions), roles,
// delete/archive, and the fit preview.
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, json, testDb } from './client';
import { countDatasets, csv, refused, team, upload, type Created } from './datasetHelpers';

let t: Awaited<ReturnType<typeof team>>;
beforeAll(async () => {
	t = await team('api');
});

// Propeller-like sweep, coarse on purpose: linear has a kink at every row.
const PROP = csv('J [-],eta (-),CT [-]', '0.1,0.18,0.110', '0.2,0.35,0.104', '0.3,0.50,0.097', '0.4,0.62,0.088', '0.5,0.72,0.078', '0.6,0.79,0.066', '0.7,0.82,0.052', '0.8,0.80,0.037', '0.9,0.69,0.021', '1.0,0.45,0.008');

describe('upload and read back', () => {
	it('a CSV with units in the header: 201 with the documented shape, bytes and hash kept, columns packed', async () => {
		const res = await upload(t.owner, t.ws.slug, PROP, 'prop.csv', { name: 'Prop sweep' });
		expect(res.status).toBe(201);
		const created = await json<Created>(res);
		expect(Object.keys(created).sort()).toEqual(['id', 'inputs', 'name', 'outputs', 'rowCount', 'shape', 'warnings']);
		expect(created).toMatchObject({ name: 'Prop sweep', shape: 'curve', inputs: ['J'], outputs: ['eta', 'CT'], rowCount: 10 });

		const row = await testDb()('datasets').where({ id: created.id }).first();
		expect(Buffer.from(row.source_bytes).toString('utf8')).toBe(PROP);
		expect(row.source_sha256).toBe(createHash('sha256').update(PROP).digest('hex'));
		expect(row.data.length).toBe(3 * 10 * 8);
		expect(new Float64Array(new Uint8Array(row.data).buffer)[10]).toBe(0.18); // column 1, row 0

		const meta = await json<Record<string, unknown>>(await t.viewer.get(`/api/v1/datasets/${created.id}`));
		expect(meta).toMatchObject({
			id: created.id,
			name: 'Prop sweep',
			version: 1,
			shape: 'curve',
			rowCount: 10,
			columns: [
				{ name: 'J', unit: '-', role: 'input' },
				{ name: 'eta', unit: '-', role: 'output' },
				{ name: 'CT', unit: '-', role: 'output' }
			],
			source: { format: 'csv', filename: 'prop.csv', sha256: row.source_sha256 }
		});
		expect(meta).not.toHaveProperty('rows');
		const withRows = await json<{ rows: number[][] }>(await t.viewer.get(`/api/v1/datasets/${created.id}?rows=1`));
		expect(withRows.rows[0]).toEqual([0.1, 0.18, 0.11]);
		expect(withRows.rows).toHaveLength(10);
	});

	it('roles chosen in the upload override the default (first column input)', async () => {
		const table = csv('eta [-],J [-]', '0.18,0.1', '0.35,0.2', '0.50,0.3', '0.35,0.4');
		// with the default roles eta would be the input, and it repeats
		const wrong = await refused(t.ws.id, 422, () => upload(t.owner, t.ws.slug, table, 'swapped.csv'));
		expect(wrong.error.message).toContain('rows 3 and 5 have the same inputs (eta = 0.35)');
		const res = await upload(t.owner, t.ws.slug, table, 'swapped.csv', { roles: JSON.stringify({ J: 'input', eta: 'output' }) });
		expect(res.status).toBe(201);
		expect(await json<Created>(res)).toMatchObject({ name: 'swapped', inputs: ['J'], outputs: ['eta'] });
	});

	it('the same name again makes version 2; the list shows both; version 1 is unchanged', async () => {
		const body = (eta: number) => ({
			name: 'Fan curve',
			columns: [
				{ name: 'Q', unit: 'm³/s', role: 'input' },
				{ name: 'dp', unit: 'Pa', role: 'output' }
			],
			rows: [
				[0, 400],
				[0.1, 380],
				[0.2, eta]
			]
		});
		const v1 = await json<Created>(await t.owner.post(`/api/v1/workspaces/${t.ws.slug}/datasets`, body(330)));
		const r2 = await t.owner.post(`/api/v1/workspaces/${t.ws.slug}/datasets`, body(331));
		expect(r2.status).toBe(201);
		const v2 = await json<Created>(r2);
		expect(v2.id).not.toBe(v1.id);
		const list = await json<{ datasets: { id: string; name: string; version: number; shape: string; rowCount: number; createdAt: string }[] }>(
			await t.viewer.get(`/api/v1/workspaces/${t.ws.slug}/datasets`)
		);
		const fans = list.datasets.filter((d) => d.name === 'Fan curve');
		expect(fans.map((d) => d.version).sort()).toEqual([1, 2]);
		expect(Object.keys(fans[0]).sort()).toEqual(['createdAt', 'id', 'name', 'rowCount', 'shape', 'version']);
		const first = await json<{ rows: number[][]; version: number }>(await t.owner.get(`/api/v1/datasets/${v1.id}?rows=1`));
		expect(first.version).toBe(1);
		expect(first.rows[2]).toEqual([0.2, 330]);
	});

	it('?dryRun=1 answers the validation report and stores nothing', async () => {
		const before = await countDatasets(t.ws.id);
		const res = await upload(t.owner, t.ws.slug, csv('J,eta', '0.3,0.5', '0.1,0.2', '0.2,x'), 'dry.csv', {}, '?dryRun=1');
		expect(res.status).toBe(200);
		const report = await json<Record<string, unknown>>(res);
		expect(report).toMatchObject({
			dryRun: true,
			ok: false,
			name: 'dry',
			version: 1,
			shape: 'curve',
			inputs: ['J'],
			outputs: ['eta'],
			rowCount: 3,
			errors: [{ row: 4, column: 'eta', problem: expect.stringContaining('row 4, column "eta"') }]
		});
		expect(report.notes).toContain('rows are not sorted by "J"; that is fine, row order does not matter');
		expect(await countDatasets(t.ws.id)).toBe(before);
	});

	it('a grid is told from its inputs, with the reason', async () => {
		const lines = ['torque [N·m],speed [rpm],eff [-]'];
		for (const s of [1000, 2000, 3000]) for (const q of [10, 20]) lines.push(`${q},${s},${0.8 + q / 1000 + s / 1e5}`);
		const res = await upload(t.owner, t.ws.slug, csv(...lines), 'map.csv', { roles: JSON.stringify({ torque: 'input', speed: 'input' }) });
		expect(res.status).toBe(201);
		const created = await json<Created>(res);
		expect(created).toMatchObject({ shape: 'grid', inputs: ['torque', 'speed'], outputs: ['eff'] });
		const meta = await json<{ shapeReason: string }>(await t.owner.get(`/api/v1/datasets/${created.id}`));
		expect(meta.shapeReason).toContain('a full 2 × 3 grid of 6 points');
	});
});

describe('the origin check and API tokens', () => {
	it('a script with a bearer token uploads multipart without an Origin header; a cookie request from another origin is refused', async () => {
		const { token } = await json<{ token: string }>(await t.owner.post('/api/v1/tokens', { name: 'notebook' }));
		const script = new Client();
		script.bearer = token;
		const res = await upload(script, t.ws.slug, PROP, 'from-script.csv');
		expect(res.status).toBe(201);

		const cross = await t.owner.post(`/api/v1/workspaces/${t.ws.slug}/datasets`, (() => {
			const f = new FormData();
			f.set('file', new Blob([PROP]), 'x.csv');
			return f;
		})(), { origin: 'https://elsewhere.example' });
		expect(cross.status).toBe(403);
	});
});

describe('access by id', () => {
	it('outsiders get 404 for every dataset route; viewers read but cannot delete or archive', async () => {
		const { id } = await json<Created>(await upload(t.owner, t.ws.slug, PROP, 'private.csv'));
		for (const res of [
			await t.outsider.get(`/api/v1/datasets/${id}`),
			await t.outsider.get(`/api/v1/datasets/${id}?rows=1`),
			await t.outsider.del(`/api/v1/datasets/${id}`),
			await t.outsider.post(`/api/v1/datasets/${id}/archive`),
			await t.outsider.post(`/api/v1/datasets/${id}/fit-preview`, { output: 'eta', method: 'linear' }),
			await t.outsider.get(`/api/v1/workspaces/${t.ws.slug}/datasets`)
		]) {
			expect(res.status).toBe(404);
		}
		expect((await t.owner.get('/api/v1/datasets/not-a-uuid')).status).toBe(404);
		expect((await t.owner.get('/api/v1/datasets/00000000-0000-0000-0000-000000000000')).status).toBe(404);
		expect((await t.viewer.del(`/api/v1/datasets/${id}`)).status).toBe(403);
		expect((await t.viewer.post(`/api/v1/datasets/${id}/archive`)).status).toBe(403);
		expect((await t.viewer.get(`/api/v1/datasets/${id}`)).status).toBe(200);
	});
});

describe('delete and archive', () => {
	const REFS = 'test_dataset_refs';
	afterAll(async () => {
		await testDb().schema.dropTableIfExists(REFS);
	});

	it('an unused dataset is deleted (204, gone)', async () => {
		const { id } = await json<Created>(await upload(t.owner, t.ws.slug, PROP, 'doomed.csv'));
		const res = await t.owner.del(`/api/v1/datasets/${id}`);
		expect(res.status).toBe(204);
		expect(await testDb()('datasets').where({ id }).first()).toBeUndefined();
		expect((await t.owner.get(`/api/v1/datasets/${id}`)).status).toBe(404);
	});

	it('a dataset something refers to (as a study does) answers 409 and stays; archiving hides it from the list', async () => {
		const { id } = await json<Created>(await upload(t.owner, t.ws.slug, PROP, 'studied.csv'));
		// A stand-in for a study: any row that references the dataset trips the foreign key.
		await testDb().schema.dropTableIfExists(REFS);
		await testDb().schema.createTable(REFS, (tb) => tb.uuid('dataset_id').references('datasets.id'));
		await testDb()(REFS).insert({ dataset_id: id });

		const res = await t.owner.del(`/api/v1/datasets/${id}`);
		expect(res.status).toBe(409);
		expect((await json<{ error: { message: string } }>(res)).error.message).toBe('dataset "studied" version 1 is used by a study; archive it instead');
		expect(await testDb()('datasets').where({ id }).first()).toBeDefined();

		const archived = await t.owner.post(`/api/v1/datasets/${id}/archive`);
		expect(archived.status).toBe(200);
		expect(await json(archived)).toMatchObject({ id, archived: true, archivedAt: expect.any(String) });
		const list = await json<{ datasets: { id: string }[] }>(await t.owner.get(`/api/v1/workspaces/${t.ws.slug}/datasets`));
		expect(list.datasets.map((d) => d.id)).not.toContain(id);
		const all = await json<{ datasets: { id: string; archivedAt: string | null }[] }>(await t.owner.get(`/api/v1/workspaces/${t.ws.slug}/datasets?archived=1`));
		expect(all.datasets.find((d) => d.id === id)?.archivedAt).toEqual(expect.any(String));
		// still readable by id, as a study needs
		expect((await t.viewer.get(`/api/v1/datasets/${id}?rows=1`)).status).toBe(200);

		const back = await t.owner.post(`/api/v1/datasets/${id}/archive`, { archived: false });
		expect(await json(back)).toMatchObject({ archived: false, archivedAt: null });
		const bad = await t.owner.post(`/api/v1/datasets/${id}/archive`, { archived: 'yes' });
		expect(bad.status).toBe(422);
	});
});

describe('fit preview', () => {
	let curveId: string;
	let gridId: string;
	beforeAll(async () => {
		curveId = (await json<Created>(await upload(t.owner, t.ws.slug, PROP, 'preview.csv'))).id;
		const lines = ['a,b,v'];
		for (const b of [1, 2, 3]) for (const a of [1, 2, 3]) lines.push(`${a},${b},${a * b}`);
		gridId = (await json<Created>(await upload(t.owner, t.ws.slug, csv(...lines), 'grid.csv', { roles: JSON.stringify({ a: 'input', b: 'input' }) }))).id;
	});
	const preview = (c: Client, body: unknown, id = curveId) => c.post(`/api/v1/datasets/${id}/fit-preview`, body);
	type Preview = {
		method: string;
		continuity: { declared: string; measured: string; worst: { x: number; jumpD1: number; jumpD2: number }[] };
		fidelity: { looRmse: number; looMax: number; overshoot: number; monotoneKept: boolean; spuriousExtrema: number };
		samples: { x: number[]; f: number[]; df: number[]; d2f: number[] };
		at?: { x: number[]; f: number[]; df: number[]; d2f: number[] };
	};

	it('linear: the exact shape, measured C0, with the slope jumps listed at the data points', async () => {
		const res = await preview(t.viewer, { output: 'eta', method: 'linear', at: [0.25, 0.7] });
		expect(res.status).toBe(200);
		const p = await json<Preview>(res);
		expect(Object.keys(p).sort()).toEqual(['at', 'continuity', 'fidelity', 'method', 'samples']);
		expect(Object.keys(p.continuity).sort()).toEqual(['declared', 'measured', 'worst']);
		expect(Object.keys(p.fidelity).sort()).toEqual(['looMax', 'looRmse', 'monotoneKept', 'overshoot', 'spuriousExtrema']);
		expect(Object.keys(p.samples).sort()).toEqual(['d2f', 'df', 'f', 'x']);
		expect(p.method).toBe('linear');
		expect(p.continuity).toMatchObject({ declared: 'C0', measured: 'C0' });
		expect(p.continuity.worst).toHaveLength(8); // every interior data point is a kink
		// the largest slope change is where the curve turns over fastest, between J = 0.8 and 1.0
		expect(p.continuity.worst[0].x).toBeCloseTo(0.9, 12);
		expect(p.continuity.worst[0].jumpD1).toBeCloseTo((0.45 - 0.69) / 0.1 - (0.69 - 0.8) / 0.1, 9);
		expect(p.samples.x.length).toBeGreaterThan(400);
		expect(p.samples.x[0]).toBe(0.1);
		expect(p.samples.x.at(-1)).toBe(1);
		for (const k of ['f', 'df', 'd2f'] as const) expect(p.samples[k]).toHaveLength(p.samples.x.length);
		// `at` echoes the points: f(0.25) halfway between 0.35 and 0.50, slope 1.5
		expect(p.at!.x).toEqual([0.25, 0.7]);
		expect(p.at!.f[0]).toBeCloseTo(0.425, 12);
		expect(p.at!.df[0]).toBeCloseTo(1.5, 12);
		expect(p.at!.f[1]).toBeCloseTo(0.82, 12);
		expect(p.fidelity.monotoneKept).toBe(true);
		expect(p.fidelity.overshoot).toBe(0);
		expect(p.fidelity.looRmse).toBeGreaterThan(0);
	});

	it('Akima is measured C1; the natural cubic C2; the least-squares polynomial C∞', async () => {
		const akima = await json<Preview>(await preview(t.owner, { output: 'eta', method: 'akima' }));
		expect(akima.continuity).toMatchObject({ declared: 'C1', measured: 'C1' });
		expect(Math.max(...akima.continuity.worst.map((w) => Math.abs(w.jumpD1)))).toBeLessThan(1e-9);
		const cubic = await json<Preview>(await preview(t.owner, { output: 'CT', method: 'cubic-natural' }));
		expect(cubic.continuity.measured).toBe('C2');
		const poly = await json<Preview>(await preview(t.owner, { output: 'eta', method: 'polynomial-least-squares', options: { degree: 4 } }));
		expect(poly.continuity).toMatchObject({ declared: 'Cinf', measured: 'Cinf', worst: [] });
	});

	it('every curve method answers with its options', async () => {
		const cases: [string, Record<string, unknown>?][] = [
			['linear'],
			['cubic-natural'],
			['cubic-not-a-knot'],
			['cubic-clamped', { slopes: [1.7, -2.4] }],
			['akima'],
			['akima-modified'],
			['pchip'],
			['local-quadratic'],
			['local-cubic'],
			['polynomial-global'],
			['polynomial-least-squares', { degree: 3 }],
			['smoothing-spline'],
			['smoothing-spline', { lambda: 0.001 }],
			['softened-linear', { width: 0.04 }]
		];
		for (const [method, options] of cases) {
			const res = await preview(t.owner, { output: 'eta', method, ...(options ? { options } : {}) });
			expect(res.status, `${method}: ${await res.clone().text()}`).toBe(200);
			expect((await json<Preview>(res)).method).toBe(method);
		}
	});

	it('bad requests are 422 naming the field', async () => {
		const problem = async (body: unknown, field: string, fragment: string, id = curveId) => {
			const res = await preview(t.owner, body, id);
			expect(res.status, JSON.stringify(body)).toBe(422);
			const e = await json<{ error: { message: string; details: { field: string; problem: string }[] } }>(res);
			expect(e.error.details.map((d) => d.field)).toContain(field);
			expect(e.error.message).toContain(fragment);
		};
		await problem({ output: 'eta', method: 'bezier' }, 'method', 'method must be one of linear, cubic-natural');
		await problem({ output: 'rpm', method: 'linear' }, 'output', 'the dataset has no output column "rpm"; its outputs are "eta", "CT"');
		await problem({ output: 'J', method: 'linear' }, 'output', 'no output column "J"');
		await problem({ method: 'linear' }, 'output', 'output is required');
		await problem({ output: 'eta', method: 'linear', options: { degree: 3 } }, 'options.degree', 'degree does not apply to linear; it is an option of polynomial-least-squares');
		await problem({ output: 'eta', method: 'polynomial-least-squares', options: { degree: 2.5 } }, 'options.degree', 'degree must be a whole number');
		await problem({ output: 'eta', method: 'polynomial-least-squares', options: { degree: 12 } }, 'options.degree', 'options.degree');
		await problem({ output: 'eta', method: 'softened-linear', options: { width: -1 } }, 'options.width', 'width must be a positive length');
		await problem({ output: 'eta', method: 'smoothing-spline', options: { lambda: -2 } }, 'options.lambda', 'lambda must be ≥ 0');
		await problem({ output: 'eta', method: 'cubic-clamped' }, 'options.slopes', 'cubic-clamped needs options.slopes');
		await problem({ output: 'eta', method: 'linear', options: { smoothness: 3 } }, 'options', 'unknown option "smoothness"; the options are extrapolation, degree, lambda, width and slopes');
		await problem({ output: 'eta', method: 'linear', options: { extrapolation: 'wrap' } }, 'options.extrapolation', 'extrapolation must be one of refuse, hold, linear, extend');
		await problem({ output: 'eta', method: 'linear', at: [0.5, 7] }, 'at.1', 'x = 7 lies outside the data');
		await problem({ output: 'eta', method: 'linear', at: 'everywhere' }, 'at', 'at must be a list of numbers');
		// a grid takes the surface methods (tests/integration/datasets-surface-preview.test.ts)
		await problem({ output: 'v', method: 'linear' }, 'method', 'method must be one of grid-linear', gridId);
		const outside = await json<Preview>(await preview(t.owner, { output: 'eta', method: 'linear', options: { extrapolation: 'hold' }, at: [7] }));
		expect(outside.at!.f).toEqual([0.45]);
	});
});

describe('timing', () => {
	it('parse and store a 100,000-row CSV through the API (reported, not asserted)', async () => {
		const lines = ['J [-],eta [-],CT [-],CP [-]'];
		for (let i = 0; i < 100_000; i++) {
			const j = i * 1e-5;
			lines.push(`${j.toFixed(5)},${(0.85 * Math.sin(Math.PI * j)).toPrecision(8)},${(0.12 - 0.1 * j).toExponential(6)},${(0.05 + 0.01 * j * j).toFixed(7)}`);
		}
		const text = lines.join('\n') + '\n';
		const t0 = performance.now();
		const res = await upload(t.owner, t.ws.slug, text, 'sweep-100k.csv');
		const t1 = performance.now();
		expect(res.status).toBe(201);
		const { id, rowCount } = await json<Created>(res);
		expect(rowCount).toBe(100_000);
		const t2 = performance.now();
		const back = await t.owner.get(`/api/v1/datasets/${id}?rows=1`);
		const rows = (await json<{ rows: number[][] }>(back)).rows;
		const t3 = performance.now();
		expect(rows).toHaveLength(100_000);
		// the 3.2 MB of numbers are read back in 256 KB pieces (the last one partial): every value
		// at the piece seams and the ends comes back exactly as written in the file
		const written = lines.slice(1).map((l) => l.split(',').map(Number));
		for (const i of [0, 1, 8191, 8192, 8193, 32767, 32768, 65535, 65536, 99_998, 99_999]) expect(rows[i]).toEqual(written[i]);
		expect(rows.every((r, i) => r[3] === written[i][3])).toBe(true);
		const p0 = performance.now();
		const fit = await t.owner.post(`/api/v1/datasets/${id}/fit-preview`, { output: 'eta', method: 'akima' });
		const p1 = performance.now();
		expect(fit.status).toBe(200);
		console.log(
			`100,000 × 4 CSV (${(Buffer.byteLength(text) / 1024 / 1024).toFixed(1)} MB) through POST /api/v1/workspaces/:ws/datasets: ${(t1 - t0).toFixed(0)} ms to parse, validate and store; ` +
				`server-timing: ${res.headers.get('server-timing')}; GET ?rows=1 ${(t3 - t2).toFixed(0)} ms; Akima fit preview ${(p1 - p0).toFixed(0)} ms`
		);
	});
});


describe('the upload page without JavaScript', () => {
	const page = (c: Client, action: string, form: FormData) =>
		c.post(`/w/${t.ws.slug}/datasets/new?/${action}`, form, { origin: new URL(process.env.KINKLESS_TEST_URL!).origin, accept: 'text/html' });

	it('check keeps the upload as a draft; save with the draft and chosen roles stores it once and redirects', async () => {
		const table = 'eta [-],J [-]\n0.18,0.1\n0.35,0.2\n0.50,0.3\n0.35,0.4\n';
		const first = new FormData();
		first.set('file', new Blob([table]), 'swapped-page.csv');
		const before = await countDatasets(t.ws.id);
		const checked = await page(t.owner, 'check', first);
		expect(checked.status).toBe(200);
		const html = await checked.text();
		expect(html).toContain('Validation report');
		expect(html).toContain('rows 3 and 5 have the same inputs (eta = 0.35)');
		const draft = /name="draft" value="([0-9a-f-]{36})"/.exec(html)?.[1];
		expect(draft).toBeDefined();
		expect(await countDatasets(t.ws.id)).toBe(before);

		// a save that still fails the check stores nothing
		const failing = new FormData();
		failing.set('draft', draft!);
		expect((await page(t.owner, 'save', failing)).status).toBe(422);
		expect(await countDatasets(t.ws.id)).toBe(before);

		const second = new FormData();
		second.set('draft', draft!);
		second.set('name', 'Swapped via page');
		second.set('role:eta', 'output');
		second.set('role:J', 'input');
		const saved = await page(t.owner, 'save', second);
		expect(saved.status).toBe(303);
		const id = saved.headers.get('location')!.split('/').pop()!;
		expect(saved.headers.get('location')).toBe(`/w/${t.ws.slug}/datasets/${id}`);
		expect(await countDatasets(t.ws.id)).toBe(before + 1);
		const meta = await json<{ name: string; columns: { name: string; role: string }[]; source: { filename: string; sha256: string } }>(await t.owner.get(`/api/v1/datasets/${id}`));
		expect(meta.name).toBe('Swapped via page');
		expect(meta.columns.map((c) => c.role)).toEqual(['output', 'input']);
		expect(meta.source.filename).toBe('swapped-page.csv');
		expect(meta.source.sha256).toBe(createHash('sha256').update(table).digest('hex'));
		// the draft went with the save
		expect(await testDb()('dataset_drafts').where({ id: draft }).first()).toBeUndefined();
		expect((await t.owner.get(`/w/${t.ws.slug}/datasets/${id}`)).status).toBe(200);
		// under another workspace's URL the dataset does not exist
		const other = await newWorkspaceFor(t.owner);
		expect((await t.owner.get(`/w/${other}/datasets/${id}`)).status).toBe(404);
	});

	it('pasted cells are checked and saved the same way', async () => {
		const form = new FormData();
		form.set('text', 'Q [m³/s]\tdp [Pa]\n0\t400\n0.1\t380\n0.2\t330\n');
		form.set('name', 'Pasted fan');
		const saved = await page(t.owner, 'save', form);
		expect(saved.status).toBe(303);
		const id = saved.headers.get('location')!.split('/').pop()!;
		const meta = await json<{ columns: { name: string; unit: string }[]; source: { format: string; filename: string | null } }>(await t.owner.get(`/api/v1/datasets/${id}`));
		expect(meta.columns).toEqual([
			{ name: 'Q', unit: 'm³/s', role: 'input' },
			{ name: 'dp', unit: 'Pa', role: 'output' }
		]);
		expect(meta.source).toMatchObject({ format: 'tsv', filename: null });
	});

	it('viewers cannot open the upload page or post to it; a draft is private to its uploader', async () => {
		expect((await t.viewer.get(`/w/${t.ws.slug}/datasets/new`)).status).toBe(403);
		const form = new FormData();
		form.set('file', new Blob(['x,y\n1,2\n2,3\n']), 'v.csv');
		const before = await countDatasets(t.ws.id);
		expect((await page(t.viewer, 'save', form)).status).toBe(403);
		expect((await page(t.outsider, 'save', form)).status).toBe(404);
		expect(await countDatasets(t.ws.id)).toBe(before);
	});

	it('an unreadable file gets its message back and no draft', async () => {
		const form = new FormData();
		form.set('file', new Blob(['']), 'empty.csv');
		const drafts = Number((await testDb()('dataset_drafts').count<{ n: string }[]>('* as n'))[0].n);
		const res = await page(t.owner, 'check', form);
		expect(res.status).toBe(422);
		expect(await res.text()).toContain('the file is empty');
		expect(Number((await testDb()('dataset_drafts').count<{ n: string }[]>('* as n'))[0].n)).toBe(drafts);
	});
});

async function newWorkspaceFor(c: Client): Promise<string> {
	const r = await c.post('/api/v1/workspaces', { name: 'Elsewhere' });
	return (await json<{ slug: string }>(r)).slug;
}

describe('demo datasets', () => {
	it('the Larkmoor Aero workspace holds the five invented tables, and seeding again adds nothing', async () => {
		const ws = await testDb()('workspaces').where({ slug: 'larkmoor-aero' }).first('id');
		const rows = await testDb()('datasets').where({ workspace_id: ws.id }).orderBy('name').select('name', 'shape', 'row_count', 'description', 'columns', 'version');
		const byName = Object.fromEntries(rows.map((r) => [r.name, r]));
		expect(byName['Propeller efficiency vs advance ratio']).toMatchObject({ shape: 'curve', row_count: 11, version: 1 });
		expect(byName['Motor efficiency map']).toMatchObject({ shape: 'grid', row_count: 64 });
		expect(byName['Battery pack voltage vs state of charge']).toMatchObject({ shape: 'curve', row_count: 21 });
		expect(byName['Wing drag coefficient vs lift coefficient']).toMatchObject({ shape: 'curve', row_count: 17 });
		expect(byName['Cooling-fan pressure rise vs flow']).toMatchObject({ shape: 'curve', row_count: 11 });
		for (const r of rows) expect(r.description).toContain('Invented demo data');
		expect(byName['Motor efficiency map'].columns).toEqual([
			{ name: 'torque', unit: 'N·m', role: 'input' },
			{ name: 'speed', unit: 'rpm', role: 'input' },
			{ name: 'efficiency', unit: '-', role: 'output' }
		]);

		const { execFileSync } = await import('node:child_process');
		execFileSync('npx', ['tsx', 'scripts/db.ts', 'seed'], { env: process.env, encoding: 'utf8' });
		const again = await testDb()('datasets').where({ workspace_id: ws.id }).count<{ n: string }[]>('* as n');
		expect(Number(again[0].n)).toBe(rows.length);
	});

	it('the demo fan curve is monotone and PCHIP keeps it so; the coarse propeller sweep is C0 under linear', async () => {
		const demo = new Client();
		await demo.post('/api/v1/session', { email: 'demo@larkmoor.example', password: 'larkmoor-demo-2026' });
		const list = await json<{ datasets: { id: string; name: string }[] }>(await demo.get('/api/v1/workspaces/larkmoor-aero/datasets'));
		const fan = list.datasets.find((d) => d.name === 'Cooling-fan pressure rise vs flow')!;
		const pchip = await json<{ fidelity: { monotoneKept: boolean; overshoot: number } }>(await demo.post(`/api/v1/datasets/${fan.id}/fit-preview`, { output: 'pressure rise', method: 'pchip' }));
		expect(pchip.fidelity.monotoneKept).toBe(true);
		const prop = list.datasets.find((d) => d.name === 'Propeller efficiency vs advance ratio')!;
		const linear = await json<{ continuity: { measured: string; worst: unknown[] } }>(await demo.post(`/api/v1/datasets/${prop.id}/fit-preview`, { output: 'eta', method: 'linear' }));
		expect(linear.continuity.measured).toBe('C0');
		expect(linear.continuity.worst).toHaveLength(9);
	});
});
