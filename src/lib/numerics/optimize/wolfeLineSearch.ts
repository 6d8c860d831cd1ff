/**
 * Line search for the strong Wolfe conditions:
 *   φ(α) ≤ φ(0) + c₁αφ′(0)   and   |φ′(α)| ≤ c₂|φ′(0)|,   φ(α) = f(x + αd).
 * J. Nocedal, S. J. Wright, Numerical Optimization, 2nd ed., Springer 2006,
 * Algorithm 3.5 (bracketing) and Algorithm 3.6 (zoom), with the step inside
 * zoom chosen by safeguarded quadratic interpolation (§3.5, eq. 3.57).
 *
 * Extensions, all documented in the result status:
 * - `alphaMax` is the longest step that stays inside the bounds; reaching it
 *   with sufficient decrease and φ still falling returns `bound`.
 * - A non-finite φ or φ′ at a trial step is treated as "too far" (the
 *   interval shrinks); when every trial was non-finite the status is `nonfinite`.
 * - Rounding of f (approximate Wolfe conditions, W. W. Hager, H. Zhang, "A new
 *   conjugate gradient method with guaranteed descent and an efficient line
 *   search", SIAM J. Optim. 16(1):170–192, 2005): where φ(α) is within f's
 *   rounding level of φ(0), differences of f carry no information (a large
 *   offset in f rounds them away), so a step with φ(α) ≤ φ(0) + noise and
 *   |φ′(α)| ≤ c₂|φ′(0)| is accepted, and zoom narrows the interval by the sign
 *   of φ′ at such a point. (Such a point may lie across a hump whose height is
 *   itself below f's rounding level; the run then ends in the neighbouring
 *   basin, with an outcome as honest as any.) Without an offset the noise level is a few ulps and this
 *   changes nothing.
 * - When zoom cannot meet the curvature condition (at a kink φ′ jumps and never
 *   becomes small) but found sufficient decrease, the best such step is
 *   returned as `armijo`.
 */
import { normInf } from './linalg';
import type { Point, Run } from './run';

interface LineSearchOptions {
	alpha0: number;
	alphaMax: number;
	c1?: number;
	c2?: number;
	maxBracket?: number;
	maxZoom?: number;
}

interface LineSearchResult {
	status: 'wolfe' | 'armijo' | 'bound' | 'failed' | 'nonfinite';
	alpha: number;
	point: Point | null;
}

export function wolfeLineSearch(run: Run, p0: Point, d: number[], opts: LineSearchOptions): LineSearchResult {
	const c1 = opts.c1 ?? 1e-4;
	const c2 = opts.c2 ?? 0.9;
	const maxBracket = opts.maxBracket ?? 25;
	const maxZoom = opts.maxZoom ?? 40;
	const x = p0.x;
	const n = x.length;
	const phi0 = p0.f;
	const g0 = p0.grad;
	let dphi0 = 0;
	for (let i = 0; i < n; i++) dphi0 += g0[i] * d[i];
	const alphaMax = opts.alphaMax;
	// smallest meaningful change of α: the step moves x by less than one ulp
	const alphaTiny = (4e-16 * (1 + normInf(x))) / Math.max(normInf(d), 1e-300);
	let anyFinite = false;

	const at = (a: number): Point => {
		const y = new Array<number>(n);
		for (let i = 0; i < n; i++) y[i] = x[i] + a * d[i];
		return run.evaluate(run.hasBounds ? run.project(y) : y);
	};
	const slope = (q: Point): number => {
		const g = q.grad;
		let s = 0;
		for (let i = 0; i < n; i++) s += g[i] * d[i];
		return s;
	};
	const armijo = (a: number, f: number) => f <= phi0 + c1 * a * dphi0;
	const noise = run.fNoise(phi0);
	/** within f's rounding level of φ(0): decide by φ′ alone */
	const level = (f: number) => f <= phi0 + noise;

	function zoom(aLo: number, phiLo: number, dphiLo: number, pLo: Point | null, aHi: number, phiHi: number): LineSearchResult {
		for (let j = 0; j < maxZoom; j++) {
			const delta = aHi - aLo;
			if (Math.abs(delta) <= alphaTiny) break;
			// quadratic through φ(lo), φ′(lo), φ(hi) (N&W eq. 3.57), kept within the middle 80 %
			let a = aLo + 0.5 * delta;
			if (Number.isFinite(phiHi)) {
				const den = 2 * (phiHi - phiLo - dphiLo * delta);
				if (den > 0) a = aLo - (dphiLo * delta * delta) / den;
			}
			const lo = Math.min(aLo, aHi) + 0.1 * Math.abs(delta);
			const hi = Math.max(aLo, aHi) - 0.1 * Math.abs(delta);
			if (!(a >= lo && a <= hi)) a = Math.min(hi, Math.max(lo, Number.isFinite(a) ? a : aLo + 0.5 * delta));
			const q = at(a);
			const phi = q.f;
			if (!Number.isFinite(phi)) {
				if (phi === -Infinity) return { status: 'wolfe', alpha: a, point: q };
				aHi = a;
				phiHi = Infinity;
				continue;
			}
			anyFinite = true;
			if ((!armijo(a, phi) || phi >= phiLo) && level(phi)) {
				const dphi = slope(q);
				if (Number.isFinite(dphi)) {
					if (Math.abs(dphi) <= -c2 * dphi0) return { status: 'wolfe', alpha: a, point: q };
					// f is flat to rounding here: the sign of φ′ says which side the minimum lies
					if (dphi * (aHi - aLo) >= 0) {
						aHi = a;
						phiHi = phi;
					} else {
						aLo = a;
						phiLo = phi;
						dphiLo = dphi;
						pLo = q;
					}
					continue;
				}
			}
			if (!armijo(a, phi) || phi >= phiLo) {
				aHi = a;
				phiHi = phi;
				continue;
			}
			const dphi = slope(q);
			if (!Number.isFinite(dphi)) {
				aHi = a;
				phiHi = Infinity;
				continue;
			}
			if (Math.abs(dphi) <= -c2 * dphi0) return { status: 'wolfe', alpha: a, point: q };
			if (dphi * (aHi - aLo) >= 0) {
				aHi = aLo;
				phiHi = phiLo;
			}
			aLo = a;
			phiLo = phi;
			dphiLo = dphi;
			pLo = q;
		}
		if (pLo && aLo > 0) return { status: 'armijo', alpha: aLo, point: pLo };
		return { status: anyFinite ? 'failed' : 'nonfinite', alpha: 0, point: null };
	}

	if (!(dphi0 < 0) || !(alphaMax > 0)) return { status: 'failed', alpha: 0, point: null };
	let aPrev = 0;
	let phiPrev = phi0;
	let dphiPrev = dphi0;
	let pPrev: Point | null = null;
	let a = Math.min(opts.alpha0, alphaMax);
	for (let i = 0; i < maxBracket; i++) {
		const q = at(a);
		const phi = q.f;
		if (phi === -Infinity) return { status: 'wolfe', alpha: a, point: q };
		if (!Number.isFinite(phi)) return zoom(aPrev, phiPrev, dphiPrev, pPrev, a, Infinity);
		anyFinite = true;
		if (!armijo(a, phi) || (i > 0 && phi >= phiPrev)) {
			const dphi = level(phi) ? slope(q) : NaN;
			if (Number.isFinite(dphi)) {
				if (Math.abs(dphi) <= -c2 * dphi0) return { status: 'wolfe', alpha: a, point: q };
				// flat to rounding and still falling: keep bracketing by φ′
				if (dphi < 0 && a >= alphaMax) return { status: 'bound', alpha: a, point: q };
				if (dphi < 0) {
					aPrev = a;
					phiPrev = phi;
					dphiPrev = dphi;
					pPrev = q;
					a = Math.min(alphaMax, 2 * a);
					continue;
				}
			}
			return zoom(aPrev, phiPrev, dphiPrev, pPrev, a, phi);
		}
		const dphi = slope(q);
		if (!Number.isFinite(dphi)) return zoom(aPrev, phiPrev, dphiPrev, pPrev, a, Infinity);
		if (Math.abs(dphi) <= -c2 * dphi0) return { status: 'wolfe', alpha: a, point: q };
		if (dphi >= 0) return zoom(a, phi, dphi, q, aPrev, phiPrev);
		if (a >= alphaMax) return { status: 'bound', alpha: a, point: q };
		aPrev = a;
		phiPrev = phi;
		dphiPrev = dphi;
		pPrev = q;
		a = Math.min(alphaMax, 2 * a);
	}
	// still falling after maxBracket doublings: accept the last (sufficient-decrease) point
	return pPrev ? { status: 'armijo', alpha: aPrev, point: pPrev } : { status: 'failed', alpha: 0, point: null };
}
