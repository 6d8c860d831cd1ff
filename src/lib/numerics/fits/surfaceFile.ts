/**
 * Reading a surface fit back from its fit file (the same envelope as a curve's,
 * ./fitFile.ts: "format": "kinkless-fit", "version": 1), for both surface
 * representations:
 *
 *   "representation": "tensor-hermite"  — grid fits (TensorGrid.toJSON):
 *       "axes": [[…], …]   grid values per input, increasing;
 *       "cubic": true|false, "data": […]  per node 2^d slots ∂^S f (cubic) or 1 (multilinear),
 *                                          nodes row-major, last input fastest;
 *   "representation": "radial-basis"    — scattered fits (RadialBasis.toJSON):
 *       "lower", "span": per input, u = (x − lower)/span;
 *       "centres": n·d scaled points, "coefficients": n, "tail": 0, 1 or d + 1;
 *       "options": { "epsilon", "smoothing", "degree" }.
 *
 * The reader checks the envelope first (format, version, method, representation),
 * each with its own message, then the body's shapes; toJSON → JSON text →
 * surfaceFromJSON is bit-exact (numbers as in ./fitFile.ts).
 */
import { FIT_FILE_FORMAT, FIT_FILE_VERSION, fitFileObject } from './fitFile';
import { FitError } from './fitError';
import { isGridMethod } from './fitGrid';
import { RadialBasis, isScatterMethod } from './radialBasis';
import { TensorGrid } from './tensorGrid';
import type { SurfaceFit } from './surfaceTypes';

/** The fit-file representations of surface fits. */
export const SURFACE_REPRESENTATIONS: readonly string[] = ['tensor-hermite', 'radial-basis'];

/** True when a parsed fit file body is a surface fit (so `surfaceFromJSON` reads it, not `fitFromJSON`). */
export function isSurfaceFitFile(json: unknown): boolean {
	return json != null && typeof json === 'object' && SURFACE_REPRESENTATIONS.includes(String((json as Record<string, unknown>).representation));
}

/** Rebuild a surface fit, bit for bit, from its fit file (the object or its JSON text). */
export function surfaceFromJSON(json: unknown): SurfaceFit {
	const f = fitFileObject(json);
	if (f.format !== FIT_FILE_FORMAT) throw new FitError('bad-fit-file', `fit file: format must be "${FIT_FILE_FORMAT}"`);
	if (f.version !== FIT_FILE_VERSION) {
		throw new FitError('bad-fit-file', `fit file: version ${JSON.stringify(f.version)} is not supported (this reader knows version ${FIT_FILE_VERSION})`);
	}
	switch (f.representation) {
		case 'tensor-hermite':
			if (!isGridMethod(f.method)) throw new FitError('bad-fit-file', `fit file: unknown grid method ${JSON.stringify(f.method)}`);
			if (f.extrapolation !== 'refuse' && f.extrapolation !== 'extend') {
				throw new FitError('bad-fit-file', `fit file: extrapolation must be "refuse" or "extend" for a grid fit, got ${JSON.stringify(f.extrapolation)}`);
			}
			if (f.cubic !== (f.method !== 'grid-linear')) throw new FitError('bad-fit-file', `fit file: "cubic" does not match method ${f.method}`);
			try {
				return TensorGrid.fromJSON(f);
			} catch (e) {
				// a shape the constructor refuses is a damaged file here
				if (e instanceof FitError && e.code !== 'bad-fit-file') throw new FitError('bad-fit-file', `fit file: ${e.message}`);
				throw e;
			}
		case 'radial-basis':
			if (!isScatterMethod(f.method)) throw new FitError('bad-fit-file', `fit file: unknown scattered method ${JSON.stringify(f.method)}`);
			return RadialBasis.fromJSON(f);
		default:
			throw new FitError('bad-fit-file', `fit file: representation ${JSON.stringify(f.representation)} is not a surface fit (expected one of ${SURFACE_REPRESENTATIONS.join(', ')})`);
	}
}
