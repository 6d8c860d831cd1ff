/**
 * The registry of curve methods: build a fit by method name, or rebuild one
 * from its fit file.
 */
import { akima } from './akima';
import { akimaModified } from './akimaModified';
import { cubicClamped } from './cubicClamped';
import { cubicNatural } from './cubicNatural';
import { cubicNotAKnot } from './cubicNotAKnot';
import { readFitFileHeader } from './fitFile';
import { FitError } from './fitError';
import { linear } from './linear';
import { localCubic } from './localCubic';
import { localQuadratic } from './localQuadratic';
import { pchip } from './pchip';
import { PiecewisePolynomial } from './piecewisePolynomial';
import { BarycentricPolynomial, polynomialGlobal } from './polynomialGlobal';
import { ScaledPolynomial, polynomialLeastSquares } from './polynomialLeastSquares';
import { smoothingSpline } from './smoothingSpline';
import { softenedLinear } from './softenedLinear';
import { isSurfaceFitFile } from './surfaceFile';
import { CURVE_METHOD_CATALOGUE, type CurveMethodEntry } from '../../domain/methods';
import type { CurveFit, CurveFitOptions, CurveMethod } from './types';

export type CurveBuilder = (x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions) => CurveFit;

export interface CurveMethodInfo extends Pick<CurveMethodEntry, 'continuity' | 'minPoints' | 'interpolates'> {
	build: CurveBuilder;
}

const BUILDERS: Readonly<Record<CurveMethod, CurveBuilder>> = {
	linear,
	'cubic-natural': cubicNatural,
	'cubic-not-a-knot': cubicNotAKnot,
	'cubic-clamped': cubicClamped,
	akima,
	'akima-modified': akimaModified,
	pchip,
	'local-quadratic': localQuadratic,
	'local-cubic': localCubic,
	'polynomial-global': polynomialGlobal,
	'polynomial-least-squares': polynomialLeastSquares,
	'smoothing-spline': smoothingSpline,
	'softened-linear': softenedLinear
};

/** Each method's builder with its stated continuity, minimum points and interpolation (from the catalogue). */
export const curveMethods: Readonly<Record<CurveMethod, CurveMethodInfo>> = Object.freeze(
	Object.fromEntries(
		(Object.keys(BUILDERS) as CurveMethod[]).map((m) => {
			const { continuity, minPoints, interpolates } = CURVE_METHOD_CATALOGUE[m];
			return [m, { build: BUILDERS[m], continuity, minPoints, interpolates }];
		})
	) as Record<CurveMethod, CurveMethodInfo>
);

export function isCurveMethod(method: unknown): method is CurveMethod {
	return typeof method === 'string' && Object.prototype.hasOwnProperty.call(curveMethods, method);
}

/** Fit y(x) with a named method. Throws FitError on bad input. */
export function fitCurve(method: CurveMethod, x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): CurveFit {
	if (!isCurveMethod(method)) throw new FitError('unknown-method', `unknown curve method ${JSON.stringify(method)}`);
	return curveMethods[method].build(x, y, options);
}

/** Rebuild a fit, bit for bit, from its fit file (the object or its JSON text). */
export function fitFromJSON(json: unknown): CurveFit {
	const parsed = typeof json === 'string' ? safeParse(json) : json;
	if (isSurfaceFitFile(parsed)) throw new FitError('bad-fit-file', 'fit file: this is a surface fit (several inputs); read it with surfaceFromJSON');
	const h = readFitFileHeader(parsed);
	switch (h.representation) {
		case 'piecewise-polynomial':
			return PiecewisePolynomial.fromJSON(parsed);
		case 'barycentric':
			return BarycentricPolynomial.fromJSON(parsed);
		case 'polynomial':
			return ScaledPolynomial.fromJSON(parsed);
		default:
			throw new FitError('bad-fit-file', `fit file: unknown representation ${JSON.stringify(h.representation)}`);
	}
}

function safeParse(text: string): unknown {
	try {
		return JSON.parse(text);
	} catch {
		throw new FitError('bad-fit-file', 'fit file: not valid JSON');
	}
}
