import type { Knex } from 'knex';
import { launchStudy } from '../src/lib/server/studies/launch';
import { runStudyJob } from '../src/lib/server/studies/queue/runner';
import { studyInputSchema } from '../src/lib/server/studies/launchRequest';
import { scorecard } from '../src/lib/server/studies/scorecard';
import * as store from '../src/lib/server/studies/store';
import { DEMO_EMAIL, DEMO_WORKSPACE } from './01_demo_accounts';

// One finished study per demo dataset of the invented "Larkmoor Aero"
// workspace (the four curves and the motor map over torque × speed), so a newcomer lands on results. The runs are computed here, in
// this process, by the same job runner the workers use (no queue at seed
// time). Idempotent: a study already done under its name is left alone; an
// unfinished one (an interrupted seed) is made again. Each finished study gets
// a recorded pick — the scorecard's first-ranked fit, with a rationale written
// from its own verdict and numbers — so the demo tells the story to its end.

type Plan = { dataset: string; output: RegExp; name: string; problem: Record<string, unknown>; optimizers: string[]; fits?: string[] };

const SOLVERS = ['newton', 'sqp', 'bfgs'];
const OPTIMIZERS = ['sqp', 'bfgs', 'nelder-mead'];
const PLANS: Plan[] = [
	{ dataset: 'Propeller efficiency vs advance ratio', output: /^eta/i, name: 'Propeller: peak efficiency', problem: { kind: 'maximize' }, optimizers: OPTIMIZERS },
	{ dataset: 'Battery pack voltage vs state of charge', output: /voltage/i, name: 'Battery pack: charge at the 300 V cut-off', problem: { kind: 'solve', target: 300 }, optimizers: SOLVERS },
	{ dataset: 'Wing drag coefficient vs lift coefficient', output: /^CD/i, name: 'Wing: minimum drag', problem: { kind: 'minimize' }, optimizers: OPTIMIZERS },
	{ dataset: 'Cooling-fan pressure rise vs flow', output: /pressure/i, name: 'Cooling fan: flow at 250 Pa', problem: { kind: 'solve', target: 250 }, optimizers: SOLVERS },
	// two inputs: the bilinear fit's gradient jumps on every grid line, so its runs stall there; the tensor cubics
	// converge. Speeds from 3,500 rpm up (the cruise end of the map), where the smooth fits have one optimum each
	// but the natural spline, whose end conditions add a second along the top edge.
	{
		dataset: 'Motor efficiency map',
		output: /efficiency/i,
		name: 'Motor: peak efficiency over torque × speed',
		problem: { kind: 'maximize', bounds: [[null, null], [3500, 4000]] },
		optimizers: ['sqp', 'bfgs'],
		fits: ['grid-linear', 'grid-pchip', 'grid-akima', 'grid-cubic-natural', 'grid-cubic-not-a-knot']
	}
];
const FITS = ['linear', 'pchip', 'akima', 'cubic-natural', 'softened-linear', 'smoothing-spline'];

export async function seed(knex: Knex): Promise<void> {
	const ws = await knex('workspaces').where({ slug: DEMO_WORKSPACE }).first('id');
	const user = await knex('users').where({ email: DEMO_EMAIL }).first('id');
	if (!ws) throw new Error(`seed 03: the demo workspace "${DEMO_WORKSPACE}" is missing; run seed 01 first`);
	const datasets: { id: string; name: string; shape: string; columns: { name: string; role: string }[] }[] = await knex('datasets')
		.where({ workspace_id: ws.id })
		.whereNull('archived_at')
		.orderBy([{ column: 'name' }, { column: 'version', order: 'desc' }])
		.select('id', 'name', 'shape', 'columns');
	if (!datasets.length) {
		console.log('seed 03: no demo datasets in the demo workspace yet; no demo studies made');
		return;
	}

	for (const plan of PLANS) {
		const d = datasets.find((x) => x.name === plan.dataset); // newest version first
		if (!d) {
			console.log(`seed 03: no dataset "${plan.dataset}" in the demo workspace; skipped`);
			continue;
		}
		const output = d.columns.find((c) => c.role === 'output' && plan.output.test(c.name))?.name ?? d.columns.find((c) => c.role === 'output')?.name;
		if (!output) continue;
		const existing = await knex('studies').where({ workspace_id: ws.id, name: plan.name }).first('id', 'status', 'pick_fit_id');
		if (existing?.status === 'done') {
			if (!existing.pick_fit_id && user) await recordPick(knex, existing.id, user.id);
			continue;
		}
		if (existing) await knex('studies').where({ id: existing.id }).delete();

		const input = studyInputSchema.parse({
			name: plan.name,
			datasetId: d.id,
			output,
			problem: plan.problem,
			fits: (plan.fits ?? FITS).map((method) => ({ method })),
			optimizers: plan.optimizers.map((method) => ({ method })),
			starts: { latinHypercube: 20, seed: 1 }
		});
		const { id, jobs } = await launchStudy(knex, { workspaceId: ws.id, userId: user?.id ?? null, origin: '', input, enqueue: false });
		const ctx = { db: knex, worker: 'seed', sendJobs: null, softMs: Infinity };
		for (const job of jobs) await runStudyJob(ctx, job);
		const s = await knex('studies').where({ id }).first('status', 'runs_done', 'runs_total');
		console.log(`seed 03: "${plan.name}": ${s.runs_done} of ${s.runs_total} runs, ${s.status}`);
		if (s.status === 'done' && user) await recordPick(knex, id, user.id);
	}
}

/** The first-ranked fit, picked with a rationale made of its own scorecard row. */
async function recordPick(knex: Knex, studyId: string, userId: string): Promise<void> {
	const study = await store.get(knex, studyId);
	if (!study) return;
	const rows = await scorecard(knex, study, await store.fits(knex, studyId));
	const top = rows[0];
	if (!top) return;
	const concerns = top.verdict.concerns.map((c) => c.text).join('; ');
	const rationale =
		`${top.method} with ${top.optimizer} ranks first: ${top.verdict.label}${concerns ? ` (${concerns})` : ''}. ` +
		`${Math.round(top.successRate * 100)}% of ${top.runs} runs converge; measured ${top.continuity.measured ?? top.continuity.declared}` +
		`${top.fidelity?.looRmse != null ? `; leave-one-out RMSE ${Number(top.fidelity.looRmse.toPrecision(3))}` : ''}. ` +
		`Demo pick made by the seed from the scorecard; check it against the source data before any design use.`;
	await store.pick(knex, studyId, top.fitId, rationale, userId);
	console.log(`seed 03: picked ${top.method} for study ${studyId}`);
}
