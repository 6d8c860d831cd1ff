// Exports of a fit in the formats the export routes serve: the fit file
// (JSON), generated Python and TypeScript, and a dense CSV sampling of
// x, f, f′, f″. The document itself is built by $lib/numerics/export.
import { csvText } from '../../csv';
import { z } from 'zod';
import { CAUTION } from '../../caution';
import { createFitExport, fitExportText, generatePython, generateTypeScript, type FitExport, type FitExportSource } from '../../numerics/export';
import { fitFromJSON, isSurfaceFitFile, surfaceFromJSON } from '../../numerics/fits';
import { fail4xx } from '../api';
import { version as KINKLESS_VERSION } from '../../../../package.json';

const EXPORT_FORMATS = ['json', 'python', 'typescript', 'csv'] as const;
export type ExportFormat = (typeof EXPORT_FORMATS)[number];

export const exportFormatSchema = z.enum(EXPORT_FORMATS, { error: `format must be one of ${EXPORT_FORMATS.join(', ')}` });

/** Points in the CSV sampling (plus every knot). */
const CSV_SAMPLES = 1000;
const MAX_CSV_KNOTS = 5000;

/** The format from the query (`?format=`), 400 naming the choices otherwise. */
export function formatFrom(url: URL): ExportFormat {
	const r = exportFormatSchema.safeParse(url.searchParams.get('format') ?? 'json');
	if (!r.success) {
		fail4xx(400, `format: ${r.error.issues[0].message}`, 'invalid', [{ field: 'format', problem: r.error.issues[0].message }]);
	}
	return r.data;
}

export async function buildFitExport(fitBody: unknown, source: FitExportSource): Promise<FitExport> {
	return createFitExport({ fit: fitBody, source, kinkless: KINKLESS_VERSION, caution: CAUTION });
}

/** Letters, digits, '-', '_' and '.' only; everything else becomes '-'. */
function safeFileStem(...parts: string[]): string {
	const stem = parts
		.join('-')
		.normalize('NFKD')
		.replace(/[^A-Za-z0-9._-]+/g, '-')
		.replace(/-+/g, '-')
		.replace(/^[-.]+|[-.]+$/g, '')
		.slice(0, 120);
	return stem || 'fit';
}


function unitOf(c: { unit: string | null }): string {
	return c.unit ? ` [${c.unit}]` : '';
}

function derivUnit(out: { unit: string | null }, inp: { unit: string | null }, power: number): string {
	if (!out.unit && !inp.unit) return '';
	const num = out.unit ?? '1';
	const den = inp.unit ? `${inp.unit}${power > 1 ? `^${power}` : ''}` : '1';
	return ` [${num}/${den}]`;
}

/** x, f, f′, f″ sampled evenly over the domain plus at every knot; units in the header row; the caution as a trailing comment line. */
function samplesCsv(doc: FitExport): string {
	if (isSurfaceFitFile(doc.fit)) return surfaceSamplesCsv(doc);
	const fit = fitFromJSON(doc.fit);
	const [lo, hi] = fit.domain;
	const pts = new Set<number>();
	for (let i = 0; i <= CSV_SAMPLES; i++) pts.add(i === CSV_SAMPLES ? hi : lo + ((hi - lo) * i) / CSV_SAMPLES);
	if (fit.knots.length <= MAX_CSV_KNOTS) for (const k of fit.knots) pts.add(k);
	const xs = Float64Array.from(pts).sort();
	const s = fit.evaluateMany(xs);
	const inp = doc.source.inputs[0];
	const out = doc.source.output;
	const header = [
		`${inp.name}${unitOf(inp)}`,
		`${out.name}${unitOf(out)}`,
		`d${out.name}/d${inp.name}${derivUnit(out, inp, 1)}`,
		`d2${out.name}/d${inp.name}2${derivUnit(out, inp, 2)}`
	].map(csvText);
	const lines = [header.join(',')];
	for (let i = 0; i < xs.length; i++) lines.push(`${xs[i]},${s.f[i]},${s.df[i]},${s.d2f[i]}`);
	lines.push(csvText(`# ${doc.fit.method} fit of ${doc.source.dataset.name} v${doc.source.dataset.version} (${doc.checksum}). ${CAUTION}`));
	return `${lines.join('\r\n')}\r\n`;
}

const TYPES: Record<ExportFormat, { type: string; ext: string }> = {
	json: { type: 'application/json; charset=utf-8', ext: 'json' },
	python: { type: 'text/x-python; charset=utf-8', ext: 'py' },
	typescript: { type: 'text/plain; charset=utf-8', ext: 'ts' },
	csv: { type: 'text/csv; charset=utf-8', ext: 'csv' }
};

/** The download response for one format. */
export function exportResponse(doc: FitExport, format: ExportFormat, stemParts: string[]): Response {
	let body: string;
	let stem = safeFileStem(...stemParts);
	if (format === 'json') body = fitExportText(doc);
	else if (format === 'python') {
		body = generatePython(doc);
		stem = stem.replace(/[.-]/g, '_').replace(/^(\d)/, '_$1'); // an importable module name
	} else if (format === 'typescript') body = generateTypeScript(doc);
	else body = samplesCsv(doc);
	const { type, ext } = TYPES[format];
	return new Response(body, {
		headers: {
			'content-type': type,
			'content-disposition': `attachment; filename="${stem}.${ext}"`,
			'x-content-type-options': 'nosniff',
			'cache-control': 'private, no-store'
		}
	});
}

/** Export one of a study's fits. 404 when the fit is not in this study, 409 when the study failed. */
export async function studyFitExport(
	db: import('knex').Knex,
	study: { id: string; status: string; error: string | null; datasetId: string; output: string; name: string; spec: { dataset: { name: string; version: number; input: { name: string; unit: string | null }; inputs?: { name: string; unit: string | null }[]; output: { name: string; unit: string | null } } } },
	fitId: string,
	format: ExportFormat
): Promise<Response> {
	if (study.status === 'failed') {
		fail4xx(409, `this study failed${study.error ? ` (${study.error})` : ''}; its fits cannot be exported`, 'study-failed');
	}
	const isUuid = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(fitId);
	const row = isUuid ? await db('study_fits').where({ id: fitId, study_id: study.id }).first('fit', 'method') : undefined;
	if (!row) fail4xx(404, `fit ${fitId} is not one of this study's fits`, 'not-found', [{ field: 'fitId', problem: 'not a fit of this study' }]);
	const dataset = await db('datasets').where({ id: study.datasetId }).first('source_sha256');
	const d = study.spec.dataset;
	const doc = await buildFitExport(row.fit, {
		dataset: { name: d.name, version: d.version, sha256: dataset?.source_sha256 ?? '' },
		// every input of a surface, in the dataset's column order
		inputs: d.inputs ?? [d.input],
		output: d.output
	});
	return exportResponse(doc, format, [d.name, `v${d.version}`, d.output.name, String(row.method)]);
}

/** Most rows of a surface's CSV sampling (an even grid over the data box, the same count per input). */
const CSV_SURFACE_ROWS = 20_000;

/** A surface sampled on an even grid over its data box: the inputs, f and ∂f/∂x_k per row (last input fastest). */
function surfaceSamplesCsv(doc: FitExport): string {
	const fit = surfaceFromJSON(doc.fit);
	const d = fit.dimension;
	const per = Math.max(2, Math.min(101, Math.floor(CSV_SURFACE_ROWS ** (1 / d))));
	const ins = doc.source.inputs;
	const out = doc.source.output;
	const name = (k: number) => ins[k]?.name ?? `x${k + 1}`;
	const header = [
		...fit.domain.map((_, k) => `${name(k)}${unitOf(ins[k] ?? { unit: null })}`),
		`${out.name}${unitOf(out)}`,
		...fit.domain.map((_, k) => `d${out.name}/d${name(k)}${derivUnit(out, ins[k] ?? { unit: null }, 1)}`)
	].map(csvText);
	const lines = [header.join(',')];
	const idx = new Array<number>(d).fill(0);
	const x = new Float64Array(d);
	const grad = new Float64Array(d);
	for (let row = 0; row < per ** d; row++) {
		for (let k = 0; k < d; k++) {
			const [lo, hi] = fit.domain[k];
			x[k] = idx[k] === per - 1 ? hi : lo + ((hi - lo) * idx[k]) / (per - 1);
		}
		const f = fit.valueGradient(x, grad);
		lines.push([...x, f, ...grad].join(','));
		for (let k = d - 1; k >= 0; k--) {
			if (++idx[k] < per) break;
			idx[k] = 0;
		}
	}
	lines.push(csvText(`# ${doc.fit.method} fit of ${doc.source.dataset.name} v${doc.source.dataset.version} (${doc.checksum}). ${CAUTION}`));
	return `${lines.join('\r\n')}\r\n`;
}
