import { describe, expect, test } from 'vitest';
import { limitBytes } from '../../../src/lib/server/datasets/limitBytes';
import { MAX_COLUMNS, MAX_FILE_BYTES, MAX_ROWS } from '../../../src/lib/server/datasets/limits';
import { parseTable } from '../../../src/lib/server/datasets/parseTable';
import { parseDatasetJson } from '../../../src/lib/server/datasets/tableFromJson';
import { expectDatasetError, parseFile } from './helpers';

const MB = 1024 * 1024;

/** A stream of `total` bytes made lazily from one reused 1 MB chunk; counts pulls and cancels. */
function lazyStream(total: number) {
	const chunk = new Uint8Array(MB).fill(0x41);
	const stats = { pulled: 0, cancelled: false };
	let sent = 0;
	const stream = new ReadableStream<Uint8Array>(
		{
			pull(controller) {
				if (sent >= total) return controller.close();
				const n = Math.min(MB, total - sent);
				stats.pulled++;
				sent += n;
				controller.enqueue(n === MB ? chunk : chunk.subarray(0, n));
			},
			cancel() {
				stats.cancelled = true;
			}
		},
		{ highWaterMark: 0 }
	);
	return { stream, stats };
}

describe('limits', () => {
	test('the limits are the documented ones', () => {
		expect(MAX_FILE_BYTES).toBe(20 * 1024 * 1024);
		expect(MAX_ROWS).toBe(1_000_000);
		expect(MAX_COLUMNS).toBe(32);
	});

	test('limitBytes stops a 1 GB upload just past 20 MB without reading the rest', async () => {
		const { stream, stats } = lazyStream(1024 * MB);
		const error = await expectDatasetError(limitBytes(stream, MAX_FILE_BYTES), 'file-too-large', 'file is more than 20 MB; the limit is 20 MB');
		expect(error.status).toBe(413);
		expect(stats.pulled).toBe(21);
		expect(stats.cancelled).toBe(true);
	});

	test('limitBytes returns every byte of an upload within the limit', async () => {
		const { stream } = lazyStream(2 * MB + 5);
		const bytes = await limitBytes(stream);
		expect(bytes.byteLength).toBe(2 * MB + 5);
		expect(bytes[2 * MB + 4]).toBe(0x41);
	});

	test('limitBytes accepts exactly the limit', async () => {
		const { stream } = lazyStream(3 * MB);
		expect((await limitBytes(stream, 3 * MB)).byteLength).toBe(3 * MB);
	});

	test('parseTable refuses bytes over 20 MB, saying how large they are', async () => {
		const bytes = new Uint8Array(Math.round(21.3 * MB));
		await expectDatasetError(parseTable({ bytes, filename: 'big.csv' }), 'file-too-large', 'file is 21.3 MB; the limit is 20 MB');
	});

	test('1,000,001 rows', async () => {
		const text = 'x,y\n' + '1,2\n'.repeat(MAX_ROWS + 1);
		await expectDatasetError(parseFile(text), 'too-many-rows', 'table has 1,000,001 rows; the limit is 1,000,000 rows');
	});

	test('far more rows: reading stops past the limit', async () => {
		const text = 'x,y\n' + '1,2\n'.repeat(MAX_ROWS + 100_000);
		await expectDatasetError(parseFile(text), 'too-many-rows', 'table has more than 1,000,000 rows; the limit is 1,000,000 rows');
	});

	test('exactly 1,000,000 rows, after a header and a units row, are read', async () => {
		const text = 'x,y\nm,s\n' + '1,2\n'.repeat(MAX_ROWS);
		const parsed = await parseFile(text);
		expect(parsed.rows).toHaveLength(MAX_ROWS);
	});

	test('33 columns', async () => {
		const header = Array.from({ length: 33 }, (_, i) => `c${i + 1}`).join(',');
		const row = Array.from({ length: 33 }, (_, i) => i).join(',');
		const error = await expectDatasetError(parseFile(`${header}\n${row}\n`), 'too-many-columns', 'table has 33 columns; the limit is 32 columns');
		expect(error.body().error.code).toBe('too-many-columns');
	});

	test('32 columns are fine', async () => {
		const header = Array.from({ length: 32 }, (_, i) => `c${i + 1}`).join(',');
		const row = Array.from({ length: 32 }, (_, i) => i).join(',');
		expect((await parseFile(`${header}\n${row}\n`)).columns).toHaveLength(32);
	});

	test('a JSON body over the row limit', async () => {
		const row = [1, 2];
		const body = {
			name: 'too long',
			columns: [
				{ name: 'x', role: 'input' },
				{ name: 'y', role: 'output' }
			],
			rows: new Array(MAX_ROWS + 1).fill(row)
		};
		await expectDatasetError(() => parseDatasetJson(body), 'too-many-rows', 'table has 1,000,001 rows; the limit is 1,000,000 rows');
	});

	test('a JSON body over the column limit', async () => {
		const columns = Array.from({ length: 33 }, (_, i) => ({ name: `c${i}`, role: i === 0 ? 'input' : 'output' }));
		await expectDatasetError(
			() => parseDatasetJson({ name: 'wide', columns, rows: [] }),
			'too-many-columns',
			'table has 33 columns; the limit is 32 columns'
		);
	});
});
