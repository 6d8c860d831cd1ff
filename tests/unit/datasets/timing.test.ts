import { expect, test } from 'vitest';
import { parseTable } from '../../../src/lib/server/datasets/parseTable';
import { validateTable } from '../../../src/lib/server/datasets/validateTable';
import { bytesOf } from './helpers';

// Reports the time only; machines differ too much for a time assertion.
test('parse and validate a 100,000-row, 4-column CSV', async () => {
	const lines = ['J [-],eta [-],ct [-],cp [-]'];
	for (let i = 0; i < 100_000; i++) {
		const j = i * 1e-5;
		lines.push(`${j},${(0.85 * Math.sin(Math.PI * j)).toPrecision(8)},${(0.12 - 0.1 * j).toExponential(6)},${(0.05 + 0.01 * j * j).toFixed(7)}`);
	}
	const bytes = bytesOf(lines.join('\n'));

	const t0 = performance.now();
	const parsed = await parseTable({ bytes, filename: 'sweep.csv' });
	const t1 = performance.now();
	const report = validateTable(parsed);
	const t2 = performance.now();

	console.log(
		`100,000 × 4 CSV (${(bytes.byteLength / 1024 / 1024).toFixed(1)} MB): parse ${(t1 - t0).toFixed(0)} ms, validate ${(t2 - t1).toFixed(0)} ms, total ${(t2 - t0).toFixed(0)} ms`
	);
	expect(report.ok).toBe(true);
	expect(report.shape).toBe('curve');
	expect(report.rowCount).toBe(100_000);
});
