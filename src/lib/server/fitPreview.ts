// A quick fit of one output of a curve dataset: the fit sampled densely with
// f′ and f″, its smoothness audit and its fidelity, for the dataset page.
import { z } from 'zod';
import { CURVE_METHOD_CHOICES, CURVE_METHOD_IDS, EXTRAPOLATIONS, type FitPreview } from '$lib/fitMethods';
import { auditFidelity } from '$lib/numerics/audit/fidelity';
import { auditSmoothness } from '$lib/numerics/audit/smoothness';
import { FitError, fitCurve, type CurveFitOptions } from '$lib/numerics/fits';
import { fail4xx } from './api';
import type { DatasetMeta } from './datasetStore';

// Evenly spaced samples across the domain; the knots are added when there are
// not too many, so f′ and f″ break exactly where the fit does.
const SAMPLES = 400;
const MAX_KNOTS_SAMPLED = 2000;
const MAX_AT = 1000;
const WORST_LISTED = 25;
const MAX_DEGREE = 30;
// Past this many rows the fidelity audit samples: fewer leave-one-out refits
// (each costs a whole fit) and fewer probes per interval, so a preview of a
// 100,000-row table answers in about a second rather than tens.
const LARGE = 5000;

function fidelityOptions(n: number) {
	if (n <= LARGE) return {};
	return { looMaxPoints: Math.max(10, Math.min(200, Math.round(1e6 / n))), samplesPerInterval: 2, derivativePoints: 100 };
}

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
export type FitPreviewRequest = z.infer<typeof fitPreviewSchema>;

// Which request field a fitting error is about.
const FIELD_OF: Partial<Record<FitError['code'], string>> = {
	'degree-too-high': 'options.degree',
	'missing-slopes': 'options.slopes',
	'bad-width': 'options.width',
	'outside-domain': 'at',
	'too-few-points': 'method',
	singular: 'options.degree'
};

function fitFailure(e: FitError): never {
	const field = FIELD_OF[e.code] ?? (e.code === 'bad-option' ? 'options' : 'method');
	fail4xx(422, `${field}: ${e.message}`, 'fit-failed', [{ field, problem: e.message }]);
}

const nullIfNaN = (v: number): number | null => (Number.isFinite(v) ? v : null);

/** Sorted, distinct sample points: an even grid over the domain plus the knots. */
function samplePoints(lo: number, hi: number, knots: Float64Array): Float64Array {
	const pts: number[] = [];
	for (let i = 0; i <= SAMPLES; i++) pts.push(i === SAMPLES ? hi : lo + ((hi - lo) * i) / SAMPLES);
	if (knots.length <= MAX_KNOTS_SAMPLED) for (const k of knots) if (k >= lo && k <= hi) pts.push(k);
	const sorted = Float64Array.from(pts).sort();
	let m = 0;
	for (let i = 0; i < sorted.length; i++) if (i === 0 || sorted[i] !== sorted[m - 1]) sorted[m++] = sorted[i];
	return sorted.slice(0, m);
}

/** The data and settings of a preview request, checked. Throws 422 naming the field at fault. */
function previewInput(dataset: DatasetMeta & { data: Float64Array[] }, request: FitPreviewRequest) {
	const { columns, data } = dataset;
	const outputs = columns.filter((c) => c.role === 'output').map((c) => c.name);
	const j = columns.findIndex((c) => c.name === request.output && c.role === 'output');
	if (j === -1) {
		fail4xx(422, `output: the dataset has no output column "${request.output}"; its outputs are ${outputs.map((o) => `"${o}"`).join(', ')}`, 'invalid', [
			{ field: 'output', problem: `not an output of this dataset (outputs: ${outputs.join(', ')})` }
		]);
	}
	if (dataset.shape !== 'curve') {
		fail4xx(422, `the fit preview covers curves (one input); this dataset is a ${dataset.shape}`, 'not-a-curve', [
			{ field: 'output', problem: `dataset shape is ${dataset.shape}` }
		]);
	}
	const i = columns.findIndex((c) => c.role === 'input');
	const x = data[i];
	const y = data[j];
	const options: CurveFitOptions = {};
	const o = request.options ?? {};
	if (o.extrapolation) options.extrapolation = o.extrapolation;
	if (o.degree !== undefined) options.degree = o.degree;
	if (o.lambda !== undefined && o.lambda !== null) options.lambda = o.lambda;
	if (o.width !== undefined) options.width = o.width;
	if (o.slopes) options.slopes = o.slopes;
	return { x, y, options, input: columns[i], output: columns[j] };
}

/** The fit a preview request describes (for exports). Throws 422 naming the field at fault. */
export function previewFit(dataset: DatasetMeta & { data: Float64Array[] }, request: FitPreviewRequest) {
	const { x, y, options, input, output } = previewInput(dataset, request);
	try {
		return { fit: fitCurve(request.method, x, y, options), input, output };
	} catch (e) {
		if (e instanceof FitError) fitFailure(e);
		throw e;
	}
}

/** Fit, sample and audit one output of a curve dataset. Throws 422 naming the field at fault. */
export function fitPreview(dataset: DatasetMeta & { data: Float64Array[] }, request: FitPreviewRequest): FitPreview {
	const { x, y, options } = previewInput(dataset, request);
	try {
		const fit = fitCurve(request.method, x, y, options);
		const smooth = auditSmoothness(fit, { worst: WORST_LISTED });
		const fid = auditFidelity(fit, x, y, fidelityOptions(x.length));
		const [lo, hi] = fit.domain;
		const sx = samplePoints(lo, hi, fit.knots);
		const s = fit.evaluateMany(sx);
		const preview: FitPreview = {
			method: fit.method,
			continuity: {
				declared: smooth.declared,
				measured: smooth.measured,
				worst: smooth.worst.map((w) => ({ x: w.x, jumpD1: w.jumpD1, jumpD2: w.jumpD2 }))
			},
			fidelity: {
				looRmse: nullIfNaN(fid.looRmse),
				looMax: nullIfNaN(fid.looMax),
				overshoot: fid.overshoot,
				monotoneKept: fid.monotoneKept,
				spuriousExtrema: fid.spuriousExtrema
			},
			samples: { x: Array.from(sx), f: Array.from(s.f), df: Array.from(s.df), d2f: Array.from(s.d2f) }
		};
		if (request.at) {
			const at = { x: request.at, f: [] as number[], df: [] as number[], d2f: [] as number[] };
			request.at.forEach((xv, k) => {
				let jet;
				try {
					jet = fit.evaluate(xv);
				} catch (e) {
					if (e instanceof FitError) {
						fail4xx(422, `at[${k}]: ${e.message}`, 'outside-domain', [{ field: `at.${k}`, problem: e.message }]);
					}
					throw e;
				}
				at.f.push(jet.f);
				at.df.push(jet.df);
				at.d2f.push(jet.d2f);
			});
			preview.at = at;
		}
		return preview;
	} catch (e) {
		if (e instanceof FitError) fitFailure(e);
		throw e;
	}
}
