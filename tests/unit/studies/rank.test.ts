// The scorecard's verdict and ranking on constructed scorecard inputs. The
// thresholds are our own engineering choices (common practice, no source);
// the cases are the ones a design review would raise.
import { describe, expect, it } from 'vitest';
import { monotoneOf, rank, type ScorecardRow } from '$lib/server/studies/scorecard';
import { separateOptima, separateOptimaN, verdict, type VerdictInput } from '$lib/domain/verdict';

interface Case {
	method: string;
	measured: string;
	successRate: number;
	looRmse: number;
	overshoot: number;
	spurious: number;
	optima?: { x: number; share: number }[];
	atKink?: number;
	reaches?: boolean | null;
	evals?: number;
}

/** an efficiency curve: y from 0.60 to 0.85 (range 0.25), 20 starts per fit, maximize */
const RANGE = 0.25;
function row(c: Case, bestLoo: number, kind = 'maximize'): Omit<ScorecardRow, 'rank'> {
	const fidelity = { looRmse: c.looRmse, overshoot: c.overshoot, overshootRelative: c.overshoot / RANGE, monotoneKept: true, spuriousExtrema: c.spurious };
	const continuity = { declared: c.measured, measured: c.measured };
	const optima = c.optima ?? [{ x: 1.2, share: 1 }];
	const input: VerdictInput = { kind, successRate: c.successRate, runs: 20, atKink: c.atKink ?? 0, reachesReference: c.reaches ?? true, continuity, fidelity, optima, fRange: RANGE, bestLooRmse: bestLoo };
	return {
		fitId: c.method,
		method: c.method,
		optimizer: 'sqp',
		optimizerIndex: 0,
		runs: 20,
		successRate: c.successRate,
		medianIterations: 6,
		medianEvaluations: c.evals ?? 12,
		best: null,
		outcomes: { converged: Math.round(20 * c.successRate), stalled: 20 - Math.round(20 * c.successRate), 'iteration-limit': 0, 'left-domain': 0, diverged: 0 },
		atKink: c.atKink ?? 0,
		outsideData: 0,
		spread: null,
		reference: null,
		gap: null,
		reachesReference: c.reaches ?? true,
		continuity,
		fidelity,
		monotone: { applies: 'no', reason: 'data not monotone' },
		optima,
		verdict: verdict(input)
	};
}

// The 9-fit study from the report: local-cubic (measured C0, two spurious extrema, runs
// split between two maxima) has the lowest LOO error among the interpolants and every run
// converges, so the old rule (success, reference, LOO, evaluations) ranked it first.
const NINE: Case[] = [
	{ method: 'linear', measured: 'C0', successRate: 0.3, looRmse: 0.009, overshoot: 0, spurious: 0, atKink: 14 },
	{ method: 'cubic-natural', measured: 'C2', successRate: 1, looRmse: 0.0041, overshoot: 0.0009, spurious: 0 },
	{ method: 'cubic-not-a-knot', measured: 'C2', successRate: 1, looRmse: 0.0038, overshoot: 0.0012, spurious: 0 },
	{ method: 'akima', measured: 'C1', successRate: 1, looRmse: 0.0052, overshoot: 0, spurious: 0 },
	{ method: 'akima-modified', measured: 'C1', successRate: 1, looRmse: 0.005, overshoot: 0, spurious: 0 },
	{ method: 'pchip', measured: 'C1', successRate: 1, looRmse: 0.0061, overshoot: 0, spurious: 0 },
	{ method: 'smoothing-spline', measured: 'C2', successRate: 1, looRmse: 0.0036, overshoot: 0.0005, spurious: 0 },
	{ method: 'local-cubic', measured: 'C0', successRate: 1, looRmse: 0.0031, overshoot: 0.002, spurious: 2, optima: [{ x: 1.1, share: 0.6 }, { x: 1.5, share: 0.4 }] },
	{ method: 'polynomial-global', measured: 'Cinf', successRate: 1, looRmse: 0.04, overshoot: 0.06, spurious: 3, evals: 8 }
];

describe('the scorecard verdict and ranking', () => {
	const bestLoo = Math.min(...NINE.map((c) => c.looRmse));
	const ranked = rank(NINE.map((c) => row(c, bestLoo)));
	const at = (m: string) => ranked.find((r) => r.method === m)!;

	it('does not rank a kinked fit whose optima are split first, and says why', () => {
		expect(ranked[0].method).not.toBe('local-cubic');
		const lc = at('local-cubic');
		expect(lc.verdict.worst).toBe('trap');
		expect(lc.verdict.label).toMatch(/optima split/);
		expect(lc.verdict.concerns.map((c) => c.text).join('; ')).toMatch(/2 separate points/);
		expect(lc.verdict.concerns.map((c) => c.text).join('; ')).toMatch(/2 spurious extrema/);
		// every smooth, faithful fit ranks above it
		for (const m of ['cubic-natural', 'cubic-not-a-knot', 'akima', 'akima-modified', 'pchip', 'smoothing-spline']) expect(at(m).rank).toBeLessThan(lc.rank);
	});

	it('ranks the global polynomial with large leave-one-out error and overshoot below linear', () => {
		const poly = at('polynomial-global');
		expect(poly.verdict.worst).toBe('unfaithful');
		expect(poly.verdict.label).toBe('rings far from the data');
		expect(poly.rank).toBeGreaterThan(at('linear').rank);
		expect(poly.rank).toBe(9);
	});

	it('blames kinks on the linear fit, whose runs stop at them', () => {
		expect(at('linear').verdict.label).toBe('kinks trap the optimizer');
		expect(at('linear').verdict.concerns[0].text).toContain('14 of 20 runs end at a kink');
	});

	it('calls the smooth interpolants smooth and faithful, best leave-one-out error first', () => {
		expect(ranked.slice(0, 6).map((r) => r.verdict.label)).toEqual(Array(6).fill('smooth and faithful'));
		expect(ranked.slice(0, 6).map((r) => r.method)).toEqual(['smoothing-spline', 'cubic-not-a-knot', 'cubic-natural', 'akima-modified', 'akima', 'pchip']);
		expect(ranked.map((r) => r.rank)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9]);
	});

	it('when every fit has split optima, the first one still says so', () => {
		const split = [{ x: 1, share: 0.5 }, { x: 2, share: 0.5 }];
		const r = rank([row({ ...NINE[1], optima: split }, bestLoo), row({ ...NINE[2], optima: split }, bestLoo)]);
		expect(r[0].verdict.label).toMatch(/optima split/);
		expect(r[0].verdict.tone).toBe('bad');
	});

	it('coarse data: a leave-one-out error every fit shares is not blamed on one fit', () => {
		// every fit's LOO near 8% of the range (a coarse table): none is "far from the data"
		const coarse = NINE.filter((c) => c.method !== 'polynomial-global').map((c) => ({ ...c, looRmse: 0.02 + c.looRmse }));
		const best = Math.min(...coarse.map((c) => c.looRmse));
		const r = rank(coarse.map((c) => row(c, best)));
		expect(r.some((x) => x.verdict.concerns.some((c) => c.code === 'far-from-data'))).toBe(false);
		expect(r[0].verdict.label).toBe('smooth and faithful');
	});

	it('never blames a kink on a fit measured smooth, even when its runs stall', () => {
		const v = row({ method: 'cubic-natural', measured: 'C2', successRate: 0.3, looRmse: 0.004, overshoot: 0, spurious: 0, atKink: 0 }, bestLoo).verdict;
		expect(v.label).toBe('the optimizer rarely converges');
		expect(v.concerns.some((c) => /kink/.test(c.text))).toBe(false);
	});

	it('a solve study whose runs find each of several roots gets a note, not a trap', () => {
		const input: VerdictInput = { kind: 'solve', successRate: 1, runs: 20, atKink: 0, reachesReference: true, continuity: { declared: 'C2', measured: 'C2' }, fidelity: { looRmse: 0.004, overshoot: 0, spuriousExtrema: 0 }, optima: [{ x: 1, share: 0.5 }, { x: 2, share: 0.5 }], fRange: RANGE, bestLooRmse: 0.004, roots: 2 };
		const v = verdict(input);
		expect(v.worst).toBe('minor');
		expect(v.label).toBe('finds several roots');
		expect(verdict({ ...input, kind: 'maximize' }).worst).toBe('trap');
	});

	it('groups neighbouring buckets of end points into one optimum and keeps separate ones apart', () => {
		// buckets 0.01 wide from 0: 10, 11 (one optimum near 0.11), 40 (another)
		const o = separateOptima([{ bucket: 11, n: 3 }, { bucket: 40, n: 2 }, { bucket: 10, n: 5 }], 0, 0.01);
		expect(o.length).toBe(2);
		expect(o[0].x).toBeCloseTo((0.105 * 5 + 0.115 * 3) / 8, 12);
		expect(o[0].share).toBeCloseTo(0.8, 12);
		expect(o[1].x).toBeCloseTo(0.405, 12);
		expect(separateOptima([], 0, 1)).toEqual([]);
	});

	it('over two inputs: end points apart in the second input only are separate optima; diagonal neighbours are one (common practice, no source)', () => {
		// bins 0.1 wide from 0 in both inputs
		const pts = [
			[0.51, 0.21],
			[0.52, 0.22],
			[0.61, 0.31], // the diagonal neighbour bin (6, 3) of (5, 2): the same optimum
			[0.51, 0.91], // same first input, far in the second: another optimum
			[Number.NaN, 0.5] // not finite: left out
		];
		const o = separateOptimaN(pts, [0, 0], [0.1, 0.1]);
		expect(o).toHaveLength(2);
		expect(o[0].share).toBeCloseTo(0.75, 12);
		expect(o[0].point[0]).toBeCloseTo((0.55 * 2 + 0.65) / 3, 12);
		expect(o[0].point[1]).toBeCloseTo((0.25 * 2 + 0.35) / 3, 12);
		expect(o[0].x).toBe(o[0].point[0]);
		expect(o[1].point[0]).toBeCloseTo(0.55, 12);
		expect(o[1].point[1]).toBeCloseTo(0.95, 12);
		// the 1-input rule on the first input alone would call these one optimum
		expect(separateOptima([{ bucket: 5, n: 3 }, { bucket: 6, n: 1 }], 0, 0.1)).toHaveLength(1);
		expect(separateOptimaN([], [0, 0], [1, 1])).toEqual([]);
	});

	it('never says “monotone kept” where the data are not monotone', () => {
		const fid = (f: Record<string, unknown>) => ({ fidelity: { looRmse: 0.01, ...f } });
		expect(monotoneOf(fid({ dataMonotone: null, monotoneKept: true }))).toEqual({ applies: 'no', reason: 'data not monotone' });
		expect(monotoneOf(fid({ dataMonotone: 'increasing', monotoneKept: true }))).toEqual({ applies: 'whole', direction: 'increasing', kept: true });
		expect(monotoneOf(fid({ dataMonotone: 'decreasing', monotoneKept: false }))).toEqual({ applies: 'whole', direction: 'decreasing', kept: false });
		const s = monotoneOf(fid({ dataMonotone: null, monotoneKept: true, stretches: [{ from: 0, to: 6, direction: 'increasing', kept: false, worstAt: 3.5 }, { from: 6, to: 10, direction: 'decreasing', kept: true, worstAt: null }] }));
		expect(s).toEqual({ applies: 'stretches', total: 2, kept: 1, broken: [{ from: 0, to: 6 }] });
		expect(monotoneOf({ fidelity: { error: 'x' } })).toBeNull();
	});
});
