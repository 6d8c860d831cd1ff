/**
 * The exported fit file: our own envelope, version 1, around a fit body
 * (`CurveFit.toJSON()`, see ../fits/fitFile.ts; surface fits plug in with
 * their own body). It carries what a reader needs to trust and use the fit
 * away from Kinkless:
 *
 *   {
 *     "format": "kinkless-fit-export",
 *     "version": 1,
 *     "kinkless": "0.1.0",                          // the Kinkless version that wrote it
 *     "caution": "…",                               // the caution (src/lib/caution.ts)
 *     "source": {
 *       "dataset": { "name": "…", "version": 3, "sha256": "…" },   // the upload's SHA-256
 *       "inputs": [{ "name": "alpha", "unit": "deg" }],            // in the order evaluate(x) takes them
 *       "output": { "name": "CL", "unit": null }
 *     },
 *     "fit": { …the fit body: method, continuity, options (settings), domain,
 *              extrapolation, representation, knots, coefficients… },
 *     "checksum": "sha256:…"                        // over everything above, canonical form
 *   }
 *
 * The checksum is the SHA-256 of the canonical JSON of the document without
 * its "checksum" key (object keys sorted, no whitespace; numbers as
 * ECMAScript writes them, which is the shortest round-tripping decimal). It
 * catches an edited or damaged file; it is not a signature.
 *
 * Hashing uses the platform's Web Crypto (Node 20 and every current
 * browser), so this module stays framework-free.
 */
import { FitError } from '../fits/fitError';
import { fitFromJSON } from '../fits/fitCurve';
import { fitFileObject } from '../fits/fitFile';
import type { CurveFit } from '../fits/types';

const FIT_EXPORT_FORMAT = 'kinkless-fit-export';
const FIT_EXPORT_VERSION = 1;

interface ColumnLabel {
	name: string;
	unit: string | null;
}

export interface FitExportSource {
	dataset: { name: string; version: number; sha256: string };
	inputs: ColumnLabel[];
	output: ColumnLabel;
}

export interface FitExport {
	format: typeof FIT_EXPORT_FORMAT;
	version: typeof FIT_EXPORT_VERSION;
	kinkless: string;
	caution: string;
	source: FitExportSource;
	/** the fit body: at least `method`, `continuity`, `extrapolation`, `domain`, `representation` */
	fit: Record<string, unknown>;
	checksum: string;
}

/** JSON with object keys sorted and no whitespace: the text the checksum covers. */
export function canonicalJson(v: unknown): string {
	if (v === null || typeof v !== 'object') {
		const s = JSON.stringify(v);
		if (s === undefined) throw new FitError('bad-fit-file', 'fit file: a value cannot be written as JSON');
		return s;
	}
	if (Array.isArray(v)) return `[${v.map(canonicalJson).join(',')}]`;
	const o = v as Record<string, unknown>;
	const keys = Object.keys(o)
		.filter((k) => o[k] !== undefined)
		.sort();
	return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson(o[k])}`).join(',')}}`;
}

async function sha256Hex(text: string): Promise<string> {
	const digest = await globalThis.crypto.subtle.digest('SHA-256', new TextEncoder().encode(text));
	return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}

/** The checksum a document should carry (its "checksum" key ignored). */
async function fitExportChecksum(doc: Omit<FitExport, 'checksum'> | FitExport): Promise<string> {
	const rest: Record<string, unknown> = { ...doc };
	delete rest.checksum;
	return `sha256:${await sha256Hex(canonicalJson(rest))}`;
}

/** Build the export document for a fit body (a fit's `toJSON()`). */
export async function createFitExport(input: { fit: unknown; source: FitExportSource; kinkless: string; caution: string }): Promise<FitExport> {
	// A JSON round trip makes the body plain data (the same text a reader sees).
	const fit = JSON.parse(JSON.stringify(input.fit)) as Record<string, unknown>;
	const body: Omit<FitExport, 'checksum'> = {
		format: FIT_EXPORT_FORMAT,
		version: FIT_EXPORT_VERSION,
		kinkless: input.kinkless,
		caution: input.caution,
		source: input.source,
		fit
	};
	return { ...body, checksum: await fitExportChecksum(body) };
}

/** The document as the file's text (two-space indented, ends with a newline). */
export function fitExportText(doc: FitExport): string {
	return `${JSON.stringify(doc, null, 2)}\n`;
}

/**
 * Read an export document (object or text): format, version and checksum are
 * checked before anything else, each with its own message. The fit body is
 * returned as-is; rebuild it with `fitFromJSON` (curves) or `surfaceFromJSON` (surfaces).
 */
export async function readFitExport(json: unknown): Promise<FitExport> {
	const d = fitFileObject(json, 'a JSON object');
	if (d.format !== FIT_EXPORT_FORMAT) throw new FitError('bad-fit-file', `fit file: "format" must be "${FIT_EXPORT_FORMAT}"`);
	if (d.version !== FIT_EXPORT_VERSION) {
		throw new FitError(
			'bad-fit-file',
			`fit file: version ${JSON.stringify(d.version)} is not supported (this Kinkless reads version ${FIT_EXPORT_VERSION})`
		);
	}
	if (typeof d.checksum !== 'string') throw new FitError('bad-fit-file', 'fit file: "checksum" is missing');
	const expected = await fitExportChecksum(d as unknown as FitExport);
	if (d.checksum !== expected) {
		throw new FitError('bad-fit-file', `fit file: checksum mismatch (the file says ${d.checksum}, its content gives ${expected}); the file was changed or damaged`);
	}
	if (d.fit == null || typeof d.fit !== 'object') throw new FitError('bad-fit-file', 'fit file: "fit" must be an object');
	const s = d.source as FitExportSource | undefined;
	if (!s || !s.dataset || !Array.isArray(s.inputs) || !s.output) throw new FitError('bad-fit-file', 'fit file: "source" is incomplete');
	return d as unknown as FitExport;
}

/**
 * Read an export document and rebuild its fit with `rebuild` (default: the
 * curve registry, `fitFromJSON`; for surface fits pass `surfaceFromJSON`).
 */
export async function loadFitExport<F = CurveFit>(
	json: unknown,
	rebuild: (body: Record<string, unknown>) => F = fitFromJSON as unknown as (body: Record<string, unknown>) => F
): Promise<{ doc: FitExport; fit: F }> {
	const doc = await readFitExport(json);
	return { doc, fit: rebuild(doc.fit) };
}
