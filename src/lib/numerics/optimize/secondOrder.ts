/**
 * The end-of-run verdict on a first-order point. A run is `converged` only if
 * the point also passes a second-order check; otherwise it is `stalled` with
 * the reason. (General libraries have been seen to report success at a
 * maximum or saddle of a flat-ish function; this check is the guard.)
 *
 * Second-order necessary condition (Nocedal & Wright, Numerical Optimization,
 * 2nd ed. 2006, Thm 2.3 unconstrained; Thm 12.5 constrained): the Hessian of
 * the Lagrangian is positive semidefinite on the null space Z of the strongly
 * active constraint normals. We form the reduced Hessian Zᵀ∇²L Z from the
 * objective's Hessian when it is given and no general constraint is active,
 * else by forward differences of ∇L along Z (central second differences of f
 * for the derivative-free Nelder–Mead), and ask for λ_min ≥ −tol. When λ_min is
 * numerically zero (a degenerate minimum such as x⁴, a flat plateau, or a
 * maximum such as −x⁴, a point on the edge of a step) we probe L at ±h along
 * every eigenvector of a near-zero eigenvalue and fail if it drops; the
 * derivative-free check also probes f at ±h and ±h/100 along the directions
 * of Z, their diagonals and a few seeded oblique directions (a collapsed
 * simplex can sit on a slope, or stagnate next to a non-smooth minimum). The check's evaluations are counted
 * like any other.
 */
import { EPS, dot, nullSpaceBasis, norm2, normInf, symmetricEigen } from './linalg';
import { fmt, type Point, type Run } from './run';
import type { KktResiduals, Multipliers, RunResult } from './types';

interface SecondOrderContext {
	/** ∇L at a point (minimized sense); default: the point's gradient */
	lagrangianGrad?: (p: Point) => number[];
	/** L at a point; default: the point's f */
	lagrangianValue?: (p: Point) => number;
	/** normals of the strongly active general constraints (bounds are found here) */
	activeNormals?: number[][];
	/** the objective's Hessian alone is not ∇²L (a general constraint is active) */
	generalActive?: boolean;
	/** use f values only (Nelder–Mead) */
	derivativeFree?: boolean;
	multipliers?: Multipliers | null;
	kkt?: KktResiduals | null;
}

interface Verdict {
	ok: boolean;
	detail: string;
}

function activeBoundNormals(run: Run, p: Point, g: number[] | null): number[][] {
	const out: number[][] = [];
	const tolG = g === null ? 0 : run.gradTolAt(p);
	for (let i = 0; i < run.n; i++) {
		// on a bound, or within the first-order tolerance of one that ∇f pushes against
		// (the projected gradient min(|g|, room) then measured the room, not g)
		const roomLo = p.x[i] - run.lo[i];
		const roomHi = run.hi[i] - p.x[i];
		const atLo = roomLo <= 0 || (g !== null && g[i] > roomLo && roomLo <= tolG);
		const atHi = roomHi <= 0 || (g !== null && -g[i] > roomHi && roomHi <= tolG);
		if (!atLo && !atHi) continue;
		// strongly active: the gradient pushes out of the box (derivative-free: any bound we sit on)
		const outward = g === null ? true : atLo ? g[i] > tolG : g[i] < -tolG;
		if (outward || run.lo[i] === run.hi[i]) {
			const e = new Array<number>(run.n).fill(0);
			e[i] = 1;
			out.push(e);
		}
	}
	return out;
}

/** x + t·v kept inside the box; null when the whole step does not fit */
function shifted(run: Run, x: number[], v: number[], t: number): number[] | null {
	const y = new Array<number>(run.n);
	for (let i = 0; i < run.n; i++) {
		y[i] = x[i] + t * v[i];
		if (y[i] < run.lo[i] || y[i] > run.hi[i]) return null;
	}
	return y;
}

export function checkSecondOrder(run: Run, p: Point, ctx: SecondOrderContext = {}): Verdict {
	const n = run.n;
	const gradL = ctx.lagrangianGrad ?? ((q: Point) => q.grad);
	const valueL = ctx.lagrangianValue ?? ((q: Point) => q.f);
	const g0 = ctx.derivativeFree ? null : gradL(p);
	const normals = [...(ctx.activeNormals ?? []), ...activeBoundNormals(run, p, g0)];
	const Z = nullSpaceBasis(normals, n);
	const k = Z.length;
	const xs = 1 + normInf(p.x);
	const L0 = valueL(p);
	if (ctx.derivativeFree) {
		// without a gradient a bound we sit on may not be active at all: step inward and look
		const drop = run.fDropTol(p, L0);
		for (let i = 0; i < n; i++) {
			const dir = p.x[i] <= run.lo[i] ? 1 : p.x[i] >= run.hi[i] ? -1 : 0;
			if (!dir || run.lo[i] === run.hi[i]) continue;
			const e = new Array<number>(n).fill(0);
			e[i] = dir;
			for (const t of [1e-6 * xs, 1e-4 * xs]) {
				const y = shifted(run, p.x, e, t);
				if (!y) continue;
				try {
					const q = run.evaluate(y);
					if (valueL(q) < L0 - drop) return { ok: false, detail: `f decreases from the bound ${dir > 0 ? 'lo' : 'hi'}${i} into the box` };
				} catch (err) {
					if (run.stopOutcome(err) !== 'left-domain') throw err;
				}
			}
		}
	}
	if (k === 0) return { ok: true, detail: 'vertex: the active constraints fix the point' };

	const tryEval = (y: number[] | null): Point | null => {
		if (!y) return null;
		try {
			const q = run.evaluate(y);
			return Number.isFinite(q.f) ? q : null;
		} catch (err) {
			if (run.stopOutcome(err) === 'left-domain') return null;
			throw err;
		}
	};

	// reduced Hessian Zᵀ ∇²L Z
	const H: number[][] = Array.from({ length: k }, () => new Array<number>(k).fill(0));
	let noise = 0;
	const objH = !ctx.derivativeFree && !ctx.generalActive ? p.hess : null;
	if (objH && objH.every((r) => r.every(Number.isFinite))) {
		for (let a = 0; a < k; a++) {
			const Hz = objH.map((row) => dot(row, Z[a]));
			for (let b = 0; b < k; b++) H[a][b] = dot(Z[b], Hz);
		}
	} else if (ctx.derivativeFree) {
		// central second differences of f (Nocedal & Wright 2006, eq. 8.9 and 8.10)
		const h = 1e-4 * xs;
		noise = (2 * Math.max(8 * EPS * Math.max(1, Math.abs(L0)), run.fRounding)) / (h * h);
		const side = (v: number[], t: number) => {
			const q = tryEval(shifted(run, p.x, v, t));
			return q ? valueL(q) : NaN;
		};
		const drop = run.fDropTol(p, L0);
		// Derivative-free first-order probes: a simplex can collapse on a slope, or
		// stagnate on a ridge of a non-smooth function where only oblique directions
		// descend (K. I. M. McKinnon, "Convergence of the Nelder–Mead simplex method
		// to a nonstationary point", SIAM J. Optim. 9(1):148–158, 1998). Probe ±d at
		// two scales for d in: the directions of Z, their diagonals (k ≤ 4), and 8k
		// seeded pseudo-random combinations.
		const dirs: number[][] = Z.map((z) => z.slice());
		const combo = (w: number[]) => {
			const v = new Array<number>(n).fill(0);
			for (let a = 0; a < k; a++) for (let i = 0; i < n; i++) v[i] += w[a] * Z[a][i];
			const m = Math.hypot(...v);
			return m > 0 ? v.map((x) => x / m) : null;
		};
		if (k >= 2 && k <= 4)
			for (let mask = 0; mask < 1 << k; mask++) {
				const v = combo(Array.from({ length: k }, (_, a) => (mask & (1 << a) ? -1 : 1)));
				if (v && !(mask & 1)) dirs.push(v); // ±d covers the other half
			}
		let seed = 0x9e3779b9 ^ k;
		const rand = () => {
			seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
			return seed / 4294967296 - 0.5;
		};
		if (k >= 2) for (let r = 0; r < 8 * k; r++) {
			const v = combo(Array.from({ length: k }, rand));
			if (v) dirs.push(v);
		}
		for (const d of dirs)
			for (const t of [1e-6 * xs, -1e-6 * xs, h, -h]) {
				if (side(d, t) < L0 - drop) return { ok: false, detail: `f decreases from the point along ${fmt(d)} (at a step of ${Math.abs(t).toExponential(0)})` };
			}
		for (let a = 0; a < k; a++) {
			const fp = side(Z[a], h);
			const fm = side(Z[a], -h);
			if (Number.isFinite(fp) && Number.isFinite(fm)) H[a][a] = (fp - 2 * L0 + fm) / (h * h);
			else if (Number.isFinite(fp)) H[a][a] = (side(Z[a], 2 * h) - 2 * fp + L0) / (h * h);
			else if (Number.isFinite(fm)) H[a][a] = (side(Z[a], -2 * h) - 2 * fm + L0) / (h * h);
			if (!Number.isFinite(H[a][a])) H[a][a] = 0;
			for (let b = 0; b < a; b++) {
				const u = Z[a].map((v, i) => v + Z[b][i]);
				const w = Z[a].map((v, i) => v - Z[b][i]);
				const val = (side(u, h) - side(w, h) - side(w, -h) + side(u, -h)) / (4 * h * h);
				H[a][b] = H[b][a] = Number.isFinite(val) ? val : 0;
			}
		}
	} else {
		// forward differences of ∇L along each z (Nocedal & Wright 2006, eq. 8.20)
		const h = 1e-6 * xs;
		const gz = Z.map((z) => dot(z, g0 as number[]));
		noise = (1e-8 * norm2(g0 as number[])) / h;
		for (let a = 0; a < k; a++) {
			let t = h;
			let q = tryEval(shifted(run, p.x, Z[a], t));
			if (!q) {
				t = -h;
				q = tryEval(shifted(run, p.x, Z[a], t));
			}
			if (!q) continue;
			const gq = gradL(q);
			for (let b = 0; b < k; b++) H[b][a] = (dot(Z[b], gq) - gz[b]) / t;
		}
		for (let a = 0; a < k; a++)
			for (let b = 0; b < a; b++) H[a][b] = H[b][a] = 0.5 * (H[a][b] + H[b][a]);
	}
	if (!H.every((r) => r.every(Number.isFinite))) return { ok: false, detail: 'the Hessian at the point is not finite' };
	const { values, vectors } = symmetricEigen(H);
	const lmin = values[0];
	const lmax = Math.max(Math.abs(values[0]), Math.abs(values[k - 1]));
	const tol = 1e-6 * Math.max(1, lmax) + noise;
	const vmin = new Array<number>(n).fill(0);
	for (let a = 0; a < k; a++) for (let i = 0; i < n; i++) vmin[i] += vectors[0][a] * Z[a][i];
	if (lmin < -tol)
		return {
			ok: false,
			detail: `negative curvature ${lmin.toPrecision(3)} along ${fmt(vmin)}: a ${values[k - 1] > tol ? 'saddle' : 'maximum'}, not a minimum`
		};
	if (lmin > tol) return { ok: true, detail: `curvature ≥ ${lmin.toPrecision(3)}` };
	// degenerate: probe every flat direction (eigenvectors with |λ| ≤ tol) at ±h
	const h2 = 1e-3 * xs;
	const gTol = g0 ? run.gradTolAt(p) : 0;
	for (let e = 0; e < k && Math.abs(values[e]) <= tol; e++) {
		const v = new Array<number>(n).fill(0);
		for (let a = 0; a < k; a++) for (let i = 0; i < n; i++) v[i] += vectors[e][a] * Z[a][i];
		// a first-order point may keep a gradient up to the tolerance: allow its linear term, no more
		const slope = g0 ? Math.min(Math.abs(dot(g0, v)), gTol) : 0;
		const allowed = run.fDropTol(p, L0) + 1.01 * h2 * slope;
		for (const t of [h2, -h2]) {
			const q = tryEval(shifted(run, p.x, v, t));
			if (q && valueL(q) < L0 - allowed)
				return { ok: false, detail: `f decreases from the point along ${fmt(v)} (flat curvature, higher-order descent or a step)` };
		}
	}
	return { ok: true, detail: 'curvature ≈ 0 and no descent at ±h (degenerate or flat minimum)' };
}

/**
 * A first-order point was found: decide `converged` or `stalled` and finish.
 * For `solve` run as least squares, the target must be met; otherwise the
 * point must pass the second-order check.
 */
export function conclude(run: Run, p: Point, firstOrderReason: string, ctx: SecondOrderContext = {}): RunResult {
	const extra = { multipliers: ctx.multipliers ?? null, kkt: ctx.kkt ?? null };
	if (run.mode === 'least-squares') {
		if (run.residualMet(p)) return run.finish(p, 'converged', `f = target within tolerance (|f − target| = ${Math.abs(p.userF - run.target).toExponential(2)})`, extra);
		return run.finish(p, 'stalled', `|f − target| = ${Math.abs(p.userF - run.target).toPrecision(4)} stays above the residual tolerance (a local minimum of |f − target|): no root found here`, extra);
	}
	if (!run.settings.secondOrderCheck) return run.finish(p, 'converged', firstOrderReason, extra);
	let verdict: Verdict;
	try {
		verdict = checkSecondOrder(run, p, ctx);
	} catch (err) {
		const outcome = run.stopOutcome(err);
		if (outcome === null) throw err;
		return run.finish(p, outcome, `${(err as Error).message} (during the second-order check of a first-order point)`, extra);
	}
	if (verdict.ok) return run.finish(p, 'converged', `${firstOrderReason}; ${verdict.detail}`, extra);
	return run.finish(p, 'stalled', `first-order point fails the second-order check: ${verdict.detail}`, extra);
}
