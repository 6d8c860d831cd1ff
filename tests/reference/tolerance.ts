import { expect } from 'vitest';

/** |actual − expected| ≤ rel·max(1, |expected|) — the one tolerance rule used by every numeric test. */
export function expectClose(actual: number, expected: number, rel = 1e-10, label = ''): void {
	const scale = Math.max(1, Math.abs(expected));
	const err = Math.abs(actual - expected);
	if (!(err <= rel * scale)) {
		expect.fail(`${label ? label + ': ' : ''}expected ${expected}, got ${actual} (|Δ| = ${err.toExponential(3)}, allowed ${(rel * scale).toExponential(3)})`);
	}
}

export function expectAllClose(actual: ArrayLike<number>, expected: ArrayLike<number>, rel = 1e-10, label = ''): void {
	expect(actual.length, `${label} length`).toBe(expected.length);
	for (let i = 0; i < expected.length; i++) expectClose(actual[i], expected[i], rel, `${label}[${i}]`);
}
