/**
 * The exported fit file: for every curve method it loads back into a fit that
 * evaluates bit for bit like the original (inside, on the knots, outside);
 * a changed byte, a tampered checksum and an unknown version are refused with
 * their own messages. Reference: the engine's own fit (identity check); the
 * SHA-256 is checked against node:crypto, an independent implementation.
 */
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { CAUTION } from '../../../src/lib/caution';
import { curveMethods, fitCurve, type CurveFitOptions, type CurveMethod } from '../../../src/lib/numerics/fits';
import { canonicalJson, createFitExport, fitExportText, loadFitExport, readFitExport } from '../../../src/lib/numerics/export';

const X = [0, 0.7, 1.5, 2, 3.1, 4, 5.5, 6, 7.2, 8];
const Y = X.map((x, i) => Math.exp(-0.2 * x) * Math.cos(x) + 0.01 * ((i * 7) % 3));

function optionsFor(method: CurveMethod): CurveFitOptions {
	if (method === 'cubic-clamped') return { slopes: [1, 0], extrapolation: 'linear' };
	if (method === 'polynomial-least-squares') return { degree: 3, extrapolation: 'extend' };
	return { extrapolation: 'hold' };
}

const source = {
	dataset: { name: 'Damped response (invented)', version: 4, sha256: 'c0ffee'.padEnd(64, '0') },
	inputs: [{ name: 't', unit: 's' }],
	output: { name: 'u', unit: 'mm' }
};

describe('fit file export', () => {
	for (const method of Object.keys(curveMethods) as CurveMethod[]) {
		it(`${method}: round trip is bitwise-equal`, async () => {
			const fit = fitCurve(method, X, Y, optionsFor(method));
			const doc = await createFitExport({ fit: fit.toJSON(), source, kinkless: '0.1.0', caution: CAUTION });
			const text = fitExportText(doc);
			const { doc: back, fit: again } = await loadFitExport(text);
			expect(back.caution).toBe(CAUTION);
			expect(back.source).toEqual(source);
			expect(back.fit.method).toBe(method);
			expect(back.fit.options).toBeDefined();
			expect(again.method).toBe(method);
			expect(again.extrapolation).toBe(fit.extrapolation);
			const pts = [...Array.from(fit.knots), ...X, -1, 9.5, 0.123456789, 7.999999999];
			for (const x of pts) {
				const a = fit.evaluate(x);
				const b = again.evaluate(x);
				expect([Object.is(a.f, b.f), Object.is(a.df, b.df), Object.is(a.d2f, b.d2f)], `at ${x}`).toEqual([true, true, true]);
			}
			// the checksum is SHA-256 of the canonical text (checked with node:crypto)
			const { checksum, ...rest } = doc;
			expect(checksum).toBe(`sha256:${createHash('sha256').update(canonicalJson(rest)).digest('hex')}`);
		});
	}

	it('refuses a tampered checksum, an edited body and an unknown version', async () => {
		const fit = fitCurve('pchip', X, Y);
		const doc = await createFitExport({ fit: fit.toJSON(), source, kinkless: '0.1.0', caution: CAUTION });
		const tampered = { ...doc, checksum: `sha256:${'0'.repeat(64)}` };
		await expect(readFitExport(JSON.stringify(tampered))).rejects.toThrow(/checksum mismatch/);
		const edited = JSON.parse(JSON.stringify(doc));
		edited.fit.coefficients[0] = 42;
		await expect(readFitExport(edited)).rejects.toThrow(/checksum mismatch .*changed or damaged/);
		await expect(readFitExport({ ...doc, version: 2 })).rejects.toThrow(/version 2 is not supported/);
		await expect(readFitExport({ ...doc, format: 'other' })).rejects.toThrow(/"format" must be/);
		await expect(readFitExport('{not json')).rejects.toThrow(/not valid JSON/);
		const { checksum: _drop, ...noSum } = doc;
		await expect(readFitExport(noSum)).rejects.toThrow(/"checksum" is missing/);
	});
});
