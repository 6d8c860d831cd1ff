/**
 * The fit file, version 1 — our own format for an exported curve fit.
 *
 *   {
 *     "format": "kinkless-fit",
 *     "version": 1,
 *     "method": "pchip",                        // a CurveMethod
 *     "continuity": "C1",                       // declared class: C0 | C1 | C2 | Cinf
 *     "extrapolation": "refuse",                // refuse | hold | linear | extend
 *     "domain": [x0, xN],                       // the data's x range (inclusive)
 *     "options": { ... },                       // CurveFitOptions used to build it
 *     "representation": "piecewise-polynomial" | "barycentric" | "polynomial",
 *     "knots": [...],                           // piece boundaries, increasing (empty for global forms)
 *
 *     // representation "piecewise-polynomial":
 *     "degree": 3,                              // 1, 2 or 3
 *     "coefficients": [...],                    // (degree + 1) per piece, piece after piece:
 *                                               // f(x) = Σ_k c[i·(d+1)+k]·(x − knots[i])^k on [knots[i], knots[i+1]]
 *     // representation "barycentric" (polynomial through all nodes, second barycentric form):
 *     "nodes": [...], "values": [...], "weights": [...],
 *     "slopes": [...], "curvatures": [...],    // p′ and p″ at the nodes (interpolated the same way)
 *     // representation "polynomial" (one polynomial in t = (x − center)/scale):
 *     "center": c, "scale": s, "coefficients": [...]   // ascending powers of t
 *
 *     "stats": { "lambda": …, "edf": …, "leverage": [...], … },  // optional, method-specific
 *     "notes": ["…"]
 *   }
 *
 * Numbers are JSON numbers written by ECMAScript's Number → String conversion,
 * which emits the shortest decimal that reads back to the same double (any
 * correctly rounded parser — JSON.parse, Python's float — recovers every bit).
 * The few doubles JSON cannot carry are written as strings: "-0", "NaN",
 * "Infinity", "-Infinity". So toJSON → JSON.stringify → JSON.parse → fromJSON
 * is bit-exact.
 */
import { FitError } from './fitError';
import type { Continuity, CurveFitOptions, CurveMethod, Extrapolation, FitStats } from './types';

export const FIT_FILE_FORMAT = 'kinkless-fit';
export const FIT_FILE_VERSION = 1;

type EncodedNumber = number | '-0' | 'NaN' | 'Infinity' | '-Infinity';

export interface FitFileBase {
	format: typeof FIT_FILE_FORMAT;
	version: typeof FIT_FILE_VERSION;
	method: CurveMethod;
	continuity: Continuity;
	extrapolation: Extrapolation;
	domain: [EncodedNumber, EncodedNumber];
	options: Record<string, unknown>;
	representation: 'piecewise-polynomial' | 'barycentric' | 'polynomial';
	knots: EncodedNumber[];
	stats?: Record<string, unknown>;
	notes: string[];
	[key: string]: unknown;
}

export function encodeNumber(v: number): EncodedNumber {
	if (Number.isFinite(v)) return Object.is(v, -0) ? '-0' : v;
	if (Number.isNaN(v)) return 'NaN';
	return v > 0 ? 'Infinity' : '-Infinity';
}

export function decodeNumber(v: unknown, what = 'number'): number {
	if (typeof v === 'number') return v;
	switch (v) {
		case '-0':
			return -0;
		case 'NaN':
			return NaN;
		case 'Infinity':
			return Infinity;
		case '-Infinity':
			return -Infinity;
	}
	throw new FitError('bad-fit-file', `fit file: ${what} is not a number`);
}

export function encodeArray(a: ArrayLike<number>): EncodedNumber[] {
	const out: EncodedNumber[] = new Array(a.length);
	for (let i = 0; i < a.length; i++) out[i] = encodeNumber(a[i]);
	return out;
}

export function decodeArray(v: unknown, what: string): Float64Array {
	if (!Array.isArray(v)) throw new FitError('bad-fit-file', `fit file: ${what} must be an array`);
	const out = new Float64Array(v.length);
	for (let i = 0; i < v.length; i++) out[i] = decodeNumber(v[i], `${what}[${i}]`);
	return out;
}

/** Options → JSON-safe object (numbers encoded, weights as an array). */
export function encodeOptions(o: Readonly<CurveFitOptions>): Record<string, unknown> {
	const out: Record<string, unknown> = {};
	for (const [k, v] of Object.entries(o)) {
		if (v === undefined) continue;
		if (typeof v === 'number') out[k] = encodeNumber(v);
		else if (Array.isArray(v) || ArrayBuffer.isView(v)) out[k] = encodeArray(v as ArrayLike<number>);
		else out[k] = v;
	}
	return out;
}

export function decodeOptions(v: unknown): CurveFitOptions {
	if (v == null || typeof v !== 'object') throw new FitError('bad-fit-file', 'fit file: options must be an object');
	const o = v as Record<string, unknown>;
	const out: Record<string, unknown> = {};
	for (const [k, val] of Object.entries(o)) {
		if (k === 'slopes' || k === 'weights') out[k] = Array.from(decodeArray(val, `options.${k}`));
		else if (k === 'degree' || k === 'lambda' || k === 'width') out[k] = decodeNumber(val, `options.${k}`);
		else out[k] = val;
	}
	return out as CurveFitOptions;
}

export function encodeStats(s: Readonly<FitStats>): Record<string, unknown> {
	const out: Record<string, unknown> = {};
	for (const [k, v] of Object.entries(s)) {
		if (v === undefined) continue;
		if (typeof v === 'number') out[k] = encodeNumber(v);
		else if (ArrayBuffer.isView(v)) out[k] = encodeArray(v as Float64Array);
		else out[k] = v;
	}
	return out;
}

export function decodeStats(v: unknown): FitStats {
	if (v == null) return {};
	if (typeof v !== 'object') throw new FitError('bad-fit-file', 'fit file: stats must be an object');
	const out: Record<string, unknown> = {};
	for (const [k, val] of Object.entries(v as Record<string, unknown>)) {
		if (k === 'leverage') out[k] = decodeArray(val, 'stats.leverage');
		else if (typeof val === 'boolean') out[k] = val;
		else out[k] = decodeNumber(val, `stats.${k}`);
	}
	return out as FitStats;
}

const METHODS: readonly string[] = [
	'linear',
	'cubic-natural',
	'cubic-not-a-knot',
	'cubic-clamped',
	'akima',
	'akima-modified',
	'pchip',
	'local-quadratic',
	'local-cubic',
	'polynomial-global',
	'polynomial-least-squares',
	'smoothing-spline',
	'softened-linear'
];
const CONTINUITY: readonly string[] = ['C0', 'C1', 'C2', 'Cinf'];
const EXTRAPOLATION: readonly string[] = ['refuse', 'hold', 'linear', 'extend'];

/**
 * A fit file or export document as an object: parsed when given as text. Every reader
 * (curve and surface fit files, export documents) starts here, with the same messages.
 */
export function fitFileObject(json: unknown, expected = 'an object'): Record<string, unknown> {
	let v = json;
	if (typeof v === 'string') {
		try {
			v = JSON.parse(v);
		} catch {
			throw new FitError('bad-fit-file', 'fit file: not valid JSON');
		}
	}
	if (v == null || typeof v !== 'object' || Array.isArray(v)) throw new FitError('bad-fit-file', `fit file: expected ${expected}`);
	return v as Record<string, unknown>;
}

/** Parse (if a string) and check the common header of a fit file. */
export function readFitFileHeader(json: unknown): FitFileBase {
	const f = fitFileObject(json);
	if (f.format !== FIT_FILE_FORMAT) throw new FitError('bad-fit-file', `fit file: format must be "${FIT_FILE_FORMAT}"`);
	if (f.version !== FIT_FILE_VERSION) {
		throw new FitError('bad-fit-file', `fit file: version ${String(f.version)} is not supported (this reader knows version ${FIT_FILE_VERSION})`);
	}
	if (typeof f.method !== 'string' || !METHODS.includes(f.method)) throw new FitError('bad-fit-file', 'fit file: unknown method');
	if (typeof f.continuity !== 'string' || !CONTINUITY.includes(f.continuity)) throw new FitError('bad-fit-file', 'fit file: bad continuity');
	if (typeof f.extrapolation !== 'string' || !EXTRAPOLATION.includes(f.extrapolation)) {
		throw new FitError('bad-fit-file', 'fit file: bad extrapolation rule');
	}
	if (!Array.isArray(f.domain) || f.domain.length !== 2) throw new FitError('bad-fit-file', 'fit file: domain must be [lo, hi]');
	if (!Array.isArray(f.notes)) throw new FitError('bad-fit-file', 'fit file: notes must be an array');
	return f as unknown as FitFileBase;
}

/** The fields every fit file starts with: format, version, method, continuity and extrapolation rule. */
export function fitFileEnvelope<M extends string, C extends string, E extends string>(fit: { method: M; continuity: C; extrapolation: E }): { format: typeof FIT_FILE_FORMAT; version: typeof FIT_FILE_VERSION; method: M; continuity: C; extrapolation: E } {
	return { format: FIT_FILE_FORMAT, version: FIT_FILE_VERSION, method: fit.method, continuity: fit.continuity, extrapolation: fit.extrapolation };
}
