/**
 * What the API and the pages show of a study. Paths are never included: the
 * page fetches one when the reader opens a run.
 */
import type { Knex } from 'knex';
import { getWithData } from '../datasets/store';
import { surfaceFromJSON } from '../../numerics/fits/surfaceFile';
import { scorecard } from './scorecard';
import type { StudyPage } from '../../domain/wire';
export type { StudyPage } from '../../domain/wire';
import * as store from './store';
import type { Study } from './store';

type Db = Knex | Knex.Transaction;

/** `GET /api/v1/studies/:id` and `GET /api/v1/shared/:token` */
export async function studyJson(db: Db, study: Study) {
	const fits = await store.fits(db, study.id);
	const card = await scorecard(db, study, fits);
	return {
		id: study.id,
		name: study.name,
		status: study.status,
		progress: study.progress,
		scorecard: card,
		pick: study.pick,
		dataset: { id: study.datasetId, name: study.spec.dataset.name, version: study.spec.dataset.version },
		output: study.output,
		problem: study.spec.problem,
		fits: fits.map((f) => ({
			id: f.id,
			method: f.method,
			options: f.options,
			continuity: { declared: f.continuity, measured: f.smoothness?.measured ?? null },
			smoothness: f.smoothness,
			fidelity: f.fidelity,
			reference: f.reference
		})),
		optimizers: study.spec.optimizers,
		starts: study.spec.starts,
		budgets: study.spec.budgets,
		audits: study.audits,
		error: study.error,
		createdAt: study.createdAt,
		startedAt: study.startedAt,
		finishedAt: study.finishedAt
	};
}

/** Points per input of a fit's map over the bounds (studies over two inputs). */
const MAP_POINTS = 41;
/** Most data points the chart gets (a long curve is thinned evenly). */
const CHART_POINTS = 2000;
/** Most runs a page carries; beyond this the page shows the scorecard and pages runs through the API. */
const PAGE_RUNS = 20_000;


const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);

export async function studyPage(db: Db, study: Study): Promise<StudyPage> {
	const finished = !store.isActive(study.status);
	const [fits, dataset] = await Promise.all([store.fits(db, study.id, true), getWithData(db, study.datasetId)]);
	const [card, runs] = await Promise.all([
		scorecard(db, study, fits),
		finished && study.progress.done <= PAGE_RUNS ? store.runColumns(db, study, fits.map((f) => f.id)) : Promise.resolve(null)
	]);
	// studies over two inputs: each fit mapped over the bounds, for the paths-on-the-map view
	if (study.spec.problem.bounds.length === 2 && study.spec.dataset.shape && study.spec.dataset.shape !== 'curve') {
		const rows = await db('study_fits').where({ study_id: study.id }).select('id', 'fit');
		const [[a0, a1], [b0, b1]] = study.spec.problem.bounds;
		const axis = (lo: number, hi: number) => Array.from({ length: MAP_POINTS }, (_, i) => (i === MAP_POINTS - 1 ? hi : lo + ((hi - lo) * i) / (MAP_POINTS - 1)));
		const x = axis(a0, a1);
		const y = axis(b0, b1);
		for (const r of rows) {
			const fit = surfaceFromJSON(r.fit);
			const at = fits.find((f) => f.id === r.id);
			if (!at) continue;
			at.map = {
				x,
				y,
				f: y.map((yv) =>
					x.map((xv) => {
						try {
							const v = fit.value([xv, yv]);
							return Number.isFinite(v) ? v : null;
						} catch {
							return null; // outside the data under the refuse rule
						}
					})
				)
			};
		}
	}
	let data: StudyPage['data'] = null;
	if (dataset) {
		const inputIdx = dataset.columns.flatMap((c, j) => (c.role === 'input' ? [j] : []));
		const xi = inputIdx[0] ?? -1;
		const yi = dataset.columns.findIndex((c) => c.name === study.output);
		if (xi >= 0 && yi >= 0) {
			const step = Math.max(1, Math.ceil(dataset.rowCount / CHART_POINTS));
			const x: number[] = [];
			const y: number[] = [];
			const inputs: number[][] = inputIdx.map(() => []);
			for (let i = 0; i < dataset.rowCount; i += step) {
				x.push(dataset.data[xi][i]);
				y.push(dataset.data[yi][i]);
				if (inputIdx.length > 1) inputIdx.forEach((j, k) => inputs[k].push(dataset.data[j][i]));
			}
			// tables of several inputs: every input column too (the end-point charts draw the data points in the inputs' plane)
			data = inputIdx.length > 1 ? { x, y, inputs } : { x, y };
		}
	}
	return {
		study: {
			id: study.id,
			name: study.name,
			status: study.status,
			progress: study.progress,
			audits: study.audits,
			error: study.error,
			output: study.output,
			spec: study.spec,
			createdBy: study.createdBy?.name ?? null,
			createdAt: iso(study.createdAt)!,
			startedAt: iso(study.startedAt),
			finishedAt: iso(study.finishedAt),
			pick: study.pick
		},
		fits,
		scorecard: card,
		runs,
		data
	};
}
