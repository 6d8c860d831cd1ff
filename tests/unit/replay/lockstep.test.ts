// Which runs the replay shows and what its convergence plots draw. Expected
// values are hand computations from the definitions (|f − f*|, the Euclidean
// norm) on small invented inputs; common practice, no outside source.
import { describe, expect, it } from 'vitest';
import { convergenceRows, fStarOf, hasViolation, inputSeries, lockstepRuns, norm, startsOf, tellingStart, valueSeries, type ReplayPath, type ReplayRun } from '$lib/replay/lockstep';

const run = (id: string, fitId: string, optimizerIndex: number, startIndex: number, outcome = 'converged', atKink = false, f: number | null = 1): ReplayRun => ({
	id,
	fitId,
	optimizerIndex,
	startIndex,
	start: [0.1 * (startIndex + 1)],
	outcome,
	atKink,
	iterations: 3,
	x: [0.5],
	f
});

const RUNS = [
	run('a0', 'akima', 0, 0),
	run('l0', 'linear', 0, 0, 'stalled', true),
	run('p0', 'pchip', 0, 0),
	run('l1', 'linear', 0, 1),
	run('a1', 'akima', 0, 1),
	run('p1', 'pchip', 0, 1),
	run('l0b', 'linear', 1, 0),
	run('a2', 'akima', 0, 2),
	run('l2', 'linear', 0, 2, 'stalled', true),
	run('p2', 'pchip', 0, 2, 'iteration-limit')
];

describe('lockstep runs', () => {
	it('one run per fit from the chosen start and optimizer, in the fits’ order', () => {
		expect(lockstepRuns(RUNS, ['linear', 'akima', 'pchip'], 0, 0).map((r) => r.id)).toEqual(['l0', 'a0', 'p0']);
		expect(lockstepRuns(RUNS, ['pchip', 'linear'], 1, 0).map((r) => r.id)).toEqual(['p1', 'l1']);
		// another optimizer from the same start: only linear ran with it
		expect(lockstepRuns(RUNS, ['linear', 'akima', 'pchip'], 0, 1).map((r) => r.id)).toEqual(['l0b']);
		expect(lockstepRuns(RUNS, ['linear'], 9, 0)).toEqual([]);
	});

	it('lists each start once with its point, by index', () => {
		expect(startsOf(RUNS)).toEqual([
			{ index: 0, x: [0.1] },
			{ index: 1, x: [0.2] },
			{ index: 2, x: [0.30000000000000004] }
		]);
	});

	it('opens on the start whose fits disagree most (outcomes, then kinks), ties to the lowest index', () => {
		// start 2: converged, stalled, iteration-limit (3 outcomes) beats start 0 (2 outcomes) and start 1 (1)
		expect(tellingStart(RUNS, 0)).toBe(2);
		const tie = [run('x', 'linear', 0, 4, 'stalled', true), run('y', 'akima', 0, 4), run('z', 'linear', 0, 3, 'stalled', false), run('w', 'akima', 0, 3)];
		// both have two outcomes; start 4 has a run at a kink
		expect(tellingStart(tie, 0)).toBe(4);
		expect(tellingStart([run('u', 'a', 0, 5), run('v', 'a', 0, 2)], 0)).toBe(2);
		expect(tellingStart(RUNS, 7)).toBeNull();
	});
});

describe('convergence series', () => {
	const path: ReplayPath = {
		x: [[0.1], [0.4], [null], [0.9]],
		f: [0.3, 0.7, null, 0.86],
		grad: [[3, 4], [0.3, -0.4], [null, 1], [0, 0]],
		step: [0, 0.3, null, 0.5],
		violation: [0, 0, null, 0]
	};

	it('|f − f*| and ‖∇f‖ per iteration, missing values kept as missing', () => {
		const rows = convergenceRows(path, 0.86);
		expect(rows.map((r) => r.iteration)).toEqual([0, 1, 2, 3]);
		expect(rows[0].gap).toBeCloseTo(0.56, 14);
		expect(rows[1].gap).toBeCloseTo(0.16, 14);
		expect(rows[2].gap).toBeNull();
		expect(rows[3].gap).toBe(0);
		// 3-4-5 and its tenth; a missing component makes the norm missing
		expect(rows.map((r) => r.grad)).toEqual([5, 0.5, null, 0]);
		// the gap has no sign: an iterate above f* counts the same as one below
		expect(convergenceRows(path, 0.5)[1].gap).toBeCloseTo(0.2, 14);
		expect(convergenceRows(path, 0.9)[1].gap).toBeCloseTo(0.2, 14);
		expect(() => convergenceRows(path, NaN)).toThrow(RangeError);
	});

	it('norm, input and value series', () => {
		expect(norm([1, 2, 2])).toBe(3);
		expect(norm([])).toBe(0);
		expect(norm([1, null])).toBeNull();
		expect(Array.from(inputSeries(path))).toEqual([0.1, 0.4, NaN, 0.9]);
		expect(Array.from(valueSeries(path))).toEqual([0.3, 0.7, NaN, 0.86]);
	});

	it('a path breaks a constraint only when some violation is above zero', () => {
		expect(hasViolation(path)).toBe(false);
		expect(hasViolation({ ...path, violation: [0, 1e-9, null, 0] })).toBe(true);
	});

	it('f* is the target for a solve, else the fit’s dense-search optimum, else the best run', () => {
		const runs = [{ f: 0.8 }, { f: 0.86 }, { f: null }];
		expect(fStarOf('solve', 300, { f: 1 }, runs)).toBe(300);
		expect(fStarOf('solve', undefined, { f: 1 }, runs)).toBeNull();
		expect(fStarOf('maximize', undefined, { f: 0.9 }, runs)).toBe(0.9);
		// a failed reference search is not used
		expect(fStarOf('maximize', undefined, { f: 0.9, error: 'no' }, runs)).toBe(0.86);
		expect(fStarOf('minimize', undefined, null, runs)).toBe(0.8);
		expect(fStarOf('minimize', undefined, { f: null }, [])).toBeNull();
	});
});
