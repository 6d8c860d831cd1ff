/**
 * The method catalogue: each curve method's and optimizer's human label and
 * one-line note (our own words), the one place pages, forms and the scorecard
 * read them from. Plain TypeScript, relative imports only.
 */
import type { Continuity, CurveMethod } from '../numerics/fits/types';
import type { OptimizerName } from '../numerics/optimize/types';

export interface MethodEntry {
	label: string;
	note: string;
}

export const CURVE_METHOD_CATALOGUE: Readonly<Record<CurveMethod, MethodEntry>> = {
	linear: { label: 'Piecewise linear', note: 'straight lines between points; slope jumps at every point' },
	'cubic-natural': { label: 'Cubic spline, natural ends', note: 'cubic spline, zero curvature at both ends' },
	'cubic-not-a-knot': { label: 'Cubic spline, not-a-knot ends', note: 'cubic spline, one cubic over the first two and last two intervals' },
	'cubic-clamped': { label: 'Cubic spline, clamped ends', note: 'cubic spline with the end slopes you give' },
	akima: { label: 'Akima (1970)', note: 'Akima (1970): local cubic that resists wiggles near outliers' },
	'akima-modified': { label: 'Akima, modified', note: 'modified Akima: avoids overshoot on flat stretches' },
	pchip: { label: 'PCHIP (Fritsch–Carlson, monotone)', note: 'monotone cubic (Fritsch–Carlson): keeps monotone data monotone' },
	'local-quadratic': { label: 'Local quadratic (Lagrange)', note: 'quadratics through neighbouring points, joined without slope matching' },
	'local-cubic': { label: 'Local cubic (Lagrange)', note: 'cubics through neighbouring points, joined without slope matching' },
	'polynomial-global': { label: 'Global interpolating polynomial', note: 'one polynomial through every point; rings between many points' },
	'polynomial-least-squares': { label: 'Least-squares polynomial', note: 'least-squares polynomial of a chosen degree (does not interpolate)' },
	'smoothing-spline': { label: 'Smoothing spline (λ or GCV)', note: 'penalised spline, smoothing chosen by cross-validation (noisy data)' },
	'softened-linear': { label: 'Softened linear', note: 'the linear fit with each kink rounded over a small width' }
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

/** a curve method's human label; an unknown id is shown as it is */
export const methodLabel = (id: string): string => (has(CURVE_METHOD_CATALOGUE, id) ? CURVE_METHOD_CATALOGUE[id as CurveMethod].label : id);

/** a continuity class as people write it (C∞, not Cinf) */
export const continuityText = (c: Continuity | string | null | undefined): string => (c === 'Cinf' ? 'C∞' : (c ?? '—'));
