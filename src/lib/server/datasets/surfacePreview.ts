// The fit preview of a dataset of two or more inputs (grid or scatter): the
// request checked here, the work done on an offload thread
// (../offload/surfacePreview.ts). Bad requests are 422s naming the field.
import { z } from 'zod';
import type { FitErrorCode } from '../../numerics/fits';
import type { SurfaceMethod } from '../../numerics/fits/surfaceTypes';
import { SURFACE_METHOD_CATALOGUE } from '../../domain/methods';
import { fail4xx } from '../api';
import { onThread, outputColumn } from './fitPreview';
import type { FitProblem } from '../offload/fitWork';
import type { SurfacePreview, SurfacePreviewResult } from '../offload/surfacePreview';
import type { DatasetMeta } from './store';

export type { SurfacePreview } from '../offload/surfacePreview';

const SURFACE_METHODS = Object.keys(SURFACE_METHOD_CATALOGUE) as [SurfaceMethod, ...SurfaceMethod[]];
const isScatter = (m: SurfaceMethod) => SURFACE_METHOD_CATALOGUE[m].kind === 'scatter';
export const MAP_RESOLUTION = { min: 5, max: 81, default: 41 } as const;

const finite = (what: string) => z.number({ error: `${what} must be a number` }).refine(Number.isFinite, `${what} must be finite`);

const optionsSchema = z.strictObject(
	{
		extrapolation: z.enum(['refuse', 'extend'], { error: 'extrapolation must be refuse or extend for a fit of several inputs' }).optional(),
		smoothing: finite('smoothing').refine((v) => v >= 0, 'smoothing must be 0 or more').optional(),
		epsilon: finite('epsilon').refine((v) => v > 0, 'epsilon must be greater than 0').optional(),
		degree: z.number({ error: 'degree must be a whole number' }).int('degree must be a whole number').min(-1, 'degree must be −1 (no tail), 0 or 1').max(1, 'degree must be −1 (no tail), 0 or 1').optional()
	},
	{
		error: (issue) =>
			issue.code === 'unrecognized_keys'
				? `unknown option${issue.keys.length > 1 ? 's' : ''} ${issue.keys.map((k) => `"${k}"`).join(', ')}; the options are extrapolation, smoothing, epsilon and degree`
				: 'options must be an object'
	}
);

/** rbf-* only */
const RBF_ONLY = ['smoothing', 'epsilon', 'degree'] as const;

export const surfacePreviewSchema = z
	.strictObject({
		output: z.string({ error: 'output is required: the name of an output column' }).min(1, 'output cannot be empty'),
		method: z.enum(SURFACE_METHODS, { error: `method must be one of ${SURFACE_METHODS.join(', ')}` }),
		options: optionsSchema.optional(),
		/** the point the slices pass through, one number per input (default: the centre of the data) */
		through: z.array(finite('each coordinate of through'), { error: 'through must be a list of numbers, one per input' }).max(6, 'through can list at most 6 numbers, one per input').optional(),
		/** the two inputs the map spans, by name (default: the first two) */
		map: z.tuple([z.string(), z.string()], { error: 'map must name two inputs, like ["torque", "speed"]' }).optional(),
		resolution: z
			.number({ error: 'resolution must be a whole number' })
			.int('resolution must be a whole number')
			.min(MAP_RESOLUTION.min, `resolution must be at least ${MAP_RESOLUTION.min}`)
			.max(MAP_RESOLUTION.max, `resolution can be at most ${MAP_RESOLUTION.max}`)
			.optional()
	}, {
		error: (issue) =>
			issue.code === 'unrecognized_keys'
				? `unknown field${issue.keys.length > 1 ? 's' : ''} ${issue.keys.map((k) => `"${k}"`).join(', ')}; a fit preview of several inputs takes output, method, options, through, map and resolution${issue.keys.includes('at') ? ' (at is for curves: use through)' : ''}`
				: 'the body must be a JSON object'
	})
	.superRefine((body, ctx) => {
		const rbf = isScatter(body.method);
		for (const key of RBF_ONLY) {
			if (body.options?.[key] !== undefined && !rbf) ctx.addIssue({ code: 'custom', path: ['options', key], message: `${key} applies to rbf-* methods, not ${body.method}` });
		}
		if (body.options?.epsilon !== undefined && body.method === 'rbf-thin-plate') ctx.addIssue({ code: 'custom', path: ['options', 'epsilon'], message: 'epsilon applies to rbf-multiquadric and rbf-gaussian, not rbf-thin-plate' });
	});
export type SurfacePreviewRequest = z.infer<typeof surfacePreviewSchema>;

const FIELD_OF: Partial<Record<FitErrorCode, string>> = { 'bad-option': 'options', 'too-few-points': 'method', 'too-many-inputs': 'method', 'shape-mismatch': 'method', 'coincident-points': 'method', singular: 'method' };

/** Fit, map, slice and audit one output of a grid or scatter dataset on an offload thread. Throws 422 naming the field or limit at fault. */
export async function surfacePreview(dataset: DatasetMeta & { data: Float64Array[] }, request: SurfacePreviewRequest): Promise<SurfacePreview> {
	const { columns } = dataset;
	const inputIdx = columns.flatMap((c, j) => (c.role === 'input' ? [j] : []));
	const names = inputIdx.map((j) => columns[j].name);
	const j = outputColumn(dataset, request.output);
	if (!isScatter(request.method) && dataset.shape !== 'grid') {
		fail4xx(422, `method: ${request.method} needs the inputs on a full grid; this dataset is scattered (${dataset.shapeReason}): use an rbf-* method`, 'invalid', [{ field: 'method', problem: 'needs a grid dataset' }]);
	}
	if (request.through && request.through.length !== names.length) {
		fail4xx(422, `through: give one number per input: ${request.through.length} given, and the dataset has ${names.length} (${names.join(', ')})`, 'invalid', [
			{ field: 'through', problem: `${request.through.length} numbers for ${names.length} inputs` }
		]);
	}
	let map: [number, number] = [0, 1];
	if (request.map) {
		const at = request.map.map((m) => names.indexOf(m));
		at.forEach((k, i) => {
			if (k < 0) fail4xx(422, `map.${i}: "${request.map![i]}" is not an input of this dataset; its inputs are ${names.map((n) => `"${n}"`).join(', ')}`, 'invalid', [{ field: `map.${i}`, problem: 'not an input' }]);
		});
		if (at[0] === at[1]) fail4xx(422, `map: name two different inputs, not "${request.map[0]}" twice`, 'invalid', [{ field: 'map', problem: 'the same input twice' }]);
		map = [at[0], at[1]];
	}
	const options = { ...(request.options ?? {}) };
	const result = await onThread<SurfacePreviewResult>(
		{ kind: 'surface-preview', inputs: inputIdx.map((i) => dataset.data[i]), y: dataset.data[j], method: request.method as never, options, through: request.through ?? null, map, resolution: request.resolution ?? MAP_RESOLUTION.default },
		dataset.rowCount,
		request.method
	);
	if (result.ok) return result.preview;
	return problem(result.problem, names);
}

function problem(p: FitProblem, names: string[]): never {
	// the numerics number the inputs from 1; the user knows them by name
	const named = p.message.replace(/\binput (\d)\b/g, (m, k: string) => (names[Number(k) - 1] ? `input ${k} ("${names[Number(k) - 1]}")` : m));
	if (p.kind === 'size') fail4xx(422, `method: ${named}`, 'too-large', [{ field: 'method', problem: named }]);
	if (p.kind === 'at') fail4xx(422, `through.${p.index}: ${named}`, 'outside-domain', [{ field: `through.${p.index}`, problem: named }]);
	const field = FIELD_OF[p.code] ?? 'method';
	fail4xx(422, `${field}: ${named}`, 'fit-failed', [{ field, problem: named }]);
}
