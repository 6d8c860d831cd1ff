// Monotonicity per monotone stretch, checked against SciPy's own interpolators
// (CubicSpline with natural ends, PchipInterpolator) evaluated live at the
// same points, and against the Fritsch–Carlson property that PCHIP keeps
// every monotone stretch (F. N. Fritsch, R. E. Carlson, 1980, SIAM J. Numer. Anal. 17:238–246).
import { describe, expect, it } from 'vitest';
import { monotoneStretches } from '$lib/numerics/audit/monotoneStretches';
import { fitCurve } from '$lib/numerics/fits';
import { runScipy } from '../../reference/scipy';
import { expectClose } from '../../reference/tolerance';

// INVENTED data: rises with a sharp step, plateaus, then falls — not monotone as a whole
const X = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10];
const Y = [0, 0.1, 0.2, 3, 3.1, 3.2, 3.3, 2, 1, 0.5, 0.2];
const PER = 16;

/** the same stretches, held intervals and sample points as the audit, f′ from SciPy */
function scipyWorst(kind: 'natural' | 'pchip'): { from: number; to: number; worst: number }[] {
	return runScipy(
		`from scipy.interpolate import CubicSpline, PchipInterpolator
x = np.array(data["x"], float); y = np.array(data["y"], float); per = data["per"]
f = CubicSpline(x, y, bc_type="natural") if data["kind"] == "natural" else PchipInterpolator(x, y)
d = f.derivative()
n = len(x) - 1
s = np.sign(np.diff(y))
out = []
k = 0
while k < n:
    e = k
    while e + 1 < n and s[e + 1] == s[k]: e += 1
    first = k + 1 if k > 0 else k
    last = e - 1 if e + 1 < n else e
    worst = 0.0
    for i in range(first, last + 1):
        pts = x[i] + (x[i + 1] - x[i]) * np.arange(per + 1) / per
        worst = min(worst, float(np.min(s[k] * d(pts))))
    out.append({"from": float(x[k]), "to": float(x[e + 1]), "worst": worst})
    k = e + 1`,
		{ x: X, y: Y, per: PER, kind }
	);
}

describe('monotonicity per monotone stretch', () => {
	it('finds the rising and the falling stretch of data that are not monotone as a whole', () => {
		const s = monotoneStretches(fitCurve('pchip', X, Y), X, Y, PER);
		expect(s.map((t) => [t.from, t.to, t.direction])).toEqual([
			[0, 6, 'increasing'],
			[6, 10, 'decreasing']
		]);
		// the interval beside the turn at x = 6 is not held to either direction
		expect(s.map((t) => t.intervalsChecked)).toEqual([5, 3]);
	});

	it('PCHIP keeps every stretch (Fritsch–Carlson), and SciPy’s PCHIP agrees', () => {
		const ours = monotoneStretches(fitCurve('pchip', X, Y), X, Y, PER);
		expect(ours.every((t) => t.kept)).toBe(true);
		for (const t of scipyWorst('pchip')) expect(t.worst).toBeGreaterThanOrEqual(-1e-12);
	});

	it('the natural cubic spline breaks the rising stretch after the step, by the amount SciPy’s CubicSpline shows', () => {
		const ours = monotoneStretches(fitCurve('cubic-natural', X, Y), X, Y, PER);
		const ref = scipyWorst('natural');
		expect(ref[0].worst).toBeLessThan(0); // SciPy: the spline's slope turns negative inside the rising stretch
		expect(ours[0].kept).toBe(false);
		expect(ours[0].worstAt).not.toBeNull();
		ours.forEach((t, i) => {
			expect(t.kept).toBe(ref[i].worst >= -1e-9);
			expectClose(t.worst, ref[i].worst, 1e-9, `worst slope against the direction, stretch ${i} (SciPy CubicSpline natural, live)`);
		});
	});
});
