import { describe, expect, it } from 'vitest';
import { rank, type ScorecardRow } from '$lib/server/studies/scorecard';

const row = (method: string, successRate: number, reaches: boolean | null, looRmse: number | null, medianEvaluations: number): ScorecardRow => ({
	rank: 0,
	fitId: method,
	method,
	optimizer: 'sqp',
	optimizerIndex: 0,
	runs: 10,
	successRate,
	medianIterations: 5,
	medianEvaluations,
	best: null,
	outcomes: { converged: 0, stalled: 0, 'iteration-limit': 0, 'left-domain': 0, diverged: 0 },
	atKink: 0,
	spread: null,
	reference: null,
	gap: null,
	reachesReference: reaches,
	continuity: { declared: 'C1', measured: 'C1' },
	fidelity: looRmse === null ? null : { looRmse, overshoot: 0, monotoneKept: true, spuriousExtrema: 0 }
});

describe('the scorecard’s ranking rule', () => {
	it('success rate first, then reaching the reference, then leave-one-out error, then evaluations', () => {
		const ranked = rank([
			row('linear', 0, true, 0.001, 3),
			row('ringing', 1, false, 0.0001, 5),
			row('wiggly', 1, true, 0.02, 5),
			row('good', 1, true, 0.005, 9),
			row('good-cheaper', 1, true, 0.005, 7),
			row('half', 0.5, true, 0.0001, 5)
		]);
		expect(ranked.map((r) => `${r.rank}:${r.method}`)).toEqual(['1:good-cheaper', '2:good', '3:wiggly', '4:ringing', '5:half', '6:linear']);
	});
});
