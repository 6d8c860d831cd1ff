/**
 * The study request: one zod schema for the JSON route and the new-study form
 * (the form's flat fields are turned into the same shape by `studyFromForm`
 * and then parsed by the same schema, so both get the same messages).
 */
import { UUID_PATTERN } from '../../text';
import { z } from 'zod';
import { curveMethods } from '../../numerics/fits/fitCurve';
import type { CurveMethod } from '../../numerics/fits/types';
import { CURVE_METHOD_CATALOGUE, type FormField } from '../../domain/methods';
import { gridMethods } from '../../numerics/fits/fitGrid';
import type { GridMethod, ScatterMethod, SurfaceMethod } from '../../numerics/fits/surfaceTypes';
import { OPTIMIZERS } from '../../numerics/optimize/optimize';
import type { OptimizerName } from '../../numerics/optimize/types';

export const CURVE_FIT_METHODS = Object.keys(curveMethods) as CurveMethod[];
const GRID_FIT_METHODS = Object.keys(gridMethods) as GridMethod[];
const SCATTER_FIT_METHODS: ScatterMethod[] = ['rbf-thin-plate', 'rbf-multiquadric', 'rbf-gaussian'];
const FIT_METHODS: (CurveMethod | SurfaceMethod)[] = [...CURVE_FIT_METHODS, ...GRID_FIT_METHODS, ...SCATTER_FIT_METHODS];
/** most inputs a study takes (scattered fits; grid fits take up to 4) */
export const MAX_STUDY_INPUTS = 6;
export const OPTIMIZER_NAMES = Object.keys(OPTIMIZERS) as OptimizerName[];

export const MAX_STARTS = 1000;
export const MAX_RUNS = 100_000;
const MAX_FITS = 20;
const MAX_OPTIMIZERS = 10;
const MAX_CONSTRAINTS = 5;
/** per-run budgets a study may ask for (the numerics' own defaults apply below these) */
export const BUDGET_LIMITS = { maxIterations: 100_000, maxEvaluations: 1_000_000, maxMilliseconds: 60_000 } as const;
/** what a study uses when the request sets no budget */
export const DEFAULT_BUDGETS = { maxIterations: 1000, maxEvaluations: 10_000, maxMilliseconds: 2000 } as const;

const finite = (what: string) => z.number({ error: `${what} must be a number` }).refine(Number.isFinite, { error: `${what} must be a finite number` });
const int = (what: string, lo: number, hi: number) =>
	z
		.number({ error: `${what} must be a whole number` })
		.int({ error: `${what} must be a whole number` })
		.min(lo, { error: `${what} must be at least ${lo.toLocaleString('en-US')}` })
		.max(hi, { error: `${what} must be at most ${hi.toLocaleString('en-US')}` });
const tolerance = (what: string) =>
	z
		.number({ error: `${what} must be a number` })
		.gt(0, { error: `${what} must be greater than 0` })
		.max(1, { error: `${what} must be at most 1` });

const budgetShape = {
	maxIterations: int('maxIterations', 1, BUDGET_LIMITS.maxIterations).optional(),
	maxEvaluations: int('maxEvaluations', 1, BUDGET_LIMITS.maxEvaluations).optional(),
	maxMilliseconds: int('maxMilliseconds (per run)', 1, BUDGET_LIMITS.maxMilliseconds).optional()
};

const fitOptionsSchema = z.strictObject(
	{
		extrapolation: z.enum(['refuse', 'hold', 'linear', 'extend'], { error: 'extrapolation must be refuse, hold, linear or extend' }).optional(),
		duplicates: z.enum(['error', 'average'], { error: 'duplicates must be error or average' }).optional(),
		nonFinite: z.enum(['error', 'drop'], { error: 'nonFinite must be error or drop' }).optional(),
		slopes: z.tuple([finite('slopes[0]'), finite('slopes[1]')], { error: 'slopes must be two numbers: f′ at the first and at the last x' }).optional(),
		degree: int('degree', -1, 15).optional(),
		smoothing: z.number({ error: 'smoothing must be a number' }).min(0, { error: 'smoothing must be 0 or more' }).refine(Number.isFinite, { error: 'smoothing must be finite' }).optional(),
		epsilon: z.number({ error: 'epsilon must be a number' }).gt(0, { error: 'epsilon must be greater than 0' }).refine(Number.isFinite, { error: 'epsilon must be finite' }).optional(),
		lambda: z.number({ error: 'lambda must be a number' }).min(0, { error: 'lambda must be 0 or more' }).refine(Number.isFinite, { error: 'lambda must be finite' }).optional(),
		width: z.number({ error: 'width must be a number' }).gt(0, { error: 'width must be greater than 0' }).refine(Number.isFinite, { error: 'width must be finite' }).optional()
	},
	{ error: (i) => (i.code === 'unrecognized_keys' ? `unknown fit option ${i.keys.map((k) => `"${k}"`).join(', ')}` : 'options must be an object') }
);

/** options that belong to some methods only */
const METHOD_ONLY: Record<string, readonly string[]> = {
	degree: ['polynomial-least-squares', ...SCATTER_FIT_METHODS],
	lambda: ['smoothing-spline'],
	width: ['softened-linear'],
	slopes: ['cubic-clamped'],
	smoothing: SCATTER_FIT_METHODS,
	epsilon: ['rbf-multiquadric', 'rbf-gaussian']
};
/** curve-only options of every method (surface fits take extrapolation refuse | extend and their own) */
const CURVE_ONLY_OPTIONS = ['duplicates', 'nonFinite'] as const;

const fitSchema = z.object({
	method: z.enum(FIT_METHODS as [string, ...string[]], { error: `unknown fit method; one of ${FIT_METHODS.join(', ')}` }),
	options: fitOptionsSchema.optional()
});

const optimizerOptionsSchema = z.strictObject(
	{
		gradTol: tolerance('gradTol').optional(),
		stepTol: tolerance('stepTol').optional(),
		fTol: tolerance('fTol').optional(),
		feasTol: tolerance('feasTol').optional(),
		residualTol: tolerance('residualTol').optional(),
		secondOrderCheck: z.boolean({ error: 'secondOrderCheck must be true or false' }).optional(),
		...budgetShape
	},
	{ error: (i) => (i.code === 'unrecognized_keys' ? `unknown optimizer option ${i.keys.map((k) => `"${k}"`).join(', ')}` : 'options must be an object') }
);

const optimizerSchema = z.object({
	method: z.enum(OPTIMIZER_NAMES as [OptimizerName, ...OptimizerName[]], { error: `unknown optimizer; one of ${OPTIMIZER_NAMES.join(', ')}` }),
	options: optimizerOptionsSchema.optional()
});

const constraintSchema = z.object({
	output: z.string({ error: 'a constraint needs the output it limits' }).trim().min(1, { error: 'a constraint needs the output it limits' }).max(120),
	op: z.enum(['<=', '>=', '='], { error: 'op must be "<=", ">=" or "="' }),
	value: finite('the constraint value')
});

const problemSchema = z
	.object({
		kind: z.enum(['minimize', 'maximize', 'solve'], { error: 'problem.kind must be minimize, maximize or solve' }),
		target: finite('target').optional(),
		// null on either side: the data's edge
		bounds: z
			.array(z.tuple([finite('a lower bound').nullable(), finite('an upper bound').nullable()], { error: 'each bound is [lo, hi]' }), {
				error: 'bounds must be a list of [lo, hi], one per input (null: the data’s edge)'
			})
			.min(1, { error: 'bounds need one [lo, hi] per input' })
			.max(MAX_STUDY_INPUTS, { error: `a study takes at most ${MAX_STUDY_INPUTS} inputs, so at most ${MAX_STUDY_INPUTS} bounds` })
			.optional(),
		constraints: z.array(constraintSchema, { error: 'constraints must be a list' }).max(MAX_CONSTRAINTS, { error: `at most ${MAX_CONSTRAINTS} constraints` }).optional()
	})
	.superRefine((p, ctx) => {
		if (p.kind === 'solve' && p.target === undefined) ctx.addIssue({ code: 'custom', path: ['target'], message: 'a solve problem needs a target: the value the fitted output must reach' });
		if (p.kind !== 'solve' && p.target !== undefined) ctx.addIssue({ code: 'custom', path: ['target'], message: `target is only for solve problems, not ${p.kind}` });
		p.bounds?.forEach(([lo, hi], i) => {
			if (lo !== null && hi !== null && !(lo < hi)) ctx.addIssue({ code: 'custom', path: ['bounds', i], message: `bounds [${lo}, ${hi}]: the lower bound must be below the upper bound` });
		});
	});

const startsSchema = z
	.strictObject(
		{
			points: z
				.array(z.array(finite('a start coordinate'), { error: 'each start is a list of numbers, one per input' }), { error: 'points must be a list of starts' })
				.min(1, { error: 'zero starts: give at least one start point' })
				.max(MAX_STARTS, { error: `at most ${MAX_STARTS.toLocaleString('en-US')} starts` })
				.optional(),
			grid: int('grid (starts per input)', 1, MAX_STARTS).optional(),
			latinHypercube: int('latinHypercube (number of starts)', 1, MAX_STARTS).optional(),
			seed: int('seed', 0, 2 ** 32 - 1).optional()
		},
		{ error: (i) => (i.code === 'unrecognized_keys' ? `unknown starts field ${i.keys.map((k) => `"${k}"`).join(', ')}; use points, grid or latinHypercube (+ seed)` : 'starts must be { points } | { grid } | { latinHypercube, seed }') }
	)
	.superRefine((s, ctx) => {
		const given = (['points', 'grid', 'latinHypercube'] as const).filter((k) => s[k] !== undefined);
		if (given.length !== 1) ctx.addIssue({ code: 'custom', path: [], message: given.length ? `give one kind of starts, not ${given.join(' and ')}` : 'zero starts: give points, grid or latinHypercube' });
		if (s.seed !== undefined && s.latinHypercube === undefined) ctx.addIssue({ code: 'custom', path: ['seed'], message: 'seed goes with latinHypercube' });
	});

export const studyInputSchema = z
	.object({
		name: z.string({ error: 'name must be text' }).trim().min(1, { error: 'name cannot be empty' }).max(120, { error: 'name can be at most 120 characters' }).optional(),
		datasetId: z.string({ error: 'datasetId is required' }).regex(UUID_PATTERN, { error: 'datasetId must be a dataset id' }),
		output: z.string({ error: 'output is required: the output column to optimize' }).trim().min(1, { error: 'output is required: the output column to optimize' }).max(120),
		problem: problemSchema,
		fits: z.array(fitSchema, { error: 'fits must be a list of { method, options? }' }).min(1, { error: 'choose at least one fit' }).max(MAX_FITS, { error: `at most ${MAX_FITS} fits` }),
		optimizers: z
			.array(optimizerSchema, { error: 'optimizers must be a list of { method, options? }' })
			.min(1, { error: 'choose at least one optimizer' })
			.max(MAX_OPTIMIZERS, { error: `at most ${MAX_OPTIMIZERS} optimizers` }),
		starts: startsSchema,
		budgets: z.strictObject(budgetShape, { error: 'budgets must be { maxIterations?, maxEvaluations?, maxMilliseconds? }' }).optional()
	})
	.superRefine((s, ctx) => {
		s.fits.forEach((f, i) => {
			for (const [key, methods] of Object.entries(METHOD_ONLY)) {
				if (f.options && key in f.options && !methods.includes(f.method)) ctx.addIssue({ code: 'custom', path: ['fits', i, 'options', key], message: `${key} applies only to ${methods.join(', ')}, not ${f.method}` });
			}
			const surface = !(CURVE_FIT_METHODS as string[]).includes(f.method);
			if (surface) {
				for (const key of CURVE_ONLY_OPTIONS) if (f.options && key in f.options) ctx.addIssue({ code: 'custom', path: ['fits', i, 'options', key], message: `${key} applies to curve fits, not ${f.method}` });
				const ext = f.options?.extrapolation;
				if (ext && ext !== 'refuse' && ext !== 'extend') ctx.addIssue({ code: 'custom', path: ['fits', i, 'options', 'extrapolation'], message: `${f.method} extrapolates by refuse or extend, not ${ext}` });
			}
			const degree = f.options?.degree;
			if (degree !== undefined && (SCATTER_FIT_METHODS as string[]).includes(f.method) && degree > 1) ctx.addIssue({ code: 'custom', path: ['fits', i, 'options', 'degree'], message: `the polynomial tail of ${f.method} has degree −1 (none), 0 or 1, not ${degree}` });
			if (degree !== undefined && f.method === 'polynomial-least-squares' && degree < 0) ctx.addIssue({ code: 'custom', path: ['fits', i, 'options', 'degree'], message: 'degree must be at least 0' });
			if (f.method === 'cubic-clamped' && !f.options?.slopes) ctx.addIssue({ code: 'custom', path: ['fits', i, 'options', 'slopes'], message: 'cubic-clamped needs slopes: [f′ at the first x, f′ at the last x]' });
		});
		const starts = s.starts.points?.length ?? s.starts.grid ?? s.starts.latinHypercube ?? 0;
		const runs = s.fits.length * s.optimizers.length * starts;
		if (runs > MAX_RUNS) {
			ctx.addIssue({
				code: 'custom',
				path: ['starts'],
				message: `${s.fits.length} fits × ${s.optimizers.length} optimizers × ${starts} starts = ${runs.toLocaleString('en-US')} runs; a study can have at most ${MAX_RUNS.toLocaleString('en-US')}`
			});
		}
	});

export type StudyInput = z.output<typeof studyInputSchema>;

// ---------------------------------------------------------------- the form

/** Fit options the form offers, by method: field suffix → option. */
/** Each curve method's option fields on the new-study form (from the catalogue; none for most methods). */
export const FORM_FIT_OPTIONS: Readonly<Partial<Record<CurveMethod, readonly FormField[]>>> = Object.fromEntries(
	Object.entries(CURVE_METHOD_CATALOGUE).flatMap(([m, e]) => (e.formFields ? [[m, e.formFields]] : []))
);

const num = (v: string | undefined): number | string | undefined => {
	if (v === undefined || v.trim() === '') return undefined;
	const n = Number(v.trim());
	return Number.isNaN(n) ? v : n;
};

/** Start values for a one-input curve: numbers separated by commas, semicolons, spaces or new lines. */
function parsePoints(text: string): unknown[] {
	return text
		.split(/[\s,;]+/)
		.filter(Boolean)
		.map((c) => [num(c)]);
}

/**
 * The new-study form's flat fields → the JSON request shape (then parsed by
 * `studyInputSchema`). Unknown or blank fields are left out so the schema's
 * messages apply.
 */
function studyFromForm(raw: Record<string, string>): unknown {
	const [datasetId, ...outputParts] = (raw.source ?? '').split(':');
	const problem: Record<string, unknown> = { kind: raw.kind };
	if (raw.kind === 'solve') problem.target = num(raw.target);
	const lo = num(raw.boundLo);
	const hi = num(raw.boundHi);
	if (lo !== undefined || hi !== undefined) problem.bounds = [[lo ?? null, hi ?? null]];
	const constraints = [0, 1, 2]
		.filter((i) => (raw[`c${i}.output`] ?? '').trim() !== '')
		.map((i) => ({ output: raw[`c${i}.output`], op: raw[`c${i}.op`], value: num(raw[`c${i}.value`]) ?? raw[`c${i}.value`] }));
	if (constraints.length) problem.constraints = constraints;

	const extrapolation = raw.extrapolation && raw.extrapolation !== 'refuse' ? raw.extrapolation : undefined;
	const fits = FIT_METHODS.filter((m) => raw[`fit.${m}`]).map((method) => {
		const options: Record<string, unknown> = {};
		if (extrapolation) options.extrapolation = extrapolation;
		if (method === 'polynomial-least-squares' && num(raw[`fit.${method}.degree`]) !== undefined) options.degree = num(raw[`fit.${method}.degree`]);
		if (method === 'smoothing-spline' && num(raw[`fit.${method}.lambda`]) !== undefined) options.lambda = num(raw[`fit.${method}.lambda`]);
		if (method === 'softened-linear' && num(raw[`fit.${method}.width`]) !== undefined) options.width = num(raw[`fit.${method}.width`]);
		if (method === 'cubic-clamped') options.slopes = [num(raw[`fit.${method}.slopeStart`]) ?? 0, num(raw[`fit.${method}.slopeEnd`]) ?? 0];
		return Object.keys(options).length ? { method, options } : { method };
	});
	const optimizerOptions: Record<string, unknown> = {};
	if (num(raw.gradTol) !== undefined) optimizerOptions.gradTol = num(raw.gradTol);
	const optimizers = OPTIMIZER_NAMES.filter((m) => raw[`opt.${m}`]).map((method) => (Object.keys(optimizerOptions).length ? { method, options: optimizerOptions } : { method }));

	let starts: Record<string, unknown>;
	if (raw.startsKind === 'points') starts = { points: parsePoints(raw.startsPoints ?? '') };
	else if (raw.startsKind === 'grid') starts = { grid: num(raw.startsCount) ?? 0 };
	else starts = { latinHypercube: num(raw.startsCount) ?? 0, seed: num(raw.seed) ?? 1 };

	const budgets: Record<string, unknown> = {};
	for (const k of ['maxIterations', 'maxEvaluations', 'maxMilliseconds'] as const) if (num(raw[k]) !== undefined) budgets[k] = num(raw[k]);

	return {
		...(raw.name?.trim() ? { name: raw.name } : {}),
		datasetId,
		output: outputParts.join(':'),
		problem,
		fits,
		optimizers,
		starts,
		...(Object.keys(budgets).length ? { budgets } : {})
	};
}

/** The same schema behind the form: flat fields in, the study request out. */
export const studyFormSchema = z.preprocess((raw) => studyFromForm(raw as Record<string, string>), studyInputSchema);

export const pickSchema = z.object({
	fitId: z.string({ error: 'fitId is required: the fit you pick' }).regex(UUID_PATTERN, { error: 'fitId must be one of this study’s fit ids' }),
	rationale: z
		.string({ error: 'rationale is required: say why this fit' })
		.trim()
		.min(10, { error: 'rationale must be at least 10 characters: say why this fit' })
		.max(4000, { error: 'rationale can be at most 4,000 characters' })
});

export const shareSchema = z.object({
	expiresInDays: z.preprocess(
		(v) => (v === '' || v === null ? undefined : typeof v === 'string' ? Number(v) : v),
		z
			.number({ error: 'expiresInDays must be a number of days' })
			.int({ error: 'expiresInDays must be a whole number of days' })
			.min(1, { error: 'expiresInDays must be at least 1' })
			.max(365, { error: 'expiresInDays can be at most 365' })
			.optional()
	),
	/** show member names (who launched, who picked) to link holders; hidden unless asked for */
	showNames: z.preprocess(formBoolean, z.boolean({ error: 'showNames must be true or false' }).optional())
});

/** Turn member names on a live share link on or off. */
export const shareNamesSchema = z.object({
	showNames: z.preprocess(formBoolean, z.boolean({ error: 'showNames must be true or false' }))
});

/** A checkbox sends "on" (or "true"); an unticked one sends nothing. JSON sends a boolean. */
function formBoolean(v: unknown): unknown {
	if (v === 'on' || v === 'true') return true;
	if (v === 'false' || v === '') return false;
	return v;
}
