/**
 * Monotonicity per monotone stretch of the data. Data that rise, peak and fall
 * are not monotone, so the whole-curve check (fidelity.ts) does not apply;
 * what an engineer needs is whether the fit keeps each stretch where the data
 * rise (or fall) rising (or falling).
 *
 * A stretch is a maximal run of consecutive data intervals whose values move
 * the same way (flat intervals belong to none). Near a turn of the data the
 * fit must turn somewhere in an interval beside the turning row (the true
 * extremum lies between rows), so the interval next to each interior turn is
 * not held to the stretch's direction; the others are. f′ is sampled densely
 * (and at the interval ends) on each held interval; a slope against the
 * stretch's direction beyond a rounding threshold (1e-9 of the stretch's
 * mean slope) breaks it. Common practice, no source; the monotone-preserving
 * property it checks is Fritsch & Carlson's (see docs/references.md).
 */
import type { CurveFit } from '../fits/types';

interface MonotoneStretch {
	/** first and last data x of the stretch */
	from: number;
	to: number;
	direction: 'increasing' | 'decreasing';
	/** data intervals held to the direction (interior turns' neighbours excluded) */
	intervalsChecked: number;
	kept: boolean;
	/** the worst slope against the direction (≤ 0, in y per x) and where; 0 / null when kept */
	worst: number;
	worstAt: number | null;
}

export function monotoneStretches(fit: CurveFit, x: ArrayLike<number>, y: ArrayLike<number>, samplesPerInterval = 16): MonotoneStretch[] {
	const order = Array.from({ length: x.length }, (_, i) => i).sort((a, b) => x[a] - x[b]);
	const xs: number[] = [];
	const ys: number[] = [];
	for (const i of order) {
		if (!Number.isFinite(x[i]) || !Number.isFinite(y[i])) continue;
		if (xs.length && x[i] === xs[xs.length - 1]) continue;
		xs.push(x[i]);
		ys.push(y[i]);
	}
	const n = xs.length - 1; // intervals
	const sign = (k: number) => Math.sign(ys[k + 1] - ys[k]);
	const out: MonotoneStretch[] = [];
	let k = 0;
	while (k < n) {
		const s = sign(k);
		if (s === 0) {
			k++;
			continue;
		}
		let e = k;
		while (e + 1 < n && sign(e + 1) === s) e++;
		// intervals k..e rise (s > 0) or fall; a turn of the data sits at row k when k > 0, and at row e + 1 when e + 1 < n
		const first = k > 0 ? k + 1 : k;
		const last = e + 1 < n ? e - 1 : e;
		const meanSlope = Math.abs(ys[e + 1] - ys[k]) / (xs[e + 1] - xs[k]);
		const tol = 1e-9 * meanSlope;
		let worst = 0;
		let worstAt: number | null = null;
		let checked = 0;
		for (let i = first; i <= last; i++) {
			checked++;
			const pts: number[] = [];
			for (let j = 0; j <= samplesPerInterval; j++) pts.push(xs[i] + ((xs[i + 1] - xs[i]) * j) / samplesPerInterval);
			const { df } = fit.evaluateMany(pts);
			for (let j = 0; j < pts.length; j++) {
				const against = s * df[j];
				if (against < -tol && against < worst) {
					worst = against;
					worstAt = pts[j];
				}
			}
		}
		out.push({ from: xs[k], to: xs[e + 1], direction: s > 0 ? 'increasing' : 'decreasing', intervalsChecked: checked, kept: worstAt === null, worst, worstAt });
		k = e + 1;
	}
	return out;
}
