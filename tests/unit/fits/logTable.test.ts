/**
 * The batch logarithm of the radial-basis sums (src/lib/numerics/logTable.ts,
 * Tang's table method) against Math.log, the reference outside the project:
 * V8's port of fdlibm's e_log.c, whose documented error is below 1 ulp.
 *
 * What is claimed, and checked here: the result is ln(x(1 + δ))(1 + η) with
 * |δ| ≤ ε, |η| ≤ 2ε. Against a reference within 1 ulp that means
 *   |ours − Math.log(x)| ≤ ε·(1 + 2|ln x|)   everywhere (backward error),
 *   |ours − Math.log(x)| ≤ 2ε·|ln x|         where |ln x| ≥ 2, and on
 *                                            [1, 1 + 1/256) (c_0 = 1: no cancellation).
 * The bounds are common practice for a backward-stable elementary function
 * (no source for the constants; the measured worst is 0.81, 0.56 and 0.50 of
 * them).
 * Values: log-uniform over the whole normal range, values near 1 at every
 * scale down to one ulp, every table boundary and its neighbours, and the
 * special values (which go to Math.log itself and must be identical).
 */
import { describe, expect, it } from 'vitest';
import { LogScratch, logInto } from '../../../src/lib/numerics/logTable';
import { mulberry32 } from '../../../src/lib/numerics/math';

const EPS = Number.EPSILON;

function logs(xs: ArrayLike<number>): { x: Float64Array; got: Float64Array } {
	const x = Float64Array.from(xs);
	const got = new Float64Array(x.length);
	logInto(x, new Uint32Array(x.buffer), got, x.length);
	return { x, got };
}

/** the worst ratio of |ours − Math.log| to each bound, and where it is */
function worst(xs: ArrayLike<number>) {
	const { x, got } = logs(xs);
	let backward = 0;
	let relative = 0;
	let at = NaN;
	for (let i = 0; i < x.length; i++) {
		const ref = Math.log(x[i]);
		const d = Math.abs(got[i] - ref);
		const b = d / (EPS * (1 + 2 * Math.abs(ref)));
		if (b > backward) {
			backward = b;
			at = x[i];
		}
		if (Math.abs(ref) >= 2 || (x[i] > 1 && x[i] < 1 + 1 / 256)) relative = Math.max(relative, d / (2 * EPS * Math.abs(ref)));
	}
	return { backward, relative, at };
}

function nextUp(v: number): number {
	const b = new Float64Array([v]);
	const u = new BigUint64Array(b.buffer);
	u[0] += 1n;
	return b[0];
}
function nextDown(v: number): number {
	const b = new Float64Array([v]);
	const u = new BigUint64Array(b.buffer);
	u[0] -= 1n;
	return b[0];
}

describe('logInto agrees with Math.log within its stated bounds', () => {
	it('over 2^20 values log-uniform across the normal range (seeded)', () => {
		const rnd = mulberry32(20261204);
		const xs = Array.from({ length: 1 << 20 }, () => Math.exp(-708 + rnd() * 1417));
		const w = worst(xs);
		expect(w.backward, `worst at x = ${w.at}`).toBeLessThanOrEqual(1);
		expect(w.relative).toBeLessThanOrEqual(1);
		// the sample must reach the region the relative bound speaks of
		expect(xs.filter((v) => Math.abs(Math.log(v)) >= 2).length).toBeGreaterThan(900000);
	});

	it('near 1 at every scale, 2^-1 … 2^-52 either side (below 1 only the backward bound applies; above 1 the relative one too)', () => {
		const rnd = mulberry32(11);
		const xs: number[] = [];
		for (let k = 1; k <= 52; k++) for (let i = 0; i < 2000; i++) xs.push(1 + (2 * rnd() - 1) * 2 ** -k);
		xs.push(1, nextUp(1), nextDown(1));
		const w = worst(xs);
		expect(w.backward, `worst at x = ${w.at}`).toBeLessThanOrEqual(1);
		expect(w.relative).toBeLessThanOrEqual(1);
		const { got } = logs([1]);
		expect(got[0]).toBe(0);
	});

	it('at every table boundary 1 + j/256 and its neighbours, in several binades', () => {
		const xs: number[] = [];
		for (const k of [-1022, -300, -1, 0, 1, 7, 300, 1023]) {
			for (let j = 0; j <= 256; j++) {
				const v = (1 + j / 256) * 2 ** k;
				if (!Number.isFinite(v)) continue;
				xs.push(v, nextUp(v), nextDown(v));
			}
		}
		const w = worst(xs.filter((v) => v > 0 && v < Infinity));
		expect(w.backward, `worst at x = ${w.at}`).toBeLessThanOrEqual(1);
		expect(w.relative).toBeLessThanOrEqual(1);
	});

	it('powers of two give k·ln 2 to the stated accuracy', () => {
		const ks = [-1022, -500, -53, -1, 1, 2, 53, 500, 1023];
		const { got } = logs(ks.map((k) => 2 ** k));
		ks.forEach((k, i) => expect(Math.abs(got[i] - k * Math.LN2)).toBeLessThanOrEqual(2 * EPS * Math.abs(k * Math.LN2)));
	});

	it('special values are exactly what Math.log gives', () => {
		const specials = [0, -0, -1, -Infinity, Infinity, NaN, 5e-324, 2.225073858507201e-308, Number.MIN_VALUE * 3, -2.5, Number.MAX_VALUE, 2.2250738585072014e-308];
		const { got } = logs(specials);
		specials.forEach((v, i) => {
			if (v === Number.MAX_VALUE || v === 2.2250738585072014e-308) {
				// the largest and smallest normals take the table path
				expect(Math.abs(got[i] - Math.log(v))).toBeLessThanOrEqual(2 * EPS * Math.abs(Math.log(v)));
			} else expect(Object.is(got[i], Math.log(v)), `x = ${v}`).toBe(true);
		});
	});

	it('may write over its input, and a scratch view gives the same results', () => {
		const rnd = mulberry32(3);
		const xs = Array.from({ length: 1000 }, () => 1e-6 + 10 * rnd());
		const { got } = logs(xs);
		const scratch = new LogScratch();
		const v = scratch.take(600);
		expect(scratch.take(1000)).not.toBe(v);
		const buf = scratch.take(1000);
		buf.set(xs);
		logInto(buf, scratch.bits, buf, xs.length);
		for (let i = 0; i < xs.length; i++) expect(buf[i]).toBe(got[i]);
		expect(scratch.take(10)).toBe(buf);
	});
});
