import { execFileSync } from 'node:child_process';
import knex from 'knex';
import { afterAll, describe, expect, it } from 'vitest';
import { testDb } from './client';

// Every migration goes up and comes back down on a scratch database of the same cluster.
const SCRATCH = 'kinkless_migration_check';

afterAll(async () => {
	await testDb().raw(`DROP DATABASE IF EXISTS ${SCRATCH}`);
	await testDb().destroy();
});

describe('migrations', () => {
	it('go up, keep data, and come all the way down', async () => {
		await testDb().raw(`DROP DATABASE IF EXISTS ${SCRATCH}`);
		await testDb().raw(`CREATE DATABASE ${SCRATCH}`);
		const url = new URL(process.env.DATABASE_URL!);
		url.pathname = `/${SCRATCH}`;
		// through the same script `npm start` uses (tsx loads the .ts migrations)
		const dbScript = (...args: string[]) => execFileSync('npx', ['tsx', 'scripts/db.ts', ...args], { env: { ...process.env, DATABASE_URL: url.toString() }, encoding: 'utf8' });
		expect(dbScript('migrate')).toMatch(/migrated \(batch 1\)/);
		const scratch = knex({ client: 'pg', connection: url.toString() });
		try {
			await scratch('users').insert({ id: 'u1', email: 'a@b.example', name: 'A', password_hash: 'x' });
			await expect(scratch('memberships').insert({ workspace_id: '00000000-0000-0000-0000-000000000000', user_id: 'u1', role: 'admin' })).rejects.toThrow();
			expect((await scratch('users').count('* as n'))[0].n).toBe('1');
			expect(dbScript('rollback', '--all')).toMatch(/rolled back/);
			const tables = await scratch.raw(`SELECT tablename FROM pg_tables WHERE schemaname = 'public' AND tablename NOT LIKE 'knex_%'`);
			expect(tables.rows).toEqual([]);
		} finally {
			await scratch.destroy();
		}
	});
});
