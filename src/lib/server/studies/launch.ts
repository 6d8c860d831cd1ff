/**
 * Launch a study: check the request against the dataset (beyond what the
 * schema can see), build every fit once to catch bad options now rather than
 * in a worker, then store the study, its fits and all its jobs in one
 * transaction. Nothing is stored when any check fails.
 */
import type { Knex } from 'knex';
import { fitFromJSON, isCurveMethod } from '../../numerics/fits/fitCurve';
import type { FitErrorCode } from '../../numerics/fits/fitError';
import { isGridMethod } from '../../numerics/fits/fitGrid';
import { surfaceFromJSON } from '../../numerics/fits/surfaceFile';
import type { SurfaceFit, SurfaceFitOptions, SurfaceMethod } from '../../numerics/fits/surfaceTypes';
import { GRID_MAX_INPUTS } from '../../numerics/fits/tensorGrid';
import type { CurveFit, CurveFitOptions, CurveMethod } from '../../numerics/fits/types';
import { OPTIMIZERS } from '../../numerics/optimize/optimize';
import { MIN_GRAD_TOL, MIN_TOL } from '../../numerics/optimize/run';
import { makeStarts } from '../../numerics/optimize/starts';
import { getWithData } from '../datasets/store';
import { buildFits, type BuildResult, type BuildTask } from '../offload/fitWork';
import { buildSurfaceFits, GRID_MAX_NODES, type SurfaceBuildTask } from '../offload/surfaceWork';
import { insertJobs, queueName } from './queue/boss';
import { auditJob, runsJob, startsPerJob, type StudyJob } from './queue/jobs';
import { packStarts } from './queue/runner';
import { DEFAULT_BUDGETS, MAX_RUNS, MAX_STARTS, MAX_STUDY_INPUTS, type StudyInput } from './launchRequest';
import type { StudySpec } from '../../domain/studySpec';

/** Largest curve a study takes: every fit is built when the study is launched. */
const MAX_STUDY_ROWS = 20_000;

export type Detail = { field: string; problem: string };

/** A request the data or the numerics refuse: 422 with the fields named. */
export class StudyRejected extends Error {
	constructor(readonly details: Detail[]) {
		super(details.map((d) => `${d.field}: ${d.problem}`).join('; '));
	}
}

const reject = (field: string, problem: string): never => {
	throw new StudyRejected([{ field, problem }]);
};

const fmt = (v: number) => String(Number(v.toPrecision(6)));

/** Which part of a fit request a fitting error is about (below fits.<i>). */
const FIT_FIELD: Partial<Record<FitErrorCode, string>> = { 'bad-option': 'options', 'degree-too-high': 'options.degree', 'missing-slopes': 'options.slopes', 'bad-width': 'options.width', 'too-few-points': 'method', 'too-many-inputs': 'method', 'shape-mismatch': 'method' };

interface LaunchArgs {
	workspaceId: string;
	userId: string | null;
	/** public origin, for links in the "finished" e-mail */
	origin: string;
	input: StudyInput;
	/** job queue (default KINKLESS_QUEUE or "studies") */
	queue?: string;
	/** false: store the study but return its jobs instead of queueing them (the demo seed runs them itself) */
	enqueue?: boolean;
	/** builds the fits, on an offload thread in the app (default: in this thread, for the seed and scripts) */
	buildFits?: (task: BuildTask | SurfaceBuildTask) => Promise<BuildResult>;
}

export async function launchStudy(db: Knex, args: LaunchArgs): Promise<{ id: string; status: 'queued'; runs: number; jobs: StudyJob[]; warnings: string[] }> {
	const { input } = args;
	const queue = args.queue ?? queueName();
	const dataset = await getWithData(db, input.datasetId);
	if (!dataset || dataset.workspaceId !== args.workspaceId) reject('datasetId', 'no dataset with this id in this workspace');
	const ds = dataset!;
	const inputIndices = ds.columns.map((c, i) => (c.role === 'input' ? i : -1)).filter((i) => i >= 0);
	const surface = ds.shape !== 'curve';
	const n = inputIndices.length;
	if (surface && n > MAX_STUDY_INPUTS) reject('datasetId', `"${ds.name}" has ${n} inputs; a study takes at most ${MAX_STUDY_INPUTS} (scattered fits) or ${GRID_MAX_INPUTS} (grid fits)`);
	const maxRows = surface ? GRID_MAX_NODES : MAX_STUDY_ROWS;
	if (ds.rowCount > maxRows) reject('datasetId', `"${ds.name}" has ${ds.rowCount.toLocaleString('en-US')} rows; a study takes ${surface ? 'tables' : 'curves'} of up to ${maxRows.toLocaleString('en-US')} rows`);
	const inputIndex = inputIndices[0];
	const outputs = ds.columns.filter((c) => c.role === 'output').map((c) => c.name);
	const columnOf = (name: string) => ds.columns.findIndex((c) => c.name === name && c.role === 'output');
	const outputIndex = columnOf(input.output);
	if (outputIndex < 0) reject('output', `"${input.output}" is not an output of "${ds.name}"; its outputs are ${outputs.map((o) => `"${o}"`).join(', ')}`);

	// the fit methods must suit the table's shape
	input.fits.forEach((f, i) => {
		const isCurve = isCurveMethod(f.method);
		if (!surface && !isCurve) reject(`fits.${i}.method`, `${f.method} fits tables of two or more inputs; "${ds.name}" is a curve (one input): use a curve method such as pchip`);
		if (surface && isCurve) reject(`fits.${i}.method`, `${f.method} is a curve method (one input); "${ds.name}" is a ${ds.shape} of ${n} inputs: use ${ds.shape === 'grid' ? 'a grid-* method or ' : ''}an rbf-* method`);
		if (isGridMethod(f.method)) {
			if (ds.shape !== 'grid') reject(`fits.${i}.method`, `${f.method} needs the inputs on a full grid; "${ds.name}" is scattered (${ds.shapeReason}): use an rbf-* method`);
			if (n > GRID_MAX_INPUTS) reject(`fits.${i}.method`, `${f.method} takes at most ${GRID_MAX_INPUTS} inputs; "${ds.name}" has ${n}: use an rbf-* method`);
		}
	});

	const p = input.problem;
	const constraints = p.constraints ?? [];
	constraints.forEach((c, i) => {
		if (c.output === input.output) reject(`problem.constraints.${i}.output`, `"${c.output}" is the output being optimized; a constraint limits another output`);
		if (columnOf(c.output) < 0) reject(`problem.constraints.${i}.output`, `"${c.output}" is not an output of "${ds.name}"; its outputs are ${outputs.map((o) => `"${o}"`).join(', ')}`);
	});

	const dataBox: [number, number][] = inputIndices.map((j) => {
		let lo = Infinity;
		let hi = -Infinity;
		for (const v of ds.data[j]) {
			if (v < lo) lo = v;
			if (v > hi) hi = v;
		}
		return [lo, hi];
	});
	const inputNames = inputIndices.map((j) => ds.columns[j].name);
	if (p.bounds && p.bounds.length !== n) {
		reject('problem.bounds', `give one [lo, hi] per input: ${p.bounds.length} given, and "${ds.name}" has ${n} input${n === 1 ? '' : 's'} (${inputNames.join(', ')})`);
	}
	const bounds: [number, number][] = p.bounds ? p.bounds.map(([lo, hi], j) => [lo ?? dataBox[j][0], hi ?? dataBox[j][1]]) : dataBox;
	bounds.forEach(([lo, hi], j) => {
		if (!(lo < hi)) reject(`problem.bounds.${j}`, `bounds [${fmt(lo)}, ${fmt(hi)}] on ${inputNames[j]}: the lower bound must be below the upper bound`);
	});

	// Every fit (objective and constraint outputs) is built now, on an offload thread
	// when the caller gives one: bad options and too-small data are the caller's to fix.
	const outputsNeeded = [input.output, ...constraints.map((c) => c.output)];
	const columns = Object.fromEntries(outputsNeeded.map((o) => [o, ds.data[columnOf(o)]]));
	const task: BuildTask | SurfaceBuildTask = surface
		? {
				kind: 'build-surface',
				inputs: inputIndices.map((j) => ds.data[j]),
				columns,
				fits: input.fits.map((spec) => ({ method: spec.method as SurfaceMethod, options: (spec.options ?? {}) as SurfaceFitOptions, outputs: outputsNeeded }))
			}
		: {
				kind: 'build',
				x: ds.data[inputIndex],
				columns,
				fits: input.fits.map((spec) => ({ method: spec.method as CurveMethod, options: (spec.options ?? {}) as CurveFitOptions, outputs: outputsNeeded }))
			};
	const build = args.buildFits ?? ((t: BuildTask | SurfaceBuildTask) => Promise.resolve(t.kind === 'build' ? buildFits(t) : buildSurfaceFits(t)));
	const result = await build(task);
	if (!result.ok) {
		const spec = input.fits[result.index];
		const field = surface && result.problem.kind === 'fit' && FIT_FIELD[result.problem.code] ? `fits.${result.index}.${FIT_FIELD[result.problem.code]}` : `fits.${result.index}`;
		// the numerics number the inputs from 1; the user knows them by name
		const own = result.problem.message.startsWith(`${spec.method}: `) ? result.problem.message.slice(spec.method.length + 2) : result.problem.message;
		const named = surface ? own.replace(/\binput (\d)\b/g, (m, k: string) => (inputNames[Number(k) - 1] ? `input ${k} ("${inputNames[Number(k) - 1]}")` : m)) : own;
		reject(field, `${spec.method} on "${result.output}": ${named}`);
	}
	const files = (result as Extract<BuildResult, { ok: true }>).fits;
	const built: { fit: { continuity: string; extrapolation: string }; fitFile: string; constraintFiles: string[] }[] = input.fits.map((spec, i) => {
		const [fitFile, ...constraintFiles] = files[i];
		const all = [fitFile, ...constraintFiles].map((j) => (surface ? surfaceFromJSON(j) : fitFromJSON(j)));
		for (const f of all) {
			if (f.extrapolation !== 'refuse') continue;
			const domain = (surface ? (f as SurfaceFit).domain : [(f as CurveFit).domain]) as readonly (readonly [number, number])[];
			bounds.forEach(([lo, hi], j) => {
				const [dlo, dhi] = domain[j];
				if (lo < dlo || hi > dhi) {
					reject(
						surface ? `problem.bounds.${j}` : 'problem.bounds',
						`bounds [${fmt(lo)}, ${fmt(hi)}]${surface ? ` on ${inputNames[j]}` : ''} go outside the data [${fmt(dlo)}, ${fmt(dhi)}] and fit ${i} (${spec.method}) uses the refuse extrapolation rule; narrow the bounds or set options.extrapolation`
					);
				}
			});
		}
		return { fit: all[0], fitFile, constraintFiles };
	});

	// bounds beyond the data (allowed with an extrapolation rule other than refuse): say so at launch
	const warnings: string[] = [];
	bounds.forEach(([lo, hi], j) => {
		const [dataLo, dataHi] = dataBox[j];
		if (lo < dataLo || hi > dataHi) {
			const rules = [...new Set(built.map((b) => b.fit.extrapolation))].join(', ');
			warnings.push(
				`the bounds [${fmt(lo)}, ${fmt(hi)}]${surface ? ` on ${inputNames[j]}` : ''} reach beyond the data [${fmt(dataLo)}, ${fmt(dataHi)}]: there the fits follow their extrapolation rule (${rules}), not the data, and runs that end there are flagged "outside the data"`
			);
		}
	});

	// tolerances below what double precision can reach run at the limit (the optimizer clamps them): say so
	input.optimizers.forEach((o, i) => {
		const opts = (o.options ?? {}) as Record<string, unknown>;
		for (const [k, floor] of [['gradTol', MIN_GRAD_TOL], ['stepTol', MIN_TOL], ['fTol', MIN_TOL], ['feasTol', MIN_TOL], ['residualTol', MIN_TOL]] as const) {
			const v = opts[k];
			if (typeof v === 'number' && v < floor) warnings.push(`optimizers.${i}.options.${k} = ${v} is below what double precision can reach; ${o.method} runs with ${floor}`);
		}
	});

	input.optimizers.forEach((o, i) => {
		const caps = OPTIMIZERS[o.method];
		if (!caps.kinds.includes(p.kind)) reject(`optimizers.${i}.method`, `${o.method} does not do ${p.kind} problems`);
		if (constraints.length && !caps.constraints) {
			const newtonSolve = o.method === 'newton' && p.kind === 'solve' && constraints.every((c) => c.op === '=');
			if (!newtonSolve) reject(`optimizers.${i}.method`, `${o.method} does not handle constraints such as "${constraints[0].output} ${constraints[0].op} ${constraints[0].value}"; use sqp, or drop the constraints`);
		}
	});

	input.starts.points?.forEach((pt, k) => {
		if (pt.length !== n) reject(`starts.points.${k}`, `start ${k} has ${pt.length} coordinate${pt.length === 1 ? '' : 's'}; "${ds.name}" has ${n} input${n === 1 ? '' : 's'} (${inputNames.join(', ')})`);
	});
	if (input.starts.grid !== undefined && input.starts.grid ** n > MAX_STARTS) {
		reject('starts.grid', `${input.starts.grid} starts per input over ${n} inputs make ${(input.starts.grid ** n).toLocaleString('en-US')} starts; a study takes at most ${MAX_STARTS.toLocaleString('en-US')}`);
	}
	let starts: number[][];
	try {
		starts = makeStarts(input.starts as Parameters<typeof makeStarts>[0], n, bounds);
	} catch (e) {
		return reject('starts', e instanceof Error ? e.message : String(e));
	}
	if (!starts.length) reject('starts', 'zero starts: give at least one');
	starts.forEach((s, k) => {
		s.forEach((v, j) => {
			if (v < bounds[j][0] || v > bounds[j][1]) reject(`starts.points.${k}`, `start ${fmt(v)}${n > 1 ? ` on ${inputNames[j]}` : ''} lies outside the bounds [${fmt(bounds[j][0])}, ${fmt(bounds[j][1])}]`);
		});
	});
	const runsTotal = input.fits.length * input.optimizers.length * starts.length;
	if (runsTotal > MAX_RUNS) reject('starts', `${runsTotal.toLocaleString('en-US')} runs; a study can have at most ${MAX_RUNS.toLocaleString('en-US')}`);

	const budgets = { ...DEFAULT_BUDGETS, ...(input.budgets ?? {}) };
	const spec: StudySpec = {
		problem: { kind: p.kind, ...(p.kind === 'solve' ? { target: p.target } : {}), bounds, boundsFromData: !p.bounds, constraints },
		fits: input.fits.map((f) => ({ method: f.method, options: (f.options ?? {}) as CurveFitOptions & SurfaceFitOptions })),
		optimizers: input.optimizers.map((o) => ({ method: o.method, options: o.options ?? {} })),
		starts: input.starts.points ? { points: input.starts.points } : input.starts.grid ? { grid: input.starts.grid } : { latinHypercube: input.starts.latinHypercube!, seed: input.starts.seed ?? 1 },
		budgets,
		...(warnings.length ? { warnings } : {}),
		dataset: {
			id: ds.id,
			name: ds.name,
			version: ds.version,
			input: { name: ds.columns[inputIndex].name, unit: ds.columns[inputIndex].unit },
			inputs: inputIndices.map((j) => ({ name: ds.columns[j].name, unit: ds.columns[j].unit })),
			shape: ds.shape,
			output: { name: input.output, unit: ds.columns[outputIndex].unit }
		}
	};
	const verb = p.kind === 'solve' ? `solve ${input.output} = ${p.target}` : `${p.kind} ${input.output}`;
	const name = input.name ?? `${ds.name}: ${verb}`;

	let queued: StudyJob[] = [];
	const id = await db.transaction(async (trx) => {
		const [study] = await trx('studies')
			.insert({
				workspace_id: args.workspaceId,
				name,
				dataset_id: ds.id,
				output: input.output,
				spec: JSON.stringify(spec),
				n_inputs: n,
				start_count: starts.length,
				starts: packStarts(starts, n),
				runs_total: runsTotal,
				audits_total: input.fits.length,
				queue,
				origin: args.origin,
				created_by: args.userId
			})
			.returning('id');
		const fitRows = await trx('study_fits')
			.insert(
				input.fits.map((f, i) => ({
					study_id: study.id,
					position: i,
					method: f.method,
					options: JSON.stringify(f.options ?? {}),
					continuity: built[i].fit.continuity,
					fit: built[i].fitFile,
					constraint_fits: `[${built[i].constraintFiles.join(',')}]`
				}))
			)
			.returning(['id', 'position']);
		const fitIds = fitRows.sort((a, b) => a.position - b.position).map((r) => r.id as string);
		const jobs = fitIds.map((fitId) => auditJob(queue, { kind: 'audit', studyId: study.id, fitId }));
		const chunk = startsPerJob(input.optimizers.length);
		const maxMs = Math.max(...spec.optimizers.map((o) => Number(o.options.maxMilliseconds ?? budgets.maxMilliseconds)));
		for (const fitId of fitIds) {
			for (let from = 0; from < starts.length; from += chunk) {
				jobs.push(runsJob(queue, { kind: 'runs', studyId: study.id, fitId, from, to: Math.min(starts.length, from + chunk) }, maxMs * input.optimizers.length));
			}
		}
		queued = jobs.map((j) => j.data as StudyJob);
		if (args.enqueue !== false) for (let i = 0; i < jobs.length; i += 1000) await insertJobs(trx, jobs.slice(i, i + 1000));
		return study.id as string;
	});
	return { id, status: 'queued', runs: runsTotal, jobs: queued, warnings };
}
