/**
 * Data sets shared by the curve-fit tests. Sources and confidence words as in
 * docs/references.md.
 */
import { mulberry32 } from '../../../src/lib/numerics/math';

/** F. N. Fritsch, R. E. Carlson, 1980, SIAM J. Numer. Anal. 17(2) — "RPN 14" data (corroborated; majority version with y(8.19) = 4.37498e-2). */
export const RPN14 = {
	x: [7.99, 8.09, 8.19, 8.7, 9.2, 10, 12, 15, 20],
	y: [0, 2.76429e-5, 4.37498e-2, 0.169183, 0.469428, 0.94374, 0.998636, 0.999919, 0.999994]
};

/** H. Akima, 1970, J. ACM 17(4) — the method's own style of data (corroborated). */
export const AKIMA = {
	x: [0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10],
	y: [10, 10, 10, 10, 10, 10, 10.5, 15, 50, 60, 85]
};

/** Burden & Faires, Numerical Analysis — eˣ at 0, 1, 2, 3 (edition/example from memory; coefficients computed). */
export const EXP4 = { x: [0, 1, 2, 3], y: [1, Math.E, Math.E ** 2, Math.E ** 3] };

/** The smoothing-spline table of docs/references.md: x_i = 0.25·i, y = sin x + 0.1·sin 37x (computed). */
export const SMOOTH25 = (() => {
	const x: number[] = [];
	const y: number[] = [];
	for (let i = 0; i <= 24; i++) {
		const t = 0.25 * i;
		x.push(t);
		y.push(Math.sin(t) + 0.1 * Math.sin(37 * t));
	}
	return { x, y };
})();

/** Uneven knots, smooth function: a seeded, reproducible set. */
export function unevenSmooth(n: number, seed: number, f: (t: number) => number = (t) => Math.sin(t) + 0.3 * t): { x: number[]; y: number[] } {
	const r = mulberry32(seed);
	const x = [0];
	for (let i = 1; i < n; i++) x.push(x[i - 1] + 0.05 + r());
	return { x, y: x.map(f) };
}

/** Uneven knots, rough values (no structure): stresses every branch of the slope rules. */
export function unevenRough(n: number, seed: number): { x: number[]; y: number[] } {
	const r = mulberry32(seed);
	const x = [-3];
	for (let i = 1; i < n; i++) x.push(x[i - 1] + 0.01 + 2 * r() ** 2);
	return { x, y: x.map(() => 10 * r() - 5) };
}

/** Monotone data with plateaus and steps (uneven). */
export function monotoneSteps(n: number, seed: number): { x: number[]; y: number[] } {
	const r = mulberry32(seed);
	const x = [1];
	const y = [0];
	for (let i = 1; i < n; i++) {
		x.push(x[i - 1] + 0.1 + r());
		const u = r();
		y.push(y[i - 1] + (u < 0.3 ? 0 : u < 0.8 ? r() : 5 * r()));
	}
	return { x, y };
}

/** Points to compare at: data points, interval midpoints and points very near the knots. */
export function probePoints(x: readonly number[]): number[] {
	const p: number[] = [];
	for (let i = 0; i < x.length; i++) {
		p.push(x[i]);
		if (i + 1 < x.length) {
			const h = x[i + 1] - x[i];
			p.push(x[i] + 0.5 * h, x[i] + 0.123 * h, x[i] + 0.9 * h, x[i] + 1e-9 * h);
		}
	}
	return p;
}

/**
 * IAPWS-IF97 saturation pressure, Eq. (30) with the Table 34 coefficients
 * (IAPWS R7-97(2012) §8; corroborated). T in K, result in MPa.
 */
const N = [
	0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2, 0.1202082470247e5, -0.32325550322333e7, 0.1491510861353e2,
	-0.48232657361591e4, 0.40511340542057e6, -0.23855557567849, 0.65017534844798e3
];
export function iapwsPsat(T: number): number {
	const th = T + N[8] / (T - N[9]);
	const A = th * th + N[0] * th + N[1];
	const B = N[2] * th * th + N[3] * th + N[4];
	const C = N[5] * th * th + N[6] * th + N[7];
	return ((2 * C) / (-B + Math.sqrt(B * B - 4 * A * C))) ** 4;
}

/** IAPWS-IF97 Eq. (31), the backward equation T_s(p); p in MPa, result in K. */
export function iapwsTsat(p: number): number {
	const beta = p ** 0.25;
	const E = beta * beta + N[2] * beta + N[5];
	const F = N[0] * beta * beta + N[3] * beta + N[6];
	const G = N[1] * beta * beta + N[4] * beta + N[7];
	const D = (2 * G) / (-F - Math.sqrt(F * F - 4 * E * G));
	return (N[9] + D - Math.sqrt((N[9] + D) ** 2 - 4 * (N[8] + N[9] * D))) / 2;
}
