import { describe, expect, it } from 'vitest';
import { packPath, unpackPath } from '$lib/domain/pathPack';

describe('packed paths', () => {
	it('round-trip bit for bit, non-finite values as null', () => {
		const path = {
			x: [[0.1, 2], [0.30000000000000004, -1e-300], [Math.PI, 5]],
			f: [1, 2.5, NaN],
			grad: [[1, 2], [3, 4], [Infinity, -0]],
			step: [0, 0.2, 1e-17],
			violation: [0, 0, 0.5]
		};
		const bytes = packPath(path, 2);
		expect(bytes.byteLength).toBe(8 * 3 * (2 * 2 + 3));
		const back = unpackPath(bytes, 2, 3);
		expect(back.x).toEqual(path.x);
		expect(back.f).toEqual([1, 2.5, null]);
		expect(back.grad).toEqual([[1, 2], [3, 4], [null, -0]]);
		expect(back.step).toEqual(path.step);
		expect(back.violation).toEqual(path.violation);
	});

	it('refuses bytes of the wrong length', () => {
		expect(() => unpackPath(Buffer.alloc(16), 1, 3)).toThrow(/expected 120/);
	});
});
