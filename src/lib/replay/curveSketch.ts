/**
 * What the replay draws of one fitted curve: f, f′ and f″ sampled over the
 * problem's bounds, with the exact one-sided limits inserted at every knot so a
 * jump in f′ or f″ is drawn as a jump (not a slope between two samples), the
 * knots where f′ jumps (kinks) and where only f″ jumps, and the one-sided slopes
 * at a kink. Plain TypeScript over a CurveFit: runs in the browser on a fit
 * file fetched on demand, and in tests on a fit built directly.
 */
import { auditSmoothness } from '../numerics/audit/smoothness';
import type { CurveFit } from '../numerics/fits/types';

export interface SketchPoint {
	x: number;
	f: number;
	df: number;
	d2f: number;
}

export interface KnotMark {
	x: number;
	/** knot index into fit.knots */
	knot: number;
	/** f′ from the left and from the right (exact one-sided limits) */
	left: number;
	right: number;
	/** f″ from the left and from the right */
	left2: number;
	right2: number;
	/** f′ jumps here (a kink) */
	kink: boolean;
	/** f″ jumps here */
	curvatureJump: boolean;
}

export interface CurveSketch {
	points: SketchPoint[];
	knots: KnotMark[];
	domain: [number, number];
}

/** Most knots whose one-sided limits are inserted into the sampling (beyond this the even sampling alone is drawn). */
const MAX_INSERTED_KNOTS = 1000;

export function sketchCurve(fit: CurveFit, bounds: readonly [number, number], samples = 400): CurveSketch {
	const lo = Math.max(bounds[0], fit.extrapolation === 'refuse' ? fit.domain[0] : -Infinity);
	const hi = Math.min(bounds[1], fit.extrapolation === 'refuse' ? fit.domain[1] : Infinity);
	if (!(hi > lo)) throw new RangeError(`nothing to draw: bounds [${bounds[0]}, ${bounds[1]}] and the fit's domain do not overlap`);
	const k = fit.knots;
	const audit = k.length >= 3 ? auditSmoothness(fit, { worst: k.length }) : null;
	const marks: KnotMark[] = [];
	if (audit) {
		for (const j of audit.worst) {
			if (j.x < lo || j.x > hi) continue;
			const L = fit.evaluatePiece(j.knot - 1, j.x);
			const R = fit.evaluatePiece(j.knot, j.x);
			marks.push({
				x: j.x,
				knot: j.knot,
				left: L.df,
				right: R.df,
				left2: L.d2f,
				right2: R.d2f,
				kink: Math.abs(j.jumpD1) > audit.tolerance.d1 || Math.abs(j.jumpF) > audit.tolerance.f,
				curvatureJump: Math.abs(j.jumpD2) > audit.tolerance.d2
			});
		}
		marks.sort((a, b) => a.x - b.x);
	}
	const points: SketchPoint[] = [];
	const push = (x: number, j: { f: number; df: number; d2f: number }) => {
		if (Number.isFinite(j.f)) points.push({ x, f: j.f, df: j.df, d2f: j.d2f });
	};
	const inserted = marks.length <= MAX_INSERTED_KNOTS ? marks : [];
	let m = 0;
	for (let i = 0; i <= samples; i++) {
		const x = i === samples ? hi : lo + ((hi - lo) * i) / samples;
		// the left and right limits at each knot passed since the last sample, so jumps are vertical
		while (m < inserted.length && inserted[m].x <= x) {
			const mk = inserted[m++];
			push(mk.x, fit.evaluatePiece(mk.knot - 1, mk.x));
			push(mk.x, fit.evaluatePiece(mk.knot, mk.x));
		}
		push(x, fit.evaluate(x));
	}
	return { points, knots: marks, domain: [lo, hi] };
}

/** The knot nearest to x among the kinks, if it lies within `tol` of x. */
export function kinkNear(sketch: CurveSketch, x: number, tol: number): KnotMark | null {
	let best: KnotMark | null = null;
	for (const k of sketch.knots) if (k.kink && (!best || Math.abs(k.x - x) < Math.abs(best.x - x))) best = k;
	return best && Math.abs(best.x - x) <= tol ? best : null;
}

/**
 * One sentence on why a gradient method cannot settle at a kink: which way
 * each one-sided slope points for the problem asked, so the reader sees that
 * no point there has f′ = 0.
 */
export function kinkSentence(k: Pick<KnotMark, 'x' | 'left' | 'right'>, kind: 'minimize' | 'maximize' | 'solve', fmt: (v: number) => string, inputName = 'x'): string {
	const at = `${inputName} = ${fmt(k.x)}`;
	const slopes = `f′ is ${fmt(k.left)} just left of ${at} and ${fmt(k.right)} just right of it`;
	if (kind === 'solve') return `${slopes}: Newton-type steps use one of these slopes at a time, so near the knot they overshoot to the other side and back instead of closing in.`;
	const peak = kind === 'maximize' ? k.left > 0 && k.right < 0 : k.left < 0 && k.right > 0;
	if (peak)
		return `${slopes}: the best value sits on the corner itself, where no gradient is zero, so every step the slope proposes overshoots the corner and the line search shrinks it until the optimizer stops short of its tolerance.`;
	return `${slopes}: the slope changes abruptly here, so the model the optimizer builds from one side is wrong on the other, its steps shrink at the knot and it stops without f′ reaching zero.`;
}
