/**
 * What the database benchmarks share: a free port, a throwaway PostgreSQL
 * cluster in the temp directory (scripts/postgres.mjs), and the INVENTED
 * 200-point benchmark curve (a smooth efficiency-like hump with a little
 * ripple, not measured data) stored as a dataset.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import type { Knex } from 'knex';

export function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const srv = createServer();
		srv.once('error', reject);
		srv.listen(0, '127.0.0.1', () => {
			const { port } = srv.address() as { port: number };
			srv.close(() => resolve(port));
		});
	});
}

/** A fresh cluster with one database; DATABASE_URL is set to it (the Knex configuration reads it). `stop` also removes its files. */
export async function benchCluster(): Promise<{ databaseUrl: string; stop(): void }> {
	// a computed specifier: the plain-JS cluster script is loaded at run time, not type-checked here
	const clusterScript = new URL('../../scripts/postgres.mjs', import.meta.url).href;
	const { startCluster } = (await import(clusterScript)) as {
		startCluster: (o: { dataDir: string; port: number; log?: (m: string) => void }) => { createDatabase(db: string): string; stop(): void };
	};
	const dataDir = mkdtempSync(path.join(os.tmpdir(), 'kinkless-bench-pg-'));
	rmSync(dataDir, { recursive: true });
	const cluster = startCluster({ dataDir, port: await freePort(), log: () => {} });
	const databaseUrl = cluster.createDatabase('kinkless_bench');
	process.env.DATABASE_URL = databaseUrl;
	return {
		databaseUrl,
		stop: () => {
			cluster.stop();
			rmSync(dataDir, { recursive: true, force: true });
		}
	};
}

/** The benchmark curve stored as a dataset of workspace `workspaceId`; its id. */
export async function benchCurve(db: Knex, workspaceId: string, userId: string, name: string): Promise<string> {
	const datasetStore = await import('../../src/lib/server/datasets/store');
	const n = 200;
	const x = Array.from({ length: n }, (_, i) => 0.1 + (1.4 * i) / (n - 1));
	const y = x.map((j) => 0.86 - 1.2 * (j - 0.9) ** 2 + 0.3 * (j - 0.9) ** 3 + 0.002 * Math.sin(37 * j));
	const ds = await datasetStore.create(db, {
		workspaceId,
		name,
		shape: 'curve',
		shapeReason: 'one input',
		columns: [
			{ name: 'J', unit: '-', role: 'input' },
			{ name: 'eta', unit: '-', role: 'output' }
		],
		data: [x, y],
		rowCount: n,
		sourceFormat: 'json',
		sourceFilename: null,
		sourceBytes: null,
		sourceSha256: 'bench',
		notes: [],
		warnings: [],
		createdBy: userId
	});
	return ds.id;
}
