import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { ThreadPool } from '$lib/server/studies/queue/threadPool';

const script = fileURLToPath(new URL('./poolThread.mjs', import.meta.url));
const pool = new ThreadPool(script, 2, undefined, () => {});
afterAll(() => pool.close());

describe('the study thread pool', () => {
	it('runs tasks on its threads', async () => {
		await pool.ready();
		const out = await Promise.all([1, 2, 3, 4, 5].map((v) => pool.run<{ echo: number }>({ job: { kind: 'echo', value: v } }, 5000)));
		expect(out.map((o) => o.echo)).toEqual([1, 2, 3, 4, 5]);
	});

	it('a thread that dies rejects its task (so the job is retried) and is replaced', async () => {
		await expect(pool.run({ job: { kind: 'crash' } }, 5000)).rejects.toThrow(/exited \(code 3\)/);
		await expect(pool.run({ job: { kind: 'throw' } }, 5000)).rejects.toThrow(/thrown in the thread/);
		const out = await Promise.all([6, 7].map((v) => pool.run<{ echo: number }>({ job: { kind: 'echo', value: v } }, 5000)));
		expect(out.map((o) => o.echo)).toEqual([6, 7]);
		expect(pool.size).toBe(2);
	});

	it('a thread past its time is terminated and replaced', async () => {
		await expect(pool.run({ job: { kind: 'hang' } }, 300)).rejects.toThrow(/timed out/);
		expect((await pool.run<{ echo: number }>({ job: { kind: 'echo', value: 8 } }, 5000)).echo).toBe(8);
		expect(pool.lost).toBeGreaterThanOrEqual(3);
	});
});
