// One line about each fit and optimizer, for the study pages (our own words).
export const FIT_NOTES: Record<string, string> = {
	linear: 'straight lines between points; slope jumps at every point',
	'cubic-natural': 'cubic spline, zero curvature at both ends',
	'cubic-not-a-knot': 'cubic spline, one cubic over the first two and last two intervals',
	'cubic-clamped': 'cubic spline with the end slopes you give',
	akima: 'Akima (1970): local cubic that resists wiggles near outliers',
	'akima-modified': 'modified Akima: avoids overshoot on flat stretches',
	pchip: 'monotone cubic (Fritsch–Carlson): keeps monotone data monotone',
	'local-quadratic': 'quadratics through neighbouring points, joined without slope matching',
	'local-cubic': 'cubics through neighbouring points, joined without slope matching',
	'polynomial-global': 'one polynomial through every point; rings between many points',
	'polynomial-least-squares': 'least-squares polynomial of a chosen degree (does not interpolate)',
	'smoothing-spline': 'penalised spline, smoothing chosen by cross-validation (noisy data)',
	'softened-linear': 'the linear fit with each kink rounded over a small width'
};

export const OPTIMIZER_NOTES: Record<string, string> = {
	sqp: 'SQP: bounds and constraints, quasi-Newton Hessian',
	bfgs: 'BFGS with a Wolfe line search; bounds by projection',
	'conjugate-gradient': 'nonlinear conjugate gradient (Polak–Ribière)',
	'steepest-descent': 'steepest descent with a line search',
	'nelder-mead': 'Nelder–Mead simplex; uses no derivatives',
	newton: 'Newton steps from f′ and f″ (shows why C2 matters)'
};

export const OUTCOME_NOTES: Record<string, string> = {
	converged: 'the slope fell to the gradient tolerance (relative to the slope at the start) and the point passed the second-order check',
	stalled: 'stopped making progress before the tolerance',
	'iteration-limit': 'ran out of iterations, evaluations or time',
	'left-domain': 'asked for a point outside the data under the refuse rule',
	diverged: 'ran off to infinity, reached a value that is not a finite number, or broke down'
};

/** A number for a table cell: a few significant digits, no trailing zeros. */
export function num(v: number | null | undefined, digits = 4): string {
	if (v === null || v === undefined || !Number.isFinite(v)) return '—';
	if (v === 0) return '0';
	const a = Math.abs(v);
	if (a >= 1e6 || a < 1e-4) return v.toExponential(Math.max(0, digits - 1)).replace(/\.?0+e/, 'e');
	return String(Number(v.toPrecision(digits)));
}

export const pct = (v: number) => `${Math.round(v * 100)}%`;
