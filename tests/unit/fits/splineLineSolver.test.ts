/**
 * The grid fits' batched spline solve (one factored system per axis, two
 * lines per sweep) against the one-line solve the curve fits use, whose
 * slopes are checked against SciPy's CubicSpline in scipy.test.ts; and, as an
 * outside check on its own, against SciPy 1.10's CubicSpline (bc_type
 * 'natural' and 'not-a-knot') run live: the slope at each knot is the
 * spline's first derivative there.
 */
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { SplineLineSolver, cubicSplineSlopesInto } from '../../../src/lib/numerics/fits/cubicSplineSlopes';
import { runScipy } from '../../reference/scipy';
import { expectClose } from '../../reference/tolerance';

const KINDS = ['natural', 'not-a-knot'] as const;

function oneLine(x: Float64Array, y: Float64Array, kind: (typeof KINDS)[number]): Float64Array {
	const buf = new Float64Array(2 * x.length);
	cubicSplineSlopesInto(x, y, { kind }, { kind }, buf, 2, 0, 1);
	return Float64Array.from({ length: x.length }, (_, i) => buf[2 * i]);
}

const axisArb = fc
	.array(fc.double({ min: 0.01, max: 3, noNaN: true }), { minLength: 1, maxLength: 40 })
	.map((h) => Float64Array.from(h.reduce<number[]>((a, s) => [...a, a[a.length - 1] + s], [-1])));

describe('SplineLineSolver agrees with the one-line solve', () => {
	for (const kind of KINDS) {
		it(`${kind}: random uneven axes (2–41 knots), 1–5 lines, strided in and out`, () => {
			fc.assert(
				fc.property(axisArb, fc.integer({ min: 1, max: 5 }), fc.integer({ min: 1, max: 3 }), fc.integer({ min: 0, max: 1000 }), (x, count, os, seed) => {
					const n = x.length;
					const yStep = n + 3;
					const y = Float64Array.from({ length: count * yStep + 2 }, (_, i) => Math.sin(0.7 * i + seed) * 10 + i * 0.01);
					const oStep = n * os + 1;
					const out = new Float64Array(count * oStep + 4).fill(NaN);
					new SplineLineSolver(x, kind).solveLines(y, 2, yStep, out, 1, os, oStep, count);
					// the two solves round differently (reciprocal pivots against divisions); the difference grows
					// with the system's conditioning, which the spacing ratio bounds (common practice, no source)
					let hMin = Infinity;
					let hMax = 0;
					for (let i = 1; i < n; i++) {
						hMin = Math.min(hMin, x[i] - x[i - 1]);
						hMax = Math.max(hMax, x[i] - x[i - 1]);
					}
					const ratio = Math.max(1, hMax / hMin);
					for (let l = 0; l < count; l++) {
						const ref = oneLine(x, y.slice(2 + l * yStep, 2 + l * yStep + n), kind);
						const scale = Math.max(1, ...ref.map(Math.abs));
						for (let i = 0; i < n; i++) expect(Math.abs(out[1 + l * oStep + os * i] - ref[i])).toBeLessThanOrEqual(1e-12 * ratio * scale);
					}
					// the gaps between strided outputs are left alone
					if (os > 1) expect(Number.isNaN(out[2])).toBe(true);
				})
			);
		});
	}
});

interface Ref {
	natural: number[];
	notAKnot: number[];
}
const X = [0, 0.3, 0.35, 1.1, 1.2, 2.6, 3.0, 4.4, 4.5];
const Y = X.map((v) => Math.exp(0.4 * v) * Math.cos(2 * v));
let ref: Ref;
beforeAll(() => {
	ref = runScipy<Ref>(
		`
from scipy.interpolate import CubicSpline
x = np.array(data['x']); y = np.array(data['y'])
out = {'natural': CubicSpline(x, y, bc_type='natural')(x, 1).tolist(), 'notAKnot': CubicSpline(x, y, bc_type='not-a-knot')(x, 1).tolist()}
`,
		{ x: X, y: Y }
	);
});

describe('SplineLineSolver vs SciPy 1.10 CubicSpline (live): knot slopes', () => {
	it.each([
		['natural', 'natural'],
		['not-a-knot', 'notAKnot']
	] as const)('%s, two lines (one sweep pair) and one odd line', (kind, key) => {
		const x = Float64Array.from(X);
		const y = Float64Array.from([...Y, ...Y.map((v) => 3 * v), ...Y.map((v) => -v)]);
		const out = new Float64Array(3 * X.length);
		new SplineLineSolver(x, kind).solveLines(y, 0, X.length, out, 0, 1, X.length, 3);
		ref[key].forEach((s, i) => {
			expectClose(out[i], s, 1e-12, `line 1 knot ${i}`);
			expectClose(out[X.length + i], 3 * s, 1e-12, `line 2 knot ${i}`);
			expectClose(out[2 * X.length + i], -s, 1e-12, `line 3 knot ${i}`);
		});
	});
});
