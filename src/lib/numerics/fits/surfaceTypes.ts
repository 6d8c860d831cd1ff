/**
 * The contract every fit of two or more inputs meets (grid and scattered
 * fits). Plain TypeScript like the curve fits; the same Continuity classes.
 */
import type { Continuity } from './types';

export type GridMethod = 'grid-linear' | 'grid-cubic-natural' | 'grid-cubic-not-a-knot' | 'grid-akima' | 'grid-pchip';
export type ScatterMethod = 'rbf-thin-plate' | 'rbf-multiquadric' | 'rbf-gaussian';
export type SurfaceMethod = GridMethod | ScatterMethod;

/** Outside the data box: 'refuse' (default) throws; 'extend' continues the edge cells' polynomials. */
export type SurfaceExtrapolation = 'refuse' | 'extend';

/**
 * How far the Hessian a fit returns is the true one:
 * - 'exact': f is C2 (or smoother) wherever it is evaluated, the Hessian is exact everywhere;
 * - 'piecewise': exact inside each grid cell; on a grid line where a second
 *   derivative jumps, the value returned is the one of the cell on the upper
 *   side (the true Hessian is not defined there) and `SurfaceJet.onLine` says so.
 */
export type HessianKind = 'exact' | 'piecewise';

/** Value, gradient and Hessian at one point, computed together. */
export interface SurfaceJet {
	f: number;
	/** ∂f/∂x_k, length d */
	grad: Float64Array;
	/** ∂²f/∂x_j∂x_k, d × d, row-major, symmetric */
	hess: Float64Array;
	/** true when the point lay outside the data box and 'extend' was applied */
	outside: boolean;
	/**
	 * For each input, the index of the interior grid line the point lies on
	 * (within the fit's line tolerance), or −1. Always −1 for scattered fits.
	 */
	onLine: Int32Array;
}

export interface SurfaceFitOptions {
	extrapolation?: SurfaceExtrapolation;
	/** rbf-*: smoothing ≥ 0 added to the kernel diagonal (0 = interpolate; default 0) */
	smoothing?: number;
	/**
	 * rbf-*: shape parameter ε of multiquadric and Gaussian kernels, in scaled (unit-range) inputs;
	 * default from the point spacing, 1/(0.815 × mean nearest-neighbour distance) (Hardy's rule); thin-plate: 1
	 */
	epsilon?: number;
	/** rbf-*: degree of the polynomial tail: −1 (none), 0 or 1 (default 1) */
	degree?: number;
	/** rbf-*: compute Rippa's leave-one-out residuals and the exact condition number (needs the inverse); default: up to 1000 points */
	leaveOneOut?: boolean;
}

export interface SurfaceStats {
	/** rbf-*: estimate of the 1-norm condition number of the solved system */
	condition?: number;
	/** rbf-*: leave-one-out residuals (Rippa's closed form), in the data's order */
	looResiduals?: Float64Array;
	/** rbf-* without smoothing: the largest |s(x_i) − y_i| over the data (0 up to rounding for a sound solve) */
	dataResidual?: number;
	/** rbf-*: RMS of looResiduals */
	looRms?: number;
}

export interface SurfaceFit {
	readonly method: SurfaceMethod;
	/** number of inputs d */
	readonly dimension: number;
	/** the class of f overall (the weakest over the inputs) */
	readonly continuity: Continuity;
	/** the class of f along each input (grid fits: per axis; scattered fits: the same for all) */
	readonly axisContinuity: readonly Continuity[];
	readonly hessian: HessianKind;
	readonly extrapolation: SurfaceExtrapolation;
	/** per input [lowest, highest] of the data */
	readonly domain: readonly (readonly [number, number])[];
	/** value, gradient, Hessian; throws FitError('outside-domain') under 'refuse' */
	evaluate(x: ArrayLike<number>): SurfaceJet;
	/** value only */
	value(x: ArrayLike<number>): number;
	/** value, with the gradient written to `grad` */
	valueGradient(x: ArrayLike<number>, grad: Float64Array): number;
	/**
	 * The absolute rounding level of a value inside the data box, where it
	 * exceeds a few units in the last place of |f| (a sum of large terms that
	 * cancel: the radial-basis fits). Absent where a few ulps of |f| is right
	 * (a grid cell's value is a short sum of nearby table values).
	 */
	valueRounding?(): number;
	readonly notes: readonly string[];
	readonly options: Readonly<SurfaceFitOptions>;
	readonly stats: Readonly<SurfaceStats>;
	toJSON(): unknown;
}
