/**
 * The registry of grid methods (2–4 inputs on a full tensor grid): build a
 * fit by method name, or rebuild one from its fit file.
 */
import { akimaSlopesAcross, akimaSlopesInto } from './akimaSlopes';
import { SplineLineSolver } from './cubicSplineSlopes';
import { FitError } from './fitError';
import { pchipSlopesAcross, pchipSlopesInto } from './pchip';
import { prepareGrid } from './prepareGrid';
import { TensorGrid, fillHermiteSlots, type LineSlopeRule } from './tensorGrid';
import type { GridMethod, SurfaceFitOptions } from './surfaceTypes';
import type { Continuity } from './types';
import { SURFACE_METHOD_CATALOGUE } from '../../domain/methods';

export type GridBuilder = (axes: readonly ArrayLike<number>[], values: ArrayLike<number>, options?: SurfaceFitOptions) => TensorGrid;

export interface GridMethodInfo {
	build: GridBuilder;
	/** the class along every input */
	continuity: Continuity;
	/** fewest grid values per input */
	minPoints: number;
}

function splineRule(kind: 'natural' | 'not-a-knot'): LineSlopeRule {
	// one factored system per axis (every line of an input shares it)
	const solvers = new Map<Float64Array, SplineLineSolver>();
	const solverFor = (x: Float64Array) => {
		let solver = solvers.get(x);
		if (!solver) solvers.set(x, (solver = new SplineLineSolver(x, kind)));
		return solver;
	};
	const rule: LineSlopeRule = (x, y, yo, yStep, out, oo, os, oStep, count) => solverFor(x).solveLines(y, yo, yStep, out, oo, os, oStep, count);
	rule.across = (x, data, base, iStride, lineStride, count, from, to) => solverFor(x).solveAcross(data, base, iStride, lineStride, count, from, to);
	return rule;
}

// the side-by-side Akima sweep's secants and tie thresholds: one scratch for every build (builds run one
// at a time on a thread), kept so that a build does not fault in fresh pages for it
let akimaWork = new Float64Array(0);
let akimaCuts = new Float64Array(0);

function akimaRule(): LineSlopeRule {
	let buf = new Float64Array(0);
	const rule: LineSlopeRule = (x, y, yo, yStep, out, oo, os, oStep, count) => {
		const n = x.length;
		if (buf.length < 2 * n) buf = new Float64Array(2 * n);
		for (let l = 0; l < count; l++) {
			akimaSlopesInto(x, y, false, buf, 2, 0, 1, yo + l * yStep);
			const o = oo + l * oStep;
			for (let i = 0; i < n; i++) out[o + os * i] = buf[2 * i];
		}
	};
	rule.across = (x, data, base, iStride, lineStride, count, from, to) => {
		const need = (2 * x.length + 5) * count;
		if (akimaWork.length < need) akimaWork = new Float64Array(need);
		if (akimaCuts.length < count) akimaCuts = new Float64Array(count);
		akimaSlopesAcross(x, data, base, iStride, lineStride, count, from, to, akimaWork, akimaCuts);
		return true;
	};
	return rule;
}

function pchipRule(): LineSlopeRule {
	const rule: LineSlopeRule = (x, y, yo, yStep, out, oo, os, oStep, count) => {
		for (let l = 0; l < count; l++) pchipSlopesInto(x, y, out, os, oo + l * oStep, yo + l * yStep);
	};
	rule.across = (x, data, base, iStride, lineStride, count, from, to) => {
		pchipSlopesAcross(x, data, base, iStride, lineStride, count, from, to);
		return true;
	};
	return rule;
}

function resolve(options: SurfaceFitOptions | undefined, label: string): SurfaceFitOptions {
	const ext = options?.extrapolation ?? 'refuse';
	if (ext !== 'refuse' && ext !== 'extend') throw new FitError('bad-option', `${label}: extrapolation must be 'refuse' or 'extend', got ${JSON.stringify(ext)}`);
	return { extrapolation: ext };
}

function cubicBuilder(method: GridMethod, rule: () => LineSlopeRule): GridBuilder {
	const { continuity, minPoints } = SURFACE_METHOD_CATALOGUE[method];
	return (axesIn, valuesIn, options) => {
		const opts = resolve(options, method);
		const g = prepareGrid(axesIn, valuesIn, method, minPoints);
		const slots = 1 << g.axes.length;
		const data = new Float64Array(g.values.length * slots);
		for (let i = 0; i < g.values.length; i++) data[i * slots] = g.values[i];
		fillHermiteSlots(g.axes, data, rule());
		return new TensorGrid({ method, continuity, axes: g.axes, data, cubic: true, options: opts, notes: g.notes });
	};
}

/** Multilinear interpolation: C0, exact for functions linear in each input separately. */
export const gridLinear: GridBuilder = (axesIn, valuesIn, options) => {
	const opts = resolve(options, 'grid-linear');
	const { continuity, minPoints } = SURFACE_METHOD_CATALOGUE['grid-linear'];
	const g = prepareGrid(axesIn, valuesIn, 'grid-linear', minPoints);
	return new TensorGrid({ method: 'grid-linear', continuity, axes: g.axes, data: g.values, cubic: false, options: opts, notes: g.notes });
};
/**
 * Each cubic grid method's rule for the knot slopes along one input (a new
 * rule per build: rules keep per-axis scratch). Exported for the tests that
 * hold the side-by-side sweeps to the one-line passes.
 */
export const GRID_SLOPE_RULES: Readonly<Record<Exclude<GridMethod, 'grid-linear'>, () => LineSlopeRule>> = Object.freeze({
	'grid-cubic-natural': () => splineRule('natural'),
	'grid-cubic-not-a-knot': () => splineRule('not-a-knot'),
	'grid-akima': akimaRule,
	'grid-pchip': pchipRule
});

/** Tensor-product natural cubic spline (C2). */
export const gridCubicNatural = cubicBuilder('grid-cubic-natural', GRID_SLOPE_RULES['grid-cubic-natural']);
/** Tensor-product not-a-knot cubic spline (C2; exact for products of cubics). */
export const gridCubicNotAKnot = cubicBuilder('grid-cubic-not-a-knot', GRID_SLOPE_RULES['grid-cubic-not-a-knot']);
/** Akima's slopes along each input, tensor Hermite cells (C1). */
export const gridAkima = cubicBuilder('grid-akima', GRID_SLOPE_RULES['grid-akima']);
/** PCHIP slopes along each input, tensor Hermite cells (C1). */
export const gridPchip = cubicBuilder('grid-pchip', GRID_SLOPE_RULES['grid-pchip']);

const GRID_BUILDERS: Readonly<Record<GridMethod, GridBuilder>> = {
	'grid-linear': gridLinear,
	'grid-cubic-natural': gridCubicNatural,
	'grid-cubic-not-a-knot': gridCubicNotAKnot,
	'grid-akima': gridAkima,
	'grid-pchip': gridPchip
};

/** Each grid method's builder with its stated continuity and fewest values per input (from the catalogue). */
export const gridMethods: Readonly<Record<GridMethod, GridMethodInfo>> = Object.freeze(
	Object.fromEntries(
		(Object.keys(GRID_BUILDERS) as GridMethod[]).map((m) => {
			const { continuity, minPoints } = SURFACE_METHOD_CATALOGUE[m];
			return [m, { build: GRID_BUILDERS[m], continuity, minPoints }];
		})
	) as Record<GridMethod, GridMethodInfo>
);

export function isGridMethod(method: unknown): method is GridMethod {
	return typeof method === 'string' && Object.prototype.hasOwnProperty.call(gridMethods, method);
}

/**
 * Fit values on a full grid (row-major, last input fastest). Throws FitError
 * on bad input. A Float64Array of values on increasing axes is kept by
 * grid-linear without a copy: do not change it while the fit is in use.
 */
export function fitGrid(method: GridMethod, axes: readonly ArrayLike<number>[], values: ArrayLike<number>, options?: SurfaceFitOptions): TensorGrid {
	if (!isGridMethod(method)) throw new FitError('unknown-method', `unknown grid method ${JSON.stringify(method)}`);
	return gridMethods[method].build(axes, values, options);
}
