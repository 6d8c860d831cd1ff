/**
 * Fit work for tables of two or more inputs (grids and scattered points), run
 * on an offload thread like the curve work in fitWork.ts: build the fits a
 * study launch needs, as fit files. Answers plain data and never throws for a
 * user's mistake.
 */
import { classifyTable } from '../../numerics/fits/classifyTable';
import { FitError } from '../../numerics/fits/fitError';
import { fitGrid, isGridMethod } from '../../numerics/fits/fitGrid';
import { fitScatter, isScatterMethod } from '../../numerics/fits/radialBasis';
import type { SurfaceFit, SurfaceFitOptions, SurfaceMethod } from '../../numerics/fits/surfaceTypes';
import type { FitProblem } from './fitWork';

/** Most points a scattered (RBF) fit of a study takes: its dense solve grows as n³. */
export const SCATTER_MAX_POINTS = 3000;
/** Most nodes a grid fit of a study takes. */
export const GRID_MAX_NODES = 250_000;

export type SurfaceBuildTask = {
	kind: 'build-surface';
	/** one column per input, rows in the table's order */
	inputs: Float64Array[];
	/** the output columns the fits need, by name */
	columns: Record<string, Float64Array>;
	fits: { method: SurfaceMethod; options: SurfaceFitOptions; outputs: string[] }[];
};

/** Per study fit: the fit files (JSON) of each output in order, or the first problem. */
export type SurfaceBuildResult = { ok: true; fits: string[][] } | { ok: false; index: number; output: string; problem: FitProblem };

/** The refusal message for `method` on a table of `rows` rows, or null. */
export function surfaceSizeProblem(method: SurfaceMethod, rows: number): string | null {
	if (isScatterMethod(method) && rows > SCATTER_MAX_POINTS) {
		return `${method} takes at most ${SCATTER_MAX_POINTS.toLocaleString('en-US')} points in a study and this table has ${rows.toLocaleString('en-US')}: its dense solve grows with the cube of the points; thin the table or use a grid fit`;
	}
	if (isGridMethod(method) && rows > GRID_MAX_NODES) return `${method} takes at most ${GRID_MAX_NODES.toLocaleString('en-US')} grid points in a study and this table has ${rows.toLocaleString('en-US')}`;
	return null;
}

/** Rows of the table as points (one array of inputs per row). */
export function rowsOf(inputs: readonly Float64Array[]): Float64Array[] {
	const n = inputs[0]?.length ?? 0;
	return Array.from({ length: n }, (_, r) => Float64Array.from(inputs, (col) => col[r]));
}

/**
 * One output of the table fitted by one surface method. A grid method needs
 * the rows to form a full grid (any row order: the axes are the sorted
 * distinct values); an RBF takes the rows as scattered points.
 */
export function fitSurfaceTable(method: SurfaceMethod, inputs: readonly Float64Array[], y: Float64Array, options: SurfaceFitOptions, rows = rowsOf(inputs)): SurfaceFit {
	if (isScatterMethod(method)) return fitScatter(method, rows, y, options);
	if (!isGridMethod(method)) throw new FitError('unknown-method', `unknown surface method ${JSON.stringify(method)}`);
	const shape = classifyTable(rows);
	if (shape.kind !== 'grid') throw new FitError('shape-mismatch', `${method} needs the inputs on a full grid: ${shape.reason}; use a scattered fit (rbf-*)`);
	const values = new Float64Array(shape.rowOfNode.length);
	for (let node = 0; node < values.length; node++) values[node] = y[shape.rowOfNode[node]];
	return fitGrid(method, shape.axes, values, options);
}

export function buildSurfaceFits(task: SurfaceBuildTask): SurfaceBuildResult {
	const rows = rowsOf(task.inputs);
	const out: string[][] = [];
	for (let i = 0; i < task.fits.length; i++) {
		const spec = task.fits[i];
		const tooBig = surfaceSizeProblem(spec.method, rows.length);
		if (tooBig) return { ok: false, index: i, output: spec.outputs[0], problem: { kind: 'size', message: tooBig } };
		const files: string[] = [];
		for (const output of spec.outputs) {
			try {
				files.push(JSON.stringify(fitSurfaceTable(spec.method, task.inputs, task.columns[output], spec.options, rows).toJSON()));
			} catch (e) {
				if (e instanceof FitError) return { ok: false, index: i, output, problem: { kind: 'fit', code: e.code, message: e.message } };
				throw e;
			}
		}
		out.push(files);
	}
	return { ok: true, fits: out };
}
