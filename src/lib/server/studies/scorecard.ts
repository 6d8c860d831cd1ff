/**
 * The scorecard: one row per fit × optimizer over all its runs, ranked by the
 * verdict rule in RANK_RULE (the study page prints it; see verdict.ts). Counts and medians are
 * aggregated in PostgreSQL so a study of 100,000 runs is scored without
 * loading them.
 */
import type { Knex } from 'knex';
import type { Study, StudyFit } from './store';
import { rankByVerdict, separateOptima, separateOptimaN, THRESHOLDS, VERDICT_RULE, verdict } from '../../domain/verdict';

type Db = Knex | Knex.Transaction;

export const RANK_RULE = VERDICT_RULE;

/** a best end point within this share of the fit's range of f from the reference counts as reaching it */
const REFERENCE_TOLERANCE = 1e-6;

import { OUTCOMES } from '../../domain/outcomes';
import type { Monotone, ScorecardRow } from '../../domain/wire';
export type { Monotone, ScorecardRow } from '../../domain/wire';
export { OUTCOMES };


const num = (v: unknown): number | null => (v === null || v === undefined ? null : Number.isFinite(Number(v)) ? Number(v) : null);

export async function scorecard(db: Db, study: Pick<Study, 'id' | 'spec'>, fits: StudyFit[]): Promise<ScorecardRow[]> {
	const { kind, target } = study.spec.problem;
	const stats = await db.raw(
		`SELECT fit_id, optimizer, count(*)::int AS runs,
			${OUTCOMES.map((o) => `count(*) FILTER (WHERE outcome = '${o}')::int AS "${o}"`).join(', ')},
			count(*) FILTER (WHERE at_kink)::int AS at_kink,
			count(*) FILTER (WHERE outcome = 'converged' AND NOT at_kink AND NOT outside_data)::int AS converged_smooth,
			count(*) FILTER (WHERE outside_data)::int AS outside_data,
			percentile_cont(0.5) WITHIN GROUP (ORDER BY iterations) AS median_iterations,
			percentile_cont(0.5) WITHIN GROUP (ORDER BY evals_f) AS median_evaluations,
			min(f) FILTER (WHERE outcome = 'converged') AS f_lo, max(f) FILTER (WHERE outcome = 'converged') AS f_hi,
			min(x[1]) FILTER (WHERE outcome = 'converged') AS x_lo, max(x[1]) FILTER (WHERE outcome = 'converged') AS x_hi
		FROM study_runs WHERE study_id = ? GROUP BY fit_id, optimizer`,
		[study.id]
	);
	// the best end point per group: converged runs first, then by the problem's own measure
	const measure = kind === 'maximize' ? '-f' : kind === 'solve' ? 'abs(f - ?)' : 'f';
	const best = await db.raw(
		`SELECT DISTINCT ON (fit_id, optimizer) fit_id, optimizer, id, x, f, outcome = 'converged' AS converged
		FROM study_runs
		WHERE study_id = ? AND f > '-Infinity'::float8 AND f < 'Infinity'::float8
		ORDER BY fit_id, optimizer, (outcome = 'converged') DESC, ${measure} ASC, id`,
		kind === 'solve' ? [study.id, target ?? 0] : [study.id]
	);
	// converged end points in buckets of THRESHOLDS.separate × the bounds' width, merged into separate optima below
	const [lo, hi] = study.spec.problem.bounds[0];
	const width = Math.max((hi - lo) * THRESHOLDS.separate, Number.MIN_VALUE);
	const buckets = await db.raw(
		`SELECT fit_id, optimizer, floor((x[1] - ?) / ?)::float8 AS bucket, count(*)::int AS n
		FROM study_runs WHERE study_id = ? AND outcome = 'converged' AND x[1] > '-Infinity'::float8 AND x[1] < 'Infinity'::float8
		GROUP BY 1, 2, 3`,
		[lo, width, study.id]
	);
	const bucketsOf = new Map<string, { bucket: number; n: number }[]>();
	for (const b of buckets.rows) {
		const k = `${b.fit_id}/${b.optimizer}`;
		if (!bucketsOf.has(k)) bucketsOf.set(k, []);
		bucketsOf.get(k)!.push({ bucket: Number(b.bucket), n: b.n });
	}
	// two or more inputs: optima separated in every input, and the spread of x* per input
	const bounds = study.spec.problem.bounds;
	const several = bounds.length > 1;
	const endsOf = new Map<string, number[][]>();
	if (several) {
		const ends = await db.raw(`SELECT fit_id, optimizer, x FROM study_runs WHERE study_id = ? AND outcome = 'converged'`, [study.id]);
		for (const e of ends.rows) {
			const k = `${e.fit_id}/${e.optimizer}`;
			if (!endsOf.has(k)) endsOf.set(k, []);
			endsOf.get(k)!.push((e.x as unknown[]).map(Number));
		}
	}
	const widths = bounds.map(([l, h]) => Math.max((h - l) * THRESHOLDS.separate, Number.MIN_VALUE));
	const spreadOf = (xs: number[][]) => bounds.map((_, k) => Math.max(...xs.map((x) => x[k])) - Math.min(...xs.map((x) => x[k])));
	const bestOf = new Map<string, { id: string; x: number[]; f: number; converged: boolean }>();
	for (const b of best.rows) bestOf.set(`${b.fit_id}/${b.optimizer}`, b);
	const fitOf = new Map(fits.map((f) => [f.id, f]));

	const looOf = (f: StudyFit | undefined) => (f?.fidelity && !f.fidelity.error ? num(f.fidelity.looRmse) : null);
	const looAll = fits.map(looOf).filter((v): v is number => v !== null);
	const bestLoo = looAll.length ? Math.min(...looAll) : null;

	const rows: Omit<ScorecardRow, 'rank'>[] = stats.rows.map((s: Record<string, unknown>) => {
		const fit = fitOf.get(s.fit_id as string)!;
		const b = bestOf.get(`${s.fit_id}/${s.optimizer}`);
		const runs = s.runs as number;
		const ref = fit?.reference && !fit.reference.error && fit.reference.x ? fit.reference : null;
		let gap: ScorecardRow['gap'] = null;
		let reaches: boolean | null = null;
		if (b && ref) {
			const points = kind === 'solve' && ref.roots?.length ? ref.roots.map((r) => [r]) : [ref.x!];
			const dx = Math.min(...points.map((p) => Math.max(...p.map((v, j) => Math.abs((b.x[j] ?? NaN) - v)))));
			const sense = kind === 'maximize' ? -1 : 1;
			const shortfall = kind === 'solve' ? Math.abs(b.f - (target ?? 0)) : Math.max(0, sense * (b.f - (ref.f ?? b.f)));
			gap = { x: Number.isFinite(dx) ? dx : null, f: shortfall };
			const scale = ref.fRange > 0 ? ref.fRange : Math.max(1, Math.abs(ref.f ?? 1));
			reaches = shortfall <= REFERENCE_TOLERANCE * scale;
		}
		const converged = s.converged as number;
		const fidelity: ScorecardRow['fidelity'] =
			fit?.fidelity && !fit.fidelity.error
				? { looRmse: num(fit.fidelity.looRmse), overshoot: num(fit.fidelity.overshoot), overshootRelative: num(fit.fidelity.overshootRelative), monotoneKept: fit.fidelity.monotoneKept ?? null, spuriousExtrema: num(fit.fidelity.spuriousExtrema) }
				: null;
		const monotone = monotoneOf(fit);
		const continuity = { declared: fit?.continuity ?? '?', measured: fit?.smoothness?.error ? null : (fit?.smoothness?.measured ?? null) };
		// a run that "converges" on a knot where f′ jumps (a derivative-free method at a corner of the
		// fit), or outside the data (on the extrapolation), is counted as such, not as a success
		const successRate = runs ? (s.converged_smooth as number) / runs : 0;
		const ends = endsOf.get(`${s.fit_id}/${s.optimizer}`) ?? [];
		const optima = !converged ? null : several ? separateOptimaN(ends, bounds.map(([l]) => l), widths) : separateOptima(bucketsOf.get(`${s.fit_id}/${s.optimizer}`) ?? [], lo, width);
		// the data's range of y (overshoot / overshootRelative) when the audit shows it, else the fit's own range over the bounds
		const dataRange = fidelity?.overshoot && fidelity.overshootRelative ? fidelity.overshoot / fidelity.overshootRelative : null;
		const fRange = dataRange ?? (fit?.reference && !fit.reference.error && fit.reference.fRange > 0 ? fit.reference.fRange : null);
		return {
			fitId: s.fit_id as string,
			method: fit?.method ?? '?',
			optimizer: study.spec.optimizers[s.optimizer as number]?.method ?? String(s.optimizer),
			optimizerIndex: s.optimizer as number,
			runs,
			successRate,
			medianIterations: num(s.median_iterations),
			medianEvaluations: num(s.median_evaluations),
			best: b ? { x: b.x, f: b.f, runId: Number(b.id), converged: b.converged } : null,
			outcomes: Object.fromEntries(OUTCOMES.map((o) => [o, s[o] as number])) as ScorecardRow['outcomes'],
			atKink: s.at_kink as number,
			outsideData: s.outside_data as number,
			spread: converged
				? { x: (num(s.x_hi) ?? 0) - (num(s.x_lo) ?? 0), f: (num(s.f_hi) ?? 0) - (num(s.f_lo) ?? 0), ...(several && ends.length ? { inputs: spreadOf(ends) } : {}) }
				: null,
			reference: ref ? { x: ref.x, f: ref.f } : null,
			gap,
			reachesReference: reaches,
			continuity,
			fidelity,
			monotone,
			optima,
			verdict: verdict({ kind, successRate, runs, atKink: s.at_kink as number, outsideData: s.outside_data as number, reachesReference: reaches, continuity, fidelity, optima, fRange, bestLooRmse: bestLoo, monotoneBroken: brokenText(monotone), roots: fit?.reference?.roots?.length ?? null })
		};
	});
	return rank(rows);
}


/** Monotonicity as the scorecard states it: never "kept" where the data are not monotone. */
export function monotoneOf(fit: Pick<StudyFit, 'fidelity'> | undefined): Monotone {
	const f = fit?.fidelity;
	if (!f || f.error) return null;
	if (f.dataMonotone) return { applies: 'whole', direction: f.dataMonotone, kept: f.monotoneKept !== false };
	if (f.stretches && f.stretches.length) return { applies: 'stretches', total: f.stretches.length, kept: f.stretches.filter((t) => t.kept).length, broken: f.stretches.filter((t) => !t.kept).map((t) => ({ from: t.from, to: t.to })) };
	return { applies: 'no', reason: 'data not monotone' };
}

function brokenText(m: Monotone): string | null {
	if (m?.applies === 'whole' && !m.kept) return `not monotone where the data are ${m.direction}`;
	if (m?.applies === 'stretches' && m.kept < m.total) return `breaks ${m.total - m.kept} of ${m.total} monotone stretches of the data`;
	return null;
}

/** Sort by the stated rule (verdict first) and number the rows. */
export function rank(rows: Omit<ScorecardRow, 'rank'>[]): ScorecardRow[] {
	return rankByVerdict(rows);
}
