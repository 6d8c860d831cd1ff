import type { RequestEvent, RequestHandler } from './$types';
import { api, fail4xx, requireJsonType } from '$lib/server/api';
import { db } from '$lib/server/db';
import { datasetAccess } from '$lib/server/datasets/access';
import * as datasetStore from '$lib/server/datasets/store';
import { buildFitExport, exportFormatSchema, exportResponse, type ExportFormat } from '$lib/server/studies/fitExports';
import { fitPreviewSchema, previewFit } from '$lib/server/datasets/fitPreview';

const NUMERIC = new Set(['degree', 'lambda', 'width']);

/** Query → the fit-preview request shape: `output`, `method`, `format`, and options by name (`slopes=a,b`) or as `options=<JSON>`. */
function fromQuery(url: URL): Record<string, unknown> {
	const q = url.searchParams;
	const body: Record<string, unknown> = {};
	let options: Record<string, unknown> = {};
	for (const [k, v] of q) {
		if (k === 'output' || k === 'method' || k === 'format') body[k] = v;
		else if (k === 'options') {
			try {
				options = { ...options, ...JSON.parse(v) };
			} catch {
				fail4xx(400, 'options: not valid JSON', 'invalid', [{ field: 'options', problem: 'not valid JSON' }]);
			}
		} else if (k === 'slopes') options.slopes = v.split(',').map((s) => (s.trim() === '' ? NaN : Number(s)));
		else if (NUMERIC.has(k)) options[k] = v.trim() === '' ? NaN : Number(v);
		else options[k] = v;
	}
	if (Object.keys(options).length) body.options = options;
	return body;
}

async function exportPreview(event: RequestEvent, raw: Record<string, unknown>): Promise<Response> {
	const { dataset } = await datasetAccess(event.locals, event.params.id, 'viewer');
	const { format: rawFormat, ...request } = raw;
	const f = exportFormatSchema.safeParse(rawFormat ?? 'json');
	if (!f.success) fail4xx(400, `format: ${f.error.issues[0].message}`, 'invalid', [{ field: 'format', problem: f.error.issues[0].message }]);
	const format: ExportFormat = f.data;
	const parsed = fitPreviewSchema.safeParse(request);
	if (!parsed.success) {
		const details = parsed.error.issues.map((i) => ({ field: i.path.join('.') || undefined, problem: i.message }));
		fail4xx(422, details.map((d) => (d.field ? `${d.field}: ${d.problem}` : d.problem)).join('; '), 'invalid', details);
	}
	const full = await datasetStore.getWithData(db(), dataset.id);
	if (!full) fail4xx(404, 'no such dataset');
	const { fit, input, output } = await previewFit(full, parsed.data);
	const doc = await buildFitExport(fit, {
		dataset: { name: full.name, version: full.version, sha256: full.sourceSha256 },
		inputs: [{ name: input.name, unit: input.unit }],
		output: { name: output.name, unit: output.unit }
	});
	return exportResponse(doc, format, [full.name, `v${full.version}`, output.name, String(fit.method)]);
}

/** `?output=…&method=…&format=…` plus options → a download of the previewed fit. Viewers may export. */
export const GET = api<RequestHandler>(async (event) => exportPreview(event, fromQuery(event.url)));

/** The same with `{ output, method, options?, format? }` as a JSON body. */
export const POST = api<RequestHandler>(async (event) => {
	requireJsonType(event.request);
	let body: unknown;
	try {
		body = await event.request.json();
	} catch {
		fail4xx(400, 'the body must be JSON', 'invalid');
	}
	if (body == null || typeof body !== 'object' || Array.isArray(body)) fail4xx(400, 'the body must be a JSON object', 'invalid');
	return exportPreview(event, body as Record<string, unknown>);
});
