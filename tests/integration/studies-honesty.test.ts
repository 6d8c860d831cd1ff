// Honest outcomes through the API, against the built app and a real database:
// - a legal option far below double precision (conjugate-gradient with
//   gradTol 1e-300) never fails a study: it finishes with every run stored,
//   each with one of the five outcomes, and every `converged` run has a small
//   f′ on the fit itself (read back through the fit export, independently of
//   the run's own numbers);
// - bounds wider than the data with the `hold` rule: the launch warns, runs
//   that end on the flat extension are flagged "outside the data" (runs API,
//   scorecard, study page), and they are not counted as successes;
// - Nelder–Mead on the linear fit's corner: at-kink counted for it too, and
//   the linear fit's success is not 100 %.
// Table: the invented coarse propeller sweep of studiesFixtures.ts.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadFitExport } from '../../src/lib/numerics/export';
import type { CurveFit } from '../../src/lib/numerics/fits/types';
import { json, testDb } from './client';
import { dataset, team, waitFor, type ErrorBody, type RunBody, type StudyBody } from './studiesFixtures';

const OUTCOMES = ['converged', 'stalled', 'iteration-limit', 'left-domain', 'diverged'];
const PEAK_KNOT = 0.9;

let t: Awaited<ReturnType<typeof team>>;
let datasetId: string;

beforeAll(async () => {
	t = await team('honest');
	datasetId = await dataset(t.editor.client, t.ws.slug);
});
afterAll(async () => {
	await testDb().destroy();
});

type Scored = StudyBody['scorecard'][number] & { outsideData: number };
type Run = RunBody & { outsideData: boolean; reason: string };

async function launchWith(body: unknown): Promise<{ id: string; warnings: string[] }> {
	const r = await t.editor.client.post(`/api/v1/workspaces/${t.ws.slug}/studies`, body);
	const j = await json<{ id: string; status: string; warnings: string[] } & ErrorBody>(r);
	expect(r.status, JSON.stringify(j)).toBe(202);
	return { id: j.id, warnings: j.warnings };
}

async function allRuns(id: string): Promise<Run[]> {
	const r = await t.editor.client.get(`/api/v1/studies/${id}/runs?limit=10000`);
	const j = await json<{ runs: Run[] }>(r);
	expect(r.status).toBe(200);
	return j.runs;
}

async function fitOf(studyId: string, fitId: string): Promise<CurveFit> {
	const r = await t.editor.client.get(`/api/v1/studies/${studyId}/fits/${fitId}/export?format=json`);
	expect(r.status).toBe(200);
	return (await loadFitExport(await r.text())).fit;
}

describe('a tolerance below double precision', () => {
	it('conjugate-gradient (and the others) with gradTol 1e-300: the study finishes with every run stored and honest outcomes', { timeout: 180_000 }, async () => {
		const tiny = { gradTol: 1e-300, stepTol: 1e-300, fTol: 1e-300 };
		const { id, warnings } = await launchWith({
			name: 'Tiny tolerances',
			datasetId,
			output: 'eta',
			problem: { kind: 'maximize' },
			fits: [{ method: 'linear' }, { method: 'pchip' }, { method: 'cubic-natural' }],
			optimizers: [{ method: 'conjugate-gradient', options: { gradTol: 1e-300 } }, { method: 'bfgs', options: tiny }, { method: 'nelder-mead', options: tiny }, { method: 'sqp', options: tiny }],
			starts: { latinHypercube: 12, seed: 3 },
			budgets: { maxMilliseconds: 500 }
		});
		// the clamp is said at launch, naming the option and the limit used
		expect(warnings).toContain('optimizers.0.options.gradTol = 1e-300 is below what double precision can reach; conjugate-gradient runs with 1e-15');
		expect(warnings.join(' ')).toMatch(/optimizers\.1\.options\.stepTol = 1e-300 .* bfgs runs with 1e-16/);
		const s = await waitFor(t.editor.client, id, undefined, 150_000);
		expect(s.status, s.error ?? '').toBe('done');
		expect(s.progress.done).toBe(s.progress.total);
		const runs = await allRuns(id);
		expect(runs.length).toBe(3 * 4 * 12);
		const fits = new Map<string, CurveFit>();
		for (const f of s.fits) fits.set(f.id, await fitOf(id, f.id));
		for (const r of runs) {
			const label = `${r.method} ${r.optimizer} from ${r.start}: ${r.outcome} (${r.reason})`;
			expect(OUTCOMES, label).toContain(r.outcome);
			if (r.outcome !== 'converged' || r.atKink) continue;
			// independent check on the fit itself: an interior converged maximum has f′ ≈ 0
			const fit = fits.get(r.fitId)!;
			const x = r.x[0];
			if (x <= 0.1 || x >= 1.5) continue;
			const tol = r.optimizer === 'nelder-mead' ? 1e-6 : 1.01e-8 * Math.max(1, Math.abs(fit.evaluate(r.start[0]).df));
			expect(Math.abs(fit.evaluate(x).df), label).toBeLessThanOrEqual(tol);
		}
	});
});

describe('bounds wider than the data, hold rule', () => {
	it('warns at launch; runs ending on the extension are flagged outside the data on the runs API, the scorecard and the study page', { timeout: 180_000 }, async () => {
		const { id, warnings } = await launchWith({
			name: 'Beyond the data',
			datasetId,
			output: 'eta',
			problem: { kind: 'minimize', bounds: [[0.1, 3]] },
			fits: [{ method: 'pchip', options: { extrapolation: 'hold' } }],
			optimizers: [{ method: 'bfgs' }, { method: 'sqp' }, { method: 'nelder-mead' }],
			starts: { points: [[0.5], [1.2], [1.8], [2.5]] },
			budgets: { maxMilliseconds: 500 }
		});
		expect(warnings.join(' ')).toMatch(/reach beyond the data \[0\.1, 1\.5\]/);
		const s = await waitFor(t.editor.client, id);
		expect(s.status, s.error ?? '').toBe('done');
		const runs = await allRuns(id);
		expect(runs.length).toBe(12);
		let outside = 0;
		for (const r of runs) {
			const beyond = r.x[0] > 1.5;
			expect(r.outsideData, `${r.optimizer} from ${r.start}: ${r.outcome} at ${r.x[0]} (${r.reason})`).toBe(beyond);
			if (beyond) outside++;
		}
		// starts on the flat extension stay there (f′ = 0): at least those two per optimizer
		expect(outside).toBeGreaterThanOrEqual(6);
		const rows = s.scorecard as Scored[];
		for (const row of rows) {
			const mine = runs.filter((r) => r.optimizer === row.optimizer);
			expect(row.outsideData).toBe(mine.filter((r) => r.outsideData).length);
			const clean = mine.filter((r) => r.outcome === 'converged' && !r.outsideData && !r.atKink).length;
			expect(row.successRate).toBeCloseTo(clean / mine.length, 12);
		}
		const page = await t.editor.client.get(`/w/${t.ws.slug}/studies/${id}`);
		const html = await page.text();
		expect(page.status).toBe(200);
		expect(html).toContain('data-testid="launch-warning"');
		expect(html).toMatch(/runs end outside the data/);
	});
});

describe('Nelder–Mead at the linear fit’s corner', () => {
	it('its runs ending on the peak knot are counted at a kink, and the linear fit is not shown at 100 % success', { timeout: 120_000 }, async () => {
		const { id } = await launchWith({
			name: 'Derivative-free at a kink',
			datasetId,
			output: 'eta',
			problem: { kind: 'maximize' },
			fits: [{ method: 'linear' }],
			optimizers: [{ method: 'nelder-mead' }],
			starts: { latinHypercube: 10, seed: 2 },
			budgets: { maxMilliseconds: 500 }
		});
		const s = await waitFor(t.editor.client, id);
		expect(s.status, s.error ?? '').toBe('done');
		const runs = await allRuns(id);
		const atPeak = runs.filter((r) => Math.abs(r.x[0] - PEAK_KNOT) <= 1e-6);
		expect(atPeak.length).toBeGreaterThan(0);
		for (const r of atPeak) expect(r.atKink, `${r.outcome} at ${r.x[0]}`).toBe(true);
		const row = s.scorecard[0];
		expect(row.atKink).toBe(runs.filter((r) => r.atKink).length);
		expect(row.successRate).toBeLessThan(1);
	});
});
