/**
 * The reference optimum of a problem on one fit: a dense global search over
 * the bounds (one input), refined where it can be done exactly —
 * - an interior extremum: bisection on f′ across the best sample (f′ is
 *   exact, so this reaches rounding level where a search on f stops near √ε);
 * - an active inequality constraint: bisection on the constraint across the
 *   feasible/infeasible boundary;
 * - equality constraints and `solve`: roots by sign change + bisection.
 * The scorecard measures each optimizer's best end point against it: an
 * optimizer that stops short of the fit's own optimum shows a gap.
 */
import type { Problem } from '../numerics/optimize/types';

export interface Reference {
	kind: 'optimum' | 'roots' | 'none';
	/** the best point found (optimum) or the root nearest the middle of the bounds (solve) */
	x: number[] | null;
	f: number | null;
	/** solve: every root found within the bounds, sorted */
	roots?: number[];
	/** samples in the dense search */
	samples: number;
	/** max f − min f over the samples: the scale against which gaps are judged */
	fRange: number;
	note?: string;
}

const BISECTIONS = 200;

function bisect(g: (x: number) => number, a: number, b: number): number {
	let ga = g(a);
	for (let k = 0; k < BISECTIONS; k++) {
		const m = 0.5 * (a + b);
		if (m <= Math.min(a, b) || m >= Math.max(a, b)) break;
		const gm = g(m);
		if (gm === 0) return m;
		if (Math.sign(gm) === Math.sign(ga)) {
			a = m;
			ga = gm;
		} else b = m;
	}
	return 0.5 * (a + b);
}

export function referenceOptimum(problem: Problem, bounds: readonly (readonly [number, number])[], samples = 20001): Reference {
	if (bounds.length !== 1) return { kind: 'none', x: null, f: null, samples: 0, fRange: 0, note: 'the dense reference search covers one-input problems' };
	const [lo, hi] = bounds[0];
	const obj = problem.objective;
	const f = (x: number): number => {
		try {
			const v = obj.evaluate([x]).f;
			return Number.isFinite(v) ? v : NaN;
		} catch {
			return NaN;
		}
	};
	const df = (x: number): number => {
		try {
			return obj.evaluate([x]).grad[0];
		} catch {
			return NaN;
		}
	};
	const xs = new Float64Array(samples);
	const fs = new Float64Array(samples);
	let fMin = Infinity;
	let fMax = -Infinity;
	for (let i = 0; i < samples; i++) {
		xs[i] = i === samples - 1 ? hi : lo + ((hi - lo) * i) / (samples - 1);
		fs[i] = f(xs[i]);
		if (fs[i] < fMin) fMin = fs[i];
		if (fs[i] > fMax) fMax = fs[i];
	}
	const fRange = Number.isFinite(fMax - fMin) ? fMax - fMin : 0;

	if (problem.kind === 'solve') {
		const t = problem.target ?? 0;
		const g = (x: number) => f(x) - t;
		const roots: number[] = [];
		for (let i = 0; i < samples; i++) {
			const gi = fs[i] - t;
			if (gi === 0) roots.push(xs[i]);
			else if (i + 1 < samples) {
				const gn = fs[i + 1] - t;
				if (Number.isFinite(gi) && Number.isFinite(gn) && gi * gn < 0) roots.push(bisect(g, xs[i], xs[i + 1]));
			}
			if (roots.length >= 100) break;
		}
		if (!roots.length) {
			let bi = 0;
			for (let i = 1; i < samples; i++) if (Math.abs(fs[i] - t) < Math.abs(fs[bi] - t)) bi = i;
			return { kind: 'roots', x: [xs[bi]], f: fs[bi], roots: [], samples, fRange, note: `no root of f = ${t} within the bounds; closest approach shown` };
		}
		const mid = 0.5 * (lo + hi);
		const near = roots.reduce((a, b) => (Math.abs(b - mid) < Math.abs(a - mid) ? b : a));
		return { kind: 'roots', x: [near], f: f(near), roots, samples, fRange };
	}

	const s = problem.kind === 'maximize' ? -1 : 1;
	const cons = obj.constraints ?? [];
	const cval = (x: number, i: number): number => {
		try {
			return cons[i].evaluate([x]).value;
		} catch {
			return NaN;
		}
	};
	// bisection leaves an equality residual at rounding level; an inequality must hold
	const feasible = (x: number): boolean => cons.every((c, i) => (c.kind === 'eq' ? Math.abs(cval(x, i)) <= 1e-8 : cval(x, i) <= 1e-10));

	// Candidate points: feasible samples, refined extrema, constraint boundaries and equality roots.
	const candidates: number[] = [];
	const eq = cons.map((c, i) => (c.kind === 'eq' ? i : -1)).filter((i) => i >= 0);
	const ineq = cons.map((c, i) => (c.kind === 'ineq' ? i : -1)).filter((i) => i >= 0);
	if (eq.length) {
		for (const ci of eq) {
			let prev = cval(xs[0], ci);
			if (prev === 0) candidates.push(xs[0]);
			for (let i = 1; i < samples; i++) {
				const cur = cval(xs[i], ci);
				if (cur === 0) candidates.push(xs[i]);
				else if (prev * cur < 0) candidates.push(bisect((x) => cval(x, ci), xs[i - 1], xs[i]));
				prev = cur;
			}
		}
	} else {
		const ok = new Uint8Array(samples);
		for (let i = 0; i < samples; i++) ok[i] = Number.isFinite(fs[i]) && ineq.every((ci) => cval(xs[i], ci) <= 0) ? 1 : 0;
		let bi = -1;
		for (let i = 0; i < samples; i++) if (ok[i] && (bi < 0 || s * fs[i] < s * fs[bi])) bi = i;
		if (bi >= 0) {
			candidates.push(xs[bi]);
			// interior extremum: bisection on s·f′ across the best sample
			if (bi > 0 && bi < samples - 1 && ok[bi - 1] && ok[bi + 1]) {
				const a = xs[bi - 1];
				const b = xs[bi + 1];
				if (s * df(a) < 0 && s * df(b) > 0) candidates.push(bisect((x) => s * df(x), a, b));
			}
			// an active inequality: the boundary next to the best sample
			for (const nb of [bi - 1, bi + 1]) {
				if (nb < 0 || nb >= samples || ok[nb]) continue;
				for (const ci of ineq) {
					const a = xs[bi];
					const b = xs[nb];
					if (cval(a, ci) <= 0 && cval(b, ci) > 0) {
						const edge = bisect((x) => cval(x, ci), a, b);
						// step back onto the feasible side
						const fe = cval(edge, ci) <= 0 ? edge : a;
						candidates.push(fe);
					}
				}
			}
		}
	}
	let best: number | null = null;
	let bestF = NaN;
	for (const x of candidates) {
		const v = f(x);
		if (!Number.isFinite(v) || !feasible(x)) continue;
		if (best === null || s * v < s * bestF) {
			best = x;
			bestF = v;
		}
	}
	if (best === null) return { kind: 'none', x: null, f: null, samples, fRange, note: 'no feasible point found within the bounds' };
	return { kind: 'optimum', x: [best], f: bestF, samples, fRange };
}
