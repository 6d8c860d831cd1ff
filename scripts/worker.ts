// `npm run worker`: an extra study worker process against the same database.
// It runs one thread per core (KINKLESS_WORKERS to change) and takes jobs from
// the queue named by KINKLESS_QUEUE (default "studies"), like the app's own
// workers; start as many as you like, on any machine that reaches the database.
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import knex from 'knex';
import pg from 'pg';
import config from '../knexfile';
import { queueName } from '../src/lib/server/studies/queue/boss';
import { StudyWorkers, defaultThreads } from '../src/lib/server/studies/queue/workers';

pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v));
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const databaseUrl = process.env.DATABASE_URL ?? String(config.connection);
const db = knex({ ...config, connection: databaseUrl, pool: { min: 0, max: 3 } });
const threads = Math.max(1, defaultThreads());
const queue = queueName();

const workers = await StudyWorkers.start({ databaseUrl, db, threads, queue, root });
console.log(`kinkless worker: ${threads} thread${threads === 1 ? '' : 's'} on queue "${queue}" (pid ${process.pid})`);

let stopping = false;
async function stop(signal: string) {
	if (stopping) return;
	stopping = true;
	console.log(`kinkless worker: ${signal}; handing back jobs in progress`);
	await workers.stop();
	await db.destroy();
	process.exit(0);
}
process.on('SIGINT', () => void stop('SIGINT'));
process.on('SIGTERM', () => void stop('SIGTERM'));
