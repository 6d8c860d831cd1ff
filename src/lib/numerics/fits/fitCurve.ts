/**
 * The registry of curve methods: build a fit by method name, or rebuild one
 * from its fit file.
 */
import { akima } from './akima';
import { akimaModified } from './akima-modified';
import { cubicClamped } from './cubic-clamped';
import { cubicNatural } from './cubic-natural';
import { cubicNotAKnot } from './cubic-not-a-knot';
import { readFitFileHeader } from './fitFile';
import { FitError } from './FitError';
import { linear } from './linear';
import { localCubic } from './local-cubic';
import { localQuadratic } from './local-quadratic';
import { pchip } from './pchip';
import { PiecewisePolynomial } from './PiecewisePolynomial';
import { BarycentricPolynomial, polynomialGlobal } from './polynomial-global';
import { ScaledPolynomial, polynomialLeastSquares } from './polynomial-least-squares';
import { smoothingSpline } from './smoothing-spline';
import { softenedLinear } from './softened-linear';
import { isSurfaceFitFile } from './surfaceFile';
import type { Continuity, CurveFit, CurveFitOptions, CurveMethod } from './types';

export type CurveBuilder = (x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions) => CurveFit;

export interface CurveMethodInfo {
	build: CurveBuilder;
	/** the class the method guarantees */
	continuity: Continuity;
	/** fewest distinct points (smoothing-spline: 5 with GCV, 3 at fixed λ; least squares: degree + 1) */
	minPoints: number;
	/** interpolates every data point */
	interpolates: boolean;
}

export const curveMethods: Readonly<Record<CurveMethod, CurveMethodInfo>> = Object.freeze({
	linear: { build: linear, continuity: 'C0', minPoints: 2, interpolates: true },
	'cubic-natural': { build: cubicNatural, continuity: 'C2', minPoints: 2, interpolates: true },
	'cubic-not-a-knot': { build: cubicNotAKnot, continuity: 'C2', minPoints: 2, interpolates: true },
	'cubic-clamped': { build: cubicClamped, continuity: 'C2', minPoints: 2, interpolates: true },
	akima: { build: akima, continuity: 'C1', minPoints: 3, interpolates: true },
	'akima-modified': { build: akimaModified, continuity: 'C1', minPoints: 3, interpolates: true },
	pchip: { build: pchip, continuity: 'C1', minPoints: 2, interpolates: true },
	'local-quadratic': { build: localQuadratic, continuity: 'C0', minPoints: 3, interpolates: true },
	'local-cubic': { build: localCubic, continuity: 'C0', minPoints: 4, interpolates: true },
	'polynomial-global': { build: polynomialGlobal, continuity: 'Cinf', minPoints: 2, interpolates: true },
	'polynomial-least-squares': { build: polynomialLeastSquares, continuity: 'Cinf', minPoints: 2, interpolates: false },
	'smoothing-spline': { build: smoothingSpline, continuity: 'C2', minPoints: 5, interpolates: false },
	'softened-linear': { build: softenedLinear, continuity: 'C1', minPoints: 2, interpolates: false }
});

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
