// A quick fit of one output of a curve dataset: the fit sampled densely with
// f′ and f″, its smoothness audit and its fidelity, for the dataset page.
import { z } from 'zod';
import { CURVE_METHOD_CHOICES, CURVE_METHOD_IDS, EXTRAPOLATIONS, type FitPreview } from '../../fitMethods';
import type { CurveFitOptions, FitErrorCode } from '../../numerics/fits';
import { fail4xx } from '../api';
import { formatBudget, PREVIEW_BUDGET_MS } from '../offload/limits';
import { OffloadBusy, OffloadOverBudget, runOffThread } from '../offload/pool';
import type { BuildResult, FitProblem, FitTask, PreviewResult } from '../offload/fitWork';
import type { DatasetMeta } from './store';

const MAX_AT = 1000;
const MAX_DEGREE = 30;

const finite = (what: string) => z.number({ error: `${what} must be a number` }).refine(Number.isFinite, `${what} must be finite`);

const optionsSchema = z.strictObject(
	{
		extrapolation: z.enum(EXTRAPOLATIONS, { error: `extrapolation must be one of ${EXTRAPOLATIONS.join(', ')}` }).optional(),
		degree: z
			.number({ error: 'degree must be a whole number' })
			.int('degree must be a whole number')
			.min(0, 'degree must be at least 0')
			.max(MAX_DEGREE, `degree can be at most ${MAX_DEGREE}`)
			.optional(),
		lambda: finite('lambda').refine((v) => v >= 0, 'lambda must be ≥ 0 (leave it out to choose it by GCV)').nullable().optional(),
		width: finite('width').refine((v) => v > 0, 'width must be a positive length in input units').optional(),
		slopes: z.tuple([finite('slopes[0]'), finite('slopes[1]')], { error: 'slopes must be [f′ at the first x, f′ at the last x]' }).optional()
	},
	{
		error: (issue) =>
			issue.code === 'unrecognized_keys'
				? `unknown option${issue.keys.length > 1 ? 's' : ''} ${issue.keys.map((k) => `"${k}"`).join(', ')}; the options are extrapolation, degree, lambda, width and slopes`
				: 'options must be an object'
	}
);

export const fitPreviewSchema = z
	.strictObject({
		output: z.string({ error: 'output is required: the name of an output column' }).min(1, 'output cannot be empty'),
		method: z.enum(CURVE_METHOD_IDS, { error: `method must be one of ${CURVE_METHOD_IDS.join(', ')}` }),
		options: optionsSchema.optional(),
		at: z.array(finite('each point in at'), { error: 'at must be a list of numbers' }).max(MAX_AT, `at can list at most ${MAX_AT} points`).optional()
	})
	.superRefine((body, ctx) => {
		const choice = CURVE_METHOD_CHOICES.find((m) => m.id === body.method);
		if (!choice) return;
		const given = body.options ?? {};
		for (const key of ['degree', 'lambda', 'width', 'slopes'] as const) {
			if (given[key] !== undefined && given[key] !== null && !choice.options.includes(key)) {
				const users = CURVE_METHOD_CHOICES.filter((m) => m.options.includes(key)).map((m) => m.id);
				ctx.addIssue({ code: 'custom', path: ['options', key], message: `${key} does not apply to ${body.method}; it is an option of ${users.join(', ')}` });
			}
		}
		for (const key of choice.required ?? []) {
			if (given[key] === undefined) {
				ctx.addIssue({ code: 'custom', path: ['options', key], message: `${body.method} needs options.${key}${key === 'slopes' ? ' = [f′ at the first x, f′ at the last x]' : ''}` });
			}
		}
	});
type FitPreviewRequest = z.infer<typeof fitPreviewSchema>;

// Which request field a fitting error is about.
const FIELD_OF: Partial<Record<FitErrorCode, string>> = {
	'degree-too-high': 'options.degree',
	'missing-slopes': 'options.slopes',
	'bad-width': 'options.width',
	'outside-domain': 'at',
	'too-few-points': 'method',
	singular: 'options.degree'
};

/** The column of output `name`; a 422 naming the dataset's outputs when it has none of that name. */
export function outputColumn(dataset: DatasetMeta, name: string): number {
	const { columns } = dataset;
	const j = columns.findIndex((c) => c.name === name && c.role === 'output');
	if (j === -1) {
		const outputs = columns.filter((c) => c.role === 'output').map((c) => c.name);
		fail4xx(422, `output: the dataset has no output column "${name}"; its outputs are ${outputs.map((o) => `"${o}"`).join(', ')}`, 'invalid', [
			{ field: 'output', problem: `not an output of this dataset (outputs: ${outputs.join(', ')})` }
		]);
	}
	return j;
}

/** The data and settings of a preview request, checked. Throws 422 naming the field at fault. */
function previewInput(dataset: DatasetMeta & { data: Float64Array[] }, request: FitPreviewRequest) {
	const { columns } = dataset;
	const j = outputColumn(dataset, request.output);
	if (dataset.shape !== 'curve') {
		fail4xx(422, `the fit preview covers curves (one input); this dataset is a ${dataset.shape}`, 'not-a-curve', [
			{ field: 'output', problem: `dataset shape is ${dataset.shape}` }
		]);
	}
	const i = columns.findIndex((c) => c.role === 'input');
	const options: CurveFitOptions = {};
	const o = request.options ?? {};
	if (o.extrapolation) options.extrapolation = o.extrapolation;
	if (o.degree !== undefined) options.degree = o.degree;
	if (o.lambda !== undefined && o.lambda !== null) options.lambda = o.lambda;
	if (o.width !== undefined) options.width = o.width;
	if (o.slopes) options.slopes = o.slopes;
	return { i, j, options };
}

function fitProblem(problem: FitProblem): never {
	if (problem.kind === 'size') fail4xx(422, `method: ${problem.message}`, 'too-large', [{ field: 'method', problem: problem.message }]);
	if (problem.kind === 'at') fail4xx(422, `at[${problem.index}]: ${problem.message}`, 'outside-domain', [{ field: `at.${problem.index}`, problem: problem.message }]);
	const field = FIELD_OF[problem.code] ?? (problem.code === 'bad-option' ? 'options' : 'method');
	fail4xx(422, `${field}: ${problem.message}`, 'fit-failed', [{ field, problem: problem.message }]);
}

/** A preview's work on an offload thread within PREVIEW_BUDGET_MS; over budget or busy, the 4xx that says so. */
export async function onThread<T>(task: FitTask, rows: number, method: string): Promise<T> {
	try {
		return await runOffThread<T>(task, PREVIEW_BUDGET_MS);
	} catch (e) {
		if (e instanceof OffloadOverBudget) {
			fail4xx(422, `the ${method} preview of ${rows.toLocaleString('en-US')} rows ${e.message} (the limit for one fit preview); thin the table or choose a cheaper method`, 'over-budget', [
				{ field: 'method', problem: `over the ${formatBudget(PREVIEW_BUDGET_MS)} preview budget` }
			]);
		}
		if (e instanceof OffloadBusy) fail4xx(503, e.message, 'busy');
		throw e;
	}
}

/** The fit body (fit file) a preview request describes, built on an offload thread, with its input and output columns (for exports). */
export async function previewFit(dataset: DatasetMeta & { data: Float64Array[] }, request: FitPreviewRequest) {
	const { i, j, options } = previewInput(dataset, request);
	const name = dataset.columns[j].name;
	const result = await onThread<BuildResult>({ kind: 'build', x: dataset.data[i], columns: { [name]: dataset.data[j] }, fits: [{ method: request.method, options, outputs: [name] }] }, dataset.data[i].length, request.method);
	if (!result.ok) fitProblem(result.problem);
	return { fit: JSON.parse(result.fits[0][0]) as Record<string, unknown>, input: dataset.columns[i], output: dataset.columns[j] };
}

/** Fit, sample and audit one output of a curve dataset on an offload thread. Throws 422 naming the field or limit at fault. */
export async function fitPreview(dataset: DatasetMeta & { data: Float64Array[] }, request: FitPreviewRequest): Promise<FitPreview> {
	const { i, j, options } = previewInput(dataset, request);
	const { data } = dataset;
	const result = await onThread<PreviewResult>({ kind: 'preview', x: data[i], y: data[j], method: request.method, options, at: request.at }, data[i].length, request.method);
	if (result.ok) return result.preview;
	fitProblem(result.problem);
}
