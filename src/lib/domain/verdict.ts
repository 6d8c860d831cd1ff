/**
 * The scorecard's verdict: what an engineer would say about each fit ×
 * optimizer in a design review, and the ranking that follows from it.
 *
 * Each row collects concerns, each in one of three classes:
 *   - "unfaithful": the fit does not represent the data (leave-one-out error
 *     large against the data's range and against the study's best fit — on
 *     coarse data every fit's is large — or overshoot large). Worst, whatever the
 *     optimizer does: a clean optimum of the wrong curve is still wrong.
 *   - "trap": the optimizer cannot be trusted on this fit — its converged
 *     runs end at separate points (the optimum depends on the start), a
 *     measured kink stops runs, or most runs fail.
 *   - "minor": worth a note, not a reason to reject — a few spurious
 *     extrema or some overshoot, a less faithful fit, some runs stopping
 *     early, the best end point short of the fit's own optimum.
 * Rows rank by their worst class (none < minor < trap < unfaithful), then
 * by the number of concerns, then success rate, reaching the reference,
 * leave-one-out RMSE and median evaluations. The thresholds are our own
 * engineering choices (common practice, no source) and are printed with
 * the rule, in VERDICT_RULE.
 */

type ConcernClass = 'minor' | 'trap' | 'unfaithful';

interface Concern {
	code: 'far-from-data' | 'overshoot' | 'split' | 'kink-trap' | 'fails' | 'rings' | 'less-faithful' | 'kinked' | 'stops-early' | 'short-of-reference' | 'not-monotone' | 'outside-data';
	class: ConcernClass;
	/** a short phrase in plain words, for the verdict column */
	text: string;
}

export interface Verdict {
	/** the headline in plain words ("smooth and faithful", "kinks trap the optimizer", …) */
	label: string;
	tone: 'ok' | 'warn' | 'bad';
	worst: ConcernClass | null;
	concerns: Concern[];
}

/** What the verdict needs to know of one scorecard row. */
export interface VerdictInput {
	kind: 'minimize' | 'maximize' | 'solve' | string;
	successRate: number;
	runs: number;
	atKink: number;
	/** runs ending outside the data's range (on the extrapolation); absent counts as 0 */
	outsideData?: number;
	reachesReference: boolean | null;
	continuity: { declared: string; measured: string | null };
	fidelity: { looRmse: number | null; overshoot: number | null; overshootRelative?: number | null; spuriousExtrema: number | null } | null;
	/** separate places where the converged runs ended, with the share of converged runs at each */
	optima: { x: number; share: number }[] | null;
	/** the fit's range of f over the bounds (the scale of LOO error and overshoot) */
	fRange: number | null;
	/** the smallest leave-one-out RMSE among the study's fits */
	bestLooRmse: number | null;
	/** what of the data's monotone direction the fit breaks, in words (null: nothing) */
	monotoneBroken?: string | null;
	/** how many roots the fit's reference found (solve studies) */
	roots?: number | null;
}

/** thresholds, as shares of the fit's range of f */
export const THRESHOLDS = {
	/** LOO RMSE above this share of the range: far from the data */
	looFar: 0.05,
	/** LOO RMSE above this share of the range and above LOO_RATIO × the best fit's: less faithful */
	looNote: 0.01,
	looRatio: 3,
	/** overshoot above this share of the range: overshoots the data */
	overshootFar: 0.1,
	/** overshoot above this share: rings (minor) */
	overshootNote: 0.01,
	/** converged end points this share of the bounds' width apart are separate points */
	separate: 0.005,
	/** success below this: the optimizer rarely converges */
	fails: 0.5,
	/** success below this: some runs stop early */
	stops: 0.95
} as const;

export const VERDICT_RULE =
	'Each row gets a verdict from its concerns. Worst: the fit is unfaithful to the data (leave-one-out RMSE above 5% of the data’s range and 3× the best fit’s, or overshoot above 10%) — a clean optimum of the wrong curve is still wrong. ' +
	'Next: the optimizer is trapped — converged runs end at separate points (more than 0.5% of the bounds apart, so the answer depends on the start), a measured kink stops runs, or fewer than half the runs converge. ' +
	'Then minor concerns: spurious extrema or overshoot above 1%, leave-one-out RMSE above 1% of the range and 3× the best fit’s, 5% or more of runs stopping early, a best end point short of the fit’s own optimum, or a kink that runs got past, a rising or falling stretch of the data the fit does not keep. ' +
	'Rows rank by their worst concern (none first), then by fewer concerns, then success rate (higher first), reaching the reference, leave-one-out RMSE (lower first) and median evaluations (fewer first).';

const pct = (v: number) => `${v >= 0.1 ? Math.round(v * 100) : Number((v * 100).toPrecision(2))}%`;
const KINKED = new Set(['C0', 'discontinuous']);
const CLASS_ORDER: Record<ConcernClass, number> = { minor: 1, trap: 2, unfaithful: 3 };

export function verdict(r: VerdictInput): Verdict {
	const concerns: Concern[] = [];
	const scale = r.fRange && r.fRange > 0 ? r.fRange : null;
	const loo = r.fidelity?.looRmse ?? null;
	const looRel = loo !== null && scale ? loo / scale : null;
	const overRel = r.fidelity?.overshootRelative ?? (r.fidelity?.overshoot != null && scale ? r.fidelity.overshoot / scale : null);
	const spurious = r.fidelity?.spuriousExtrema ?? 0;
	const kinked = r.continuity.measured !== null && KINKED.has(r.continuity.measured);

	// far from the data only when also well behind the study's best fit: coarse data make every fit's leave-one-out error large
	const behindBest = loo !== null && (r.bestLooRmse === null || loo > THRESHOLDS.looRatio * r.bestLooRmse);
	if (looRel !== null && looRel > THRESHOLDS.looFar && behindBest) concerns.push({ code: 'far-from-data', class: 'unfaithful', text: `leave-one-out error ${pct(looRel)} of the range` });
	if (overRel !== null && overRel > THRESHOLDS.overshootFar) concerns.push({ code: 'overshoot', class: 'unfaithful', text: `overshoots the data by ${pct(overRel)} of the range` });

	const optima = r.optima ?? [];
	if (optima.length > 1) {
		const where = `optima split between ${optima.length} separate points`;
		// a solve study may well have several roots: finding them is not a trap, only worth a note
		const expected = r.kind === 'solve' && (r.roots ?? 0) >= optima.length;
		concerns.push({ code: 'split', class: expected ? 'minor' : 'trap', text: expected ? `runs find ${optima.length} different roots` : where });
	}
	if (kinked && (r.atKink > 0 || r.successRate < THRESHOLDS.stops))
		concerns.push({ code: 'kink-trap', class: 'trap', text: r.atKink > 0 ? `kinks trap the optimizer (${r.atKink} of ${r.runs} runs end at a kink)` : 'kinks trap the optimizer' });
	else if (kinked) concerns.push({ code: 'kinked', class: 'minor', text: `measured ${r.continuity.measured}: the slope jumps, though these runs got past` });
	if (r.successRate < THRESHOLDS.fails && !concerns.some((c) => c.code === 'kink-trap'))
		concerns.push({ code: 'fails', class: 'trap', text: `only ${pct(r.successRate)} of runs converge` });
	else if (r.successRate < THRESHOLDS.stops && r.successRate >= THRESHOLDS.fails && !concerns.some((c) => c.code === 'kink-trap'))
		concerns.push({ code: 'stops-early', class: 'minor', text: `${pct(1 - r.successRate)} of runs stop before converging` });

	if ((r.outsideData ?? 0) > 0)
		concerns.push({ code: 'outside-data', class: 'trap', text: `${r.outsideData} of ${r.runs} runs end outside the data, on the fit's extrapolation` });

	if (spurious > 0 || (overRel !== null && overRel > THRESHOLDS.overshootNote && overRel <= THRESHOLDS.overshootFar))
		concerns.push({
			code: 'rings',
			class: 'minor',
			text: [spurious > 0 ? `${spurious} spurious extrem${spurious === 1 ? 'um' : 'a'}` : null, overRel !== null && overRel > THRESHOLDS.overshootNote && overRel <= THRESHOLDS.overshootFar ? `overshoot ${pct(overRel)} of the range` : null]
				.filter(Boolean)
				.join(', ')
		});
	if (looRel !== null && !(looRel > THRESHOLDS.looFar && behindBest) && looRel > THRESHOLDS.looNote && loo !== null && r.bestLooRmse !== null && loo > THRESHOLDS.looRatio * r.bestLooRmse)
		concerns.push({ code: 'less-faithful', class: 'minor', text: `leave-one-out error ${Number((loo / r.bestLooRmse).toPrecision(2))}× the best fit’s` });
	if (r.monotoneBroken) concerns.push({ code: 'not-monotone', class: 'minor', text: r.monotoneBroken });
	if (r.reachesReference === false) concerns.push({ code: 'short-of-reference', class: 'minor', text: 'best end point short of the fit’s own optimum' });

	const worst = concerns.reduce<ConcernClass | null>((w, c) => (w === null || CLASS_ORDER[c.class] > CLASS_ORDER[w] ? c.class : w), null);
	return { label: headline(concerns, worst), tone: worst === null ? 'ok' : worst === 'minor' ? 'warn' : 'bad', worst, concerns };
}

function headline(concerns: Concern[], worst: ConcernClass | null): string {
	const has = (code: Concern['code']) => concerns.some((c) => c.code === code);
	if (worst === null) return 'smooth and faithful';
	if (worst === 'unfaithful') return has('far-from-data') && has('overshoot') ? 'rings far from the data' : has('far-from-data') ? 'far from the data' : 'overshoots the data';
	if (worst === 'trap') {
		if (has('split') && has('kink-trap')) return 'kinks trap the optimizer; optima split';
		if (has('split')) return 'optima split: the answer depends on the start';
		if (has('kink-trap')) return 'kinks trap the optimizer';
		if (has('outside-data')) return 'runs end outside the data';
		return 'the optimizer rarely converges';
	}
	if (has('rings')) return 'converges but rings';
	if (has('less-faithful')) return 'converges, less faithful';
	if (has('kinked')) return 'converges despite kinks';
	if (has('stops-early')) return 'some runs stop early';
	if (has('not-monotone')) return 'converges, but wiggles where the data do not';
	if (has('split')) return 'finds several roots';
	return 'converges short of the fit’s optimum';
}

/** What ranking needs of a row beyond its verdict. */
interface Rankable {
	method: string;
	optimizerIndex: number;
	successRate: number;
	reachesReference: boolean | null;
	medianEvaluations: number | null;
	fidelity: { looRmse: number | null } | null;
	verdict: Verdict;
}

/** Sort by VERDICT_RULE and number the rows. */
export function rankByVerdict<T extends Rankable>(rows: T[]): (T & { rank: number })[] {
	const key = (r: T) => [
		r.verdict.worst === null ? 0 : CLASS_ORDER[r.verdict.worst],
		r.verdict.concerns.length,
		-r.successRate,
		r.reachesReference === false ? 1 : 0,
		r.fidelity?.looRmse ?? Infinity,
		r.medianEvaluations ?? Infinity
	];
	const sorted = [...rows].sort((a, b) => {
		const ka = key(a);
		const kb = key(b);
		for (let i = 0; i < ka.length; i++) if (ka[i] !== kb[i]) return ka[i] < kb[i] ? -1 : 1;
		return a.method.localeCompare(b.method) || a.optimizerIndex - b.optimizerIndex;
	});
	return sorted.map((r, i) => ({ ...r, rank: i + 1 }));
}

/**
 * Group converged end points (sorted bucket indices of width `width`, with
 * their counts) into separate optima: neighbouring buckets belong together.
 */
export function separateOptima(buckets: { bucket: number; n: number }[], lo: number, width: number): { x: number; share: number }[] {
	const total = buckets.reduce((s, b) => s + b.n, 0);
	const out: { x: number; share: number }[] = [];
	let cur: { sum: number; n: number; last: number } | null = null;
	for (const b of [...buckets].sort((p, q) => p.bucket - q.bucket)) {
		const centre = lo + (b.bucket + 0.5) * width;
		if (cur && b.bucket - cur.last <= 1) {
			cur.sum += centre * b.n;
			cur.n += b.n;
			cur.last = b.bucket;
		} else {
			if (cur) out.push({ x: cur.sum / cur.n, share: cur.n / total });
			cur = { sum: centre * b.n, n: b.n, last: b.bucket };
		}
	}
	if (cur) out.push({ x: cur.sum / cur.n, share: cur.n / total });
	return out;
}

/**
 * The n-input form of separateOptima: converged end points binned per input
 * (bins of `width[k]` from `lo[k]`), bins touching in every input (indices
 * within 1, so diagonal neighbours too) merged into one optimum at the
 * count-weighted mean of its bin centres (common practice, no source).
 * `x` is the optimum's first input, `point` all of them.
 */
export function separateOptimaN(points: readonly (readonly number[])[], lo: readonly number[], width: readonly number[]): { x: number; point: number[]; share: number }[] {
	const bins = new Map<string, { idx: number[]; n: number }>();
	for (const p of points) {
		if (!p.every(Number.isFinite)) continue;
		const idx = p.map((v, k) => Math.floor((v - lo[k]) / width[k]));
		const key = idx.join(',');
		const b = bins.get(key);
		if (b) b.n++;
		else bins.set(key, { idx, n: 1 });
	}
	const list = [...bins.values()];
	const parent = list.map((_, i) => i);
	const find = (i: number): number => (parent[i] === i ? i : (parent[i] = find(parent[i])));
	// quadratic in the number of occupied bins, which is at most the number of converged runs of one row
	for (let i = 0; i < list.length; i++) {
		for (let j = i + 1; j < list.length; j++) {
			if (list[i].idx.every((v, k) => Math.abs(v - list[j].idx[k]) <= 1)) parent[find(i)] = find(j);
		}
	}
	const total = list.reduce((s, b) => s + b.n, 0);
	const groups = new Map<number, { sum: number[]; n: number }>();
	list.forEach((b, i) => {
		const g = groups.get(find(i)) ?? { sum: b.idx.map(() => 0), n: 0 };
		b.idx.forEach((v, k) => (g.sum[k] += (lo[k] + (v + 0.5) * width[k]) * b.n));
		g.n += b.n;
		groups.set(find(i), g);
	});
	return [...groups.values()]
		.map((g) => {
			const point = g.sum.map((v) => v / g.n);
			return { x: point[0], point, share: g.n / total };
		})
		.sort((a, b) => b.share - a.share || a.x - b.x);
}
