/**
 * Launch a study: check the request against the dataset (beyond what the
 * schema can see), build every fit once to catch bad options now rather than
 * in a worker, then store the study, its fits and all its jobs in one
 * transaction. Nothing is stored when any check fails.
 * Relative imports only (the benchmark and tests load this through tsx).
 */
import type { Knex } from 'knex';
import { fitFromJSON } from '../../numerics/fits/fitCurve';
import type { CurveFit, CurveFitOptions, CurveMethod } from '../../numerics/fits/types';
import { OPTIMIZERS } from '../../numerics/optimize/optimize';
import { MIN_GRAD_TOL, MIN_TOL } from '../../numerics/optimize/run';
import { makeStarts } from '../../numerics/optimize/starts';
import { getWithData } from '../datasetStore';
import { buildFits, type BuildResult, type BuildTask } from '../offload/fitWork';
import { insertJobs, queueName } from './boss';
import { auditJob, runsJob, startsPerJob, type StudyJob } from './jobs';
import { packStarts } from './runner';
import { DEFAULT_BUDGETS, MAX_RUNS, type StudyInput } from './schema';
import type { StudySpec } from './spec';

/** Largest curve a study takes: every fit is built when the study is launched. */
export const MAX_STUDY_ROWS = 20_000;

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

export interface LaunchArgs {
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
	buildFits?: (task: BuildTask) => Promise<BuildResult>;
}

export async function launchStudy(db: Knex, args: LaunchArgs): Promise<{ id: string; status: 'queued'; runs: number; jobs: StudyJob[]; warnings: string[] }> {
	const { input } = args;
	const queue = args.queue ?? queueName();
	const dataset = await getWithData(db, input.datasetId);
	if (!dataset || dataset.workspaceId !== args.workspaceId) reject('datasetId', 'no dataset with this id in this workspace');
	const ds = dataset!;
	if (ds.shape !== 'curve') reject('datasetId', `only curve datasets can be studied yet; "${ds.name}" is a ${ds.shape} dataset`);
	if (ds.rowCount > MAX_STUDY_ROWS) reject('datasetId', `"${ds.name}" has ${ds.rowCount.toLocaleString('en-US')} rows; a study takes curves of up to ${MAX_STUDY_ROWS.toLocaleString('en-US')} rows`);
	const inputIndex = ds.columns.findIndex((c) => c.role === 'input');
	const outputs = ds.columns.filter((c) => c.role === 'output').map((c) => c.name);
	const columnOf = (name: string) => ds.columns.findIndex((c) => c.name === name && c.role === 'output');
	const outputIndex = columnOf(input.output);
	if (outputIndex < 0) reject('output', `"${input.output}" is not an output of "${ds.name}"; its outputs are ${outputs.map((o) => `"${o}"`).join(', ')}`);

	const p = input.problem;
	const constraints = p.constraints ?? [];
	constraints.forEach((c, i) => {
		if (c.output === input.output) reject(`problem.constraints.${i}.output`, `"${c.output}" is the output being optimized; a constraint limits another output`);
		if (columnOf(c.output) < 0) reject(`problem.constraints.${i}.output`, `"${c.output}" is not an output of "${ds.name}"; its outputs are ${outputs.map((o) => `"${o}"`).join(', ')}`);
	});

	const x = ds.data[inputIndex];
	let dataLo = Infinity;
	let dataHi = -Infinity;
	for (const v of x) {
		if (v < dataLo) dataLo = v;
		if (v > dataHi) dataHi = v;
	}
	const n = 1;
	if (p.bounds && p.bounds.length !== n) reject('problem.bounds', `give one [lo, hi] per input: this curve has ${n} input (${ds.columns[inputIndex].name})`);
	const bounds: [number, number][] = p.bounds ? p.bounds.map(([lo, hi]) => [lo ?? dataLo, hi ?? dataHi]) : [[dataLo, dataHi]];
	if (!(bounds[0][0] < bounds[0][1])) reject('problem.bounds.0', `bounds [${fmt(bounds[0][0])}, ${fmt(bounds[0][1])}]: the lower bound must be below the upper bound`);

	// Every fit (objective and constraint outputs) is built now, on an offload thread
	// when the caller gives one: bad options and too-small data are the caller's to fix.
	const outputsNeeded = [input.output, ...constraints.map((c) => c.output)];
	const task: BuildTask = {
		kind: 'build',
		x,
		columns: Object.fromEntries(outputsNeeded.map((o) => [o, ds.data[columnOf(o)]])),
		fits: input.fits.map((spec) => ({ method: spec.method as CurveMethod, options: (spec.options ?? {}) as CurveFitOptions, outputs: outputsNeeded }))
	};
	const result = await (args.buildFits ?? ((t: BuildTask) => Promise.resolve(buildFits(t))))(task);
	if (!result.ok) {
		const spec = input.fits[result.index];
		reject(`fits.${result.index}`, `${spec.method} on "${result.output}": ${result.problem.message}`);
	}
	const files = (result as Extract<BuildResult, { ok: true }>).fits;
	const built: { fit: CurveFit; fitFile: string; constraintFiles: string[] }[] = input.fits.map((spec, i) => {
		const [fitFile, ...constraintFiles] = files[i];
		const fit = fitFromJSON(fitFile);
		for (const f of [fit, ...constraintFiles.map((c) => fitFromJSON(c))]) {
			const [lo, hi] = bounds[0];
			if (f.extrapolation === 'refuse' && (lo < f.domain[0] || hi > f.domain[1])) {
				reject(
					'problem.bounds',
					`bounds [${fmt(lo)}, ${fmt(hi)}] go outside the data [${fmt(f.domain[0])}, ${fmt(f.domain[1])}] and fit ${i} (${spec.method}) uses the refuse extrapolation rule; narrow the bounds or set options.extrapolation`
				);
			}
		}
		return { fit, fitFile, constraintFiles };
	});

	// bounds beyond the data (allowed with an extrapolation rule other than refuse): say so at launch
	const warnings: string[] = [];
	{
		const [lo, hi] = bounds[0];
		if (lo < dataLo || hi > dataHi) {
			const rules = [...new Set(built.map((b) => b.fit.extrapolation))].join(', ');
			warnings.push(
				`the bounds [${fmt(lo)}, ${fmt(hi)}] reach beyond the data [${fmt(dataLo)}, ${fmt(dataHi)}]: there the fits follow their extrapolation rule (${rules}), not the data, and runs that end there are flagged "outside the data"`
			);
		}
	}

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

	let starts: number[][];
	try {
		starts = makeStarts(input.starts as Parameters<typeof makeStarts>[0], n, bounds);
	} catch (e) {
		return reject('starts', e instanceof Error ? e.message : String(e));
	}
	if (!starts.length) reject('starts', 'zero starts: give at least one');
	starts.forEach((s, k) => {
		s.forEach((v, j) => {
			if (v < bounds[j][0] || v > bounds[j][1]) reject(`starts.points.${k}`, `start ${fmt(v)} lies outside the bounds [${fmt(bounds[j][0])}, ${fmt(bounds[j][1])}]`);
		});
	});
	const runsTotal = input.fits.length * input.optimizers.length * starts.length;
	if (runsTotal > MAX_RUNS) reject('starts', `${runsTotal.toLocaleString('en-US')} runs; a study can have at most ${MAX_RUNS.toLocaleString('en-US')}`);

	const budgets = { ...DEFAULT_BUDGETS, ...(input.budgets ?? {}) };
	const spec: StudySpec = {
		problem: { kind: p.kind, ...(p.kind === 'solve' ? { target: p.target } : {}), bounds, boundsFromData: !p.bounds, constraints },
		fits: input.fits.map((f) => ({ method: f.method, options: (f.options ?? {}) as CurveFitOptions })),
		optimizers: input.optimizers.map((o) => ({ method: o.method, options: o.options ?? {} })),
		starts: input.starts.points ? { points: input.starts.points } : input.starts.grid ? { grid: input.starts.grid } : { latinHypercube: input.starts.latinHypercube!, seed: input.starts.seed ?? 1 },
		budgets,
		...(warnings.length ? { warnings } : {}),
		dataset: {
			id: ds.id,
			name: ds.name,
			version: ds.version,
			input: { name: ds.columns[inputIndex].name, unit: ds.columns[inputIndex].unit },
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
