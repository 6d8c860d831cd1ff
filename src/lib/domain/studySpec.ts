/** What a study stores about its request (`studies.spec`), with defaults filled in. */
import type { SurfaceFitOptions } from '../numerics/fits/surfaceTypes';
import type { CurveFitOptions } from '../numerics/fits/types';
import type { OptimizeOptions, OptimizerName, ProblemKind } from '../numerics/optimize/types';
import type { ConstraintOp } from './problem';

export interface StudySpec {
	problem: {
		kind: ProblemKind;
		target?: number;
		/** one [lo, hi] per input; the data's range unless the request set them */
		bounds: [number, number][];
		boundsFromData: boolean;
		constraints: { output: string; op: ConstraintOp; value: number }[];
	};
	fits: { method: string; options: CurveFitOptions & SurfaceFitOptions }[];
	optimizers: { method: OptimizerName; options: OptimizeOptions }[];
	starts: { points: number[][] } | { grid: number } | { latinHypercube: number; seed: number };
	budgets: { maxIterations: number; maxEvaluations: number; maxMilliseconds: number };
	/** said at launch and shown on the study page (e.g. bounds reaching beyond the data); absent in older studies */
	warnings?: string[];
	dataset: {
		id: string;
		name: string;
		version: number;
		/** the first input (the only one of a curve) */
		input: { name: string; unit: string | null };
		/** every input, in the dataset's column order (studies launched before surfaces have none) */
		inputs?: { name: string; unit: string | null }[];
		shape?: 'curve' | 'grid' | 'scatter';
		output: { name: string; unit: string | null };
	};
}
