/** Small helpers for the curve-fit tests (not tests themselves). */
import { PiecewisePolynomial } from '../../../src/lib/numerics/fits/piecewisePolynomial';
import type { CurveFit } from '../../../src/lib/numerics/fits/types';

/** Global maximum and minimum of a piecewise polynomial over its domain, from the analytic zeros of f′. */
export function extremes(fit: CurveFit): { max: number; maxAt: number; min: number; minAt: number } {
	if (!(fit instanceof PiecewisePolynomial)) throw new Error('extremes: piecewise fits only');
	const k = fit.knots;
	const c = fit.coefficients;
	const st = fit.degree + 1;
	let max = -Infinity;
	let maxAt = NaN;
	let min = Infinity;
	let minAt = NaN;
	const visit = (i: number, x: number) => {
		const f = fit.evaluatePiece(i, x).f;
		if (f > max) {
			max = f;
			maxAt = x;
		}
		if (f < min) {
			min = f;
			minAt = x;
		}
	};
	for (let i = 0; i < fit.pieces; i++) {
		const len = k[i + 1] - k[i];
		visit(i, k[i]);
		visit(i, k[i + 1]);
		const a = fit.degree === 3 ? 3 * c[st * i + 3] : 0;
		const b = fit.degree >= 2 ? 2 * c[st * i + 2] : 0;
		const cc = c[st * i + 1];
		const roots: number[] = [];
		if (a === 0) {
			if (b !== 0) roots.push(-cc / b);
		} else {
			const disc = b * b - 4 * a * cc;
			if (disc >= 0) roots.push((-b + Math.sqrt(disc)) / (2 * a), (-b - Math.sqrt(disc)) / (2 * a));
		}
		for (const s of roots) if (s > 0 && s < len) visit(i, k[i] + s);
	}
	return { max, maxAt, min, minAt };
}

/** ∫ over the domain of a piecewise polynomial, exactly from its coefficients. */
export function integral(fit: PiecewisePolynomial): number {
	const k = fit.knots;
	const c = fit.coefficients;
	const st = fit.degree + 1;
	let s = 0;
	for (let i = 0; i < fit.pieces; i++) {
		const h = k[i + 1] - k[i];
		let hp = h;
		for (let p = 0; p < st; p++) {
			s += (c[st * i + p] * hp) / (p + 1);
			hp *= h;
		}
	}
	return s;
}

/** Largest |fit(x) − g(x)| over a dense grid of the domain. */
export function maxError(fit: CurveFit, g: (x: number) => number, samples = 4001): number {
	const [a, b] = fit.domain;
	let m = 0;
	for (let i = 0; i < samples; i++) {
		const x = Math.min(a + ((b - a) * i) / (samples - 1), b); // rounding must not step past b
		m = Math.max(m, Math.abs(fit.evaluate(x).f - g(x)));
	}
	return m;
}

/** Bit-level equality of two Float64Arrays. */
export function sameBits(a: Float64Array, b: Float64Array): boolean {
	if (a.length !== b.length) return false;
	const ua = new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
	const ub = new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
	for (let i = 0; i < ua.length; i++) if (ua[i] !== ub[i]) return false;
	return true;
}
