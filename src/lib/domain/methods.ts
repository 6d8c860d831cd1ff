/**
 * The method catalogue: each curve method's and optimizer's human label and
 * one-line note (our own words), and each curve method's stated continuity,
 * minimum points and options with their form fields: the one place the numerics
 * registry, the fit preview, the study form, pages and the scorecard read them from. Plain TypeScript, relative imports only.
 */
import type { Continuity, CurveMethod } from '../numerics/fits/types';
import type { SurfaceMethod } from '../numerics/fits/surfaceTypes';
import type { OptimizerName } from '../numerics/optimize/types';

interface MethodEntry {
	label: string;
	note: string;
}

/** An option a curve method takes besides `extrapolation` (the API's name for it). */
export type CurveOption = 'degree' | 'lambda' | 'width' | 'slopes';

/** One field of the new-study form for a method's option. */
export interface FormField {
	field: string;
	label: string;
	placeholder: string;
}

export interface CurveMethodEntry extends MethodEntry {
	/** the class the method guarantees */
	continuity: Continuity;
	/** fewest distinct points (smoothing-spline: 5 with GCV, 3 at fixed λ; least squares: degree + 1) */
	minPoints: number;
	/** passes through every data point */
	interpolates: boolean;
	/** the options it takes besides `extrapolation`; `required` ones must be given */
	options: readonly CurveOption[];
	required?: readonly CurveOption[];
	/** how the new-study form asks for those options */
	formFields?: readonly FormField[];
}

export const CURVE_METHOD_CATALOGUE: Readonly<Record<CurveMethod, CurveMethodEntry>> = {
	linear: { label: 'Piecewise linear', note: 'straight lines between points; slope jumps at every point', continuity: 'C0', minPoints: 2, interpolates: true, options: [] },
	'cubic-natural': { label: 'Cubic spline, natural ends', note: 'cubic spline, zero curvature at both ends', continuity: 'C2', minPoints: 2, interpolates: true, options: [] },
	'cubic-not-a-knot': { label: 'Cubic spline, not-a-knot ends', note: 'cubic spline, one cubic over the first two and last two intervals', continuity: 'C2', minPoints: 2, interpolates: true, options: [] },
	'cubic-clamped': {
		label: 'Cubic spline, clamped ends',
		note: 'cubic spline with the end slopes you give',
		continuity: 'C2',
		minPoints: 2,
		interpolates: true,
		options: ['slopes'],
		required: ['slopes'],
		formFields: [
			{ field: 'slopeStart', label: 'f′ at first x', placeholder: '0' },
			{ field: 'slopeEnd', label: 'f′ at last x', placeholder: '0' }
		]
	},
	akima: { label: 'Akima (1970)', note: 'Akima (1970): local cubic that resists wiggles near outliers', continuity: 'C1', minPoints: 3, interpolates: true, options: [] },
	'akima-modified': { label: 'Akima, modified', note: 'modified Akima: avoids overshoot on flat stretches', continuity: 'C1', minPoints: 3, interpolates: true, options: [] },
	pchip: { label: 'PCHIP (Fritsch–Carlson, monotone)', note: 'monotone cubic (Fritsch–Carlson): keeps monotone data monotone', continuity: 'C1', minPoints: 2, interpolates: true, options: [] },
	'local-quadratic': { label: 'Local quadratic (Lagrange)', note: 'quadratics through neighbouring points, joined without slope matching', continuity: 'C0', minPoints: 3, interpolates: true, options: [] },
	'local-cubic': { label: 'Local cubic (Lagrange)', note: 'cubics through neighbouring points, joined without slope matching', continuity: 'C0', minPoints: 4, interpolates: true, options: [] },
	'polynomial-global': { label: 'Global interpolating polynomial', note: 'one polynomial through every point; rings between many points', continuity: 'Cinf', minPoints: 2, interpolates: true, options: [] },
	'polynomial-least-squares': {
		label: 'Least-squares polynomial',
		note: 'least-squares polynomial of a chosen degree (does not interpolate)',
		continuity: 'Cinf',
		minPoints: 2,
		interpolates: false,
		options: ['degree'],
		formFields: [{ field: 'degree', label: 'degree', placeholder: '3' }]
	},
	'smoothing-spline': {
		label: 'Smoothing spline (λ or GCV)',
		note: 'penalised spline, smoothing chosen by cross-validation (noisy data)',
		continuity: 'C2',
		minPoints: 5,
		interpolates: false,
		options: ['lambda'],
		formFields: [{ field: 'lambda', label: 'λ (blank: chosen by GCV)', placeholder: 'GCV' }]
	},
	'softened-linear': {
		label: 'Softened linear',
		note: 'the linear fit with each kink rounded over a small width',
		continuity: 'C1',
		minPoints: 2,
		interpolates: false,
		options: ['width'],
		formFields: [{ field: 'width', label: 'rounding width', placeholder: 'auto' }]
	}
};

export interface SurfaceMethodEntry extends MethodEntry {
	/** a full grid (tensor product) or scattered points */
	kind: 'grid' | 'scatter';
	/** the class the method guarantees (along every input) */
	continuity: Continuity;
	/** grid methods: fewest values along each input */
	minPoints: number;
}

export const SURFACE_METHOD_CATALOGUE: Readonly<Record<SurfaceMethod, SurfaceMethodEntry>> = {
	'grid-linear': { label: 'Multilinear', note: 'linear along each input between grid lines; slopes jump on every grid line', kind: 'grid', continuity: 'C0', minPoints: 2 },
	'grid-pchip': { label: 'PCHIP per input', note: 'monotone cubic slopes along each input, tensor Hermite cells', kind: 'grid', continuity: 'C1', minPoints: 2 },
	'grid-akima': { label: 'Akima per input', note: 'Akima slopes along each input, tensor Hermite cells', kind: 'grid', continuity: 'C1', minPoints: 3 },
	'grid-cubic-natural': { label: 'Natural cubic spline per input', note: 'tensor-product cubic spline, zero curvature at the ends of each input', kind: 'grid', continuity: 'C2', minPoints: 2 },
	'grid-cubic-not-a-knot': { label: 'Not-a-knot cubic spline per input', note: 'tensor-product cubic spline; exact for products of cubics', kind: 'grid', continuity: 'C2', minPoints: 2 },
	'rbf-thin-plate': { label: 'Thin-plate radial basis', note: 'thin-plate spline over scattered points with a linear tail', kind: 'scatter', continuity: 'C1', minPoints: 1 },
	'rbf-multiquadric': { label: 'Multiquadric radial basis', note: 'multiquadric basis over scattered points with a linear tail', kind: 'scatter', continuity: 'Cinf', minPoints: 1 },
	'rbf-gaussian': { label: 'Gaussian radial basis', note: 'Gaussian basis over scattered points with a linear tail', kind: 'scatter', continuity: 'Cinf', minPoints: 1 }
};

export const OPTIMIZER_CATALOGUE: Readonly<Record<OptimizerName, MethodEntry>> = {
	sqp: { label: 'SQP', note: 'SQP: bounds and constraints, quasi-Newton Hessian' },
	bfgs: { label: 'BFGS', note: 'BFGS with a Wolfe line search; bounds by projection' },
	'conjugate-gradient': { label: 'Conjugate gradient', note: 'nonlinear conjugate gradient (Polak–Ribière⁺)' },
	'steepest-descent': { label: 'Steepest descent', note: 'steepest descent with a line search' },
	'nelder-mead': { label: 'Nelder–Mead', note: 'Nelder–Mead simplex; uses no derivatives' },
	newton: { label: 'Newton', note: 'Newton steps from f′ and f″ (shows why C2 matters)' }
};

const has = (o: object, k: string) => Object.prototype.hasOwnProperty.call(o, k);

/** a curve or surface method's human label; an unknown id is shown as it is */
export const methodLabel = (id: string): string =>
	has(CURVE_METHOD_CATALOGUE, id) ? CURVE_METHOD_CATALOGUE[id as CurveMethod].label : has(SURFACE_METHOD_CATALOGUE, id) ? SURFACE_METHOD_CATALOGUE[id as SurfaceMethod].label : id;

/** a continuity class as people write it (C∞, not Cinf) */
export const continuityText = (c: Continuity | string | null | undefined): string => (c === 'Cinf' ? 'C∞' : (c ?? '—'));
