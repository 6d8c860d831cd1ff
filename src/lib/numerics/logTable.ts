/**
 * Natural logarithms of a whole array at once, table-driven (P. T. P. Tang,
 * 1990, "Table-driven implementation of the logarithm function in IEEE
 * floating-point arithmetic", ACM TOMS 16(4):378–400): write x = 2^k·m with
 * m in [1, 2), pick the table point c_j = 1 + j/256 (the top 8 bits of m),
 * and take
 *   ln x = k·ln 2 − ln(1/c_j) + ln(1 + r),   r = m·(1/c_j) − 1,  0 ≤ r < 1/256
 * (to rounding), with ln(1 + r) from its Taylor series through r⁷ (the next
 * term is below 0.01ε·r). With c_0 = 1 the result on [1, 1 + 1/256) is as
 * accurate relative to itself as a log1p, and ln 1 = 0 exactly. The exponent
 * and the table index are read from the IEEE 754 bits of the whole batch (one
 * Uint32 view), which is what makes this cheaper than Math.log per element:
 * the hot loop of a thin-plate sum spends most of its time in the library
 * call.
 *
 * Accuracy (tests/unit/fits/logTable.test.ts, against Math.log over the
 * whole range of doubles): the result is ln(x·(1 + δ))·(1 + η) with
 * |δ| ≤ ε and |η| ≤ 2ε — as good as the logarithm of an x that has itself
 * been rounded once, which is what every caller here passes (the kernel's
 * e2·s, a product rounded once); for |ln x| ≥ 2 and on [1, 1 + 1/256) the
 * error is also within 2ε·|ln x|.
 * Zero, negative, subnormal, infinite and NaN inputs go to Math.log.
 */

const BITS = 8;
const SIZE = 1 << BITS;
const SHIFT = 20 - BITS;
/** 1/c_j rounded to a double, and −ln of that rounded value (so the identity above holds for it) */
const INV_C = new Float64Array(SIZE);
const MINUS_LN_INV_C = new Float64Array(SIZE);
for (let j = 0; j < SIZE; j++) {
	INV_C[j] = 1 / (1 + j / SIZE);
	MINUS_LN_INV_C[j] = -Math.log(INV_C[j]);
}
/** 2^(1023 − e) for biased exponents e = 1 … 2046: m = x·2^(1023 − e), exact */
const UNSCALE = new Float64Array(2047);
for (let e = 1; e < 2047; e++) UNSCALE[e] = 2 ** (1023 - e);

/** the high word of a double is the odd Uint32 on a little-endian machine */
const HIGH = new Uint8Array(new Float64Array([1]).buffer)[7] === 0x3f ? 1 : 0;

/**
 * out[i] = ln(x[i]) for i < n. `bits` must be a Uint32Array over the same
 * memory as x (new Uint32Array(x.buffer, x.byteOffset, 2 * x.length)); out
 * may be x itself.
 */
export function logInto(x: Float64Array, bits: Uint32Array, out: Float64Array, n: number): void {
	for (let i = 0; i < n; i++) {
		const h = bits[2 * i + HIGH];
		// biased exponent; a set sign bit makes it ≥ 2048
		const e = h >>> 20;
		const v = x[i];
		if (e === 0 || e >= 2047) {
			out[i] = Math.log(v);
			continue;
		}
		const j = (h >>> SHIFT) & (SIZE - 1);
		const r = v * UNSCALE[e] * INV_C[j] - 1;
		const p = r * (1 + r * (-0.5 + r * (1 / 3 + r * (-0.25 + r * (0.2 + r * (-1 / 6 + r * (1 / 7)))))));
		out[i] = (e - 1023) * Math.LN2 + MINUS_LN_INV_C[j] + p;
	}
}

/** A growable scratch pair (values and their bit view) for logInto. */
export class LogScratch {
	values = new Float64Array(0);
	bits = new Uint32Array(0);
	/** values with room for n; its contents are not kept across calls */
	take(n: number): Float64Array {
		if (this.values.length < n) {
			this.values = new Float64Array(Math.max(n, 2 * this.values.length));
			this.bits = new Uint32Array(this.values.buffer);
		}
		return this.values;
	}
}
