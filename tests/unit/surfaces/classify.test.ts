/** Grid or scatter (common practice, no source: a grid is the tensor product of the distinct values, one row per cell). */
import { describe, expect, it } from 'vitest';
import { FitError, classifyTable, fitGrid } from '../../../src/lib/numerics/fits';

const xs = [0, 1, 2.5];
const ys = [10, 20, 40, 80];
const full = xs.flatMap((x) => ys.map((y) => [x, y]));

describe('classifyTable', () => {
	it('a full grid in any row order is a grid, with each node mapped to its row', () => {
		const shuffled = [...full].reverse();
		const s = classifyTable(shuffled);
		expect(s.kind).toBe('grid');
		if (s.kind !== 'grid') return;
		expect(Array.from(s.axes[0])).toEqual(xs);
		expect(Array.from(s.axes[1])).toEqual(ys);
		// node (x=1, y=40) is node 1·4 + 2 = 6; its row in the reversed table is 11 − 5 = 6
		expect(shuffled[s.rowOfNode[6]]).toEqual([1, 40]);
		// and the mapping feeds a grid fit directly
		const values = Array.from(s.rowOfNode, (r) => shuffled[r][0] + shuffled[r][1]);
		expect(fitGrid('grid-linear', s.axes, values).value([1.5, 30])).toBeCloseTo(31.5, 12);
	});
	it('a grid with a missing cell is named, with the choice to treat it as scatter', () => {
		const s = classifyTable(full.filter(([x, y]) => !(x === 2.5 && y === 20)));
		expect(s.kind).toBe('scatter');
		if (s.kind !== 'scatter') return;
		expect(s.missingCell).toEqual([2.5, 20]);
		expect(s.missingCount).toBe(1);
		expect(s.reason).toBe('not a full 3 × 4 grid: 1 cell missing, the first at (2.5, 20); fill it in, or treat the table as scattered points');
	});
	it('a repeated cell names its rows; random points are plain scatter', () => {
		const s = classifyTable([...full, [1, 20]]);
		expect(s.kind === 'scatter' && s.repeatedRows).toEqual([13]);
		const r = classifyTable([
			[0, 0],
			[1, 0.3],
			[0.2, 1],
			[0.7, 0.9]
		]);
		expect(r.kind === 'scatter' && r.missingCell).toBeUndefined();
	});
	it('bad rows get typed errors naming the row', () => {
		expect(() => classifyTable([[0, 1], [1]])).toThrowError(FitError);
		expect(() => classifyTable([[0, 1], [1]])).toThrowError(/row 2 has 1 inputs, expected 2/);
		expect(() => classifyTable([[0, NaN]])).toThrowError(/row 1: input 2 is not a finite number/);
	});
});
