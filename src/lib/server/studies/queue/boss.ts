/**
 * pg-boss (10.x) in the app's own PostgreSQL: it keeps its tables in schema
 * `pgboss`. Three queues per deployment (KINKLESS_QUEUE, default "studies"):
 *   <q>         study jobs: one audit per fit, runs per fit × optimizer × chunk of starts
 *   <q>-mail    "study finished" e-mail, sent once the last run is stored
 *   <q>-failed  dead letters: a job that failed after its retries fails its study
 * Jobs are inserted with the caller's Knex transaction (pg-boss accepts any
 * `{ executeSql }`), so a study and its jobs, or a batch of runs and its
 * follow-up jobs, commit together or not at all.
 */
import PgBoss from 'pg-boss';
import type { Knex } from 'knex';

const DEFAULT_QUEUE = 'studies';
export const queueName = () => process.env.KINKLESS_QUEUE || DEFAULT_QUEUE;
export const mailQueue = (q: string) => `${q}-mail`;
export const failedQueue = (q: string) => `${q}-failed`;

/** retries of a study job before its study is marked failed */
export const RETRY_LIMIT = 3;
export const RETRY_DELAY_SECONDS = 2;
/** retries of a "study finished" e-mail, with doubling delays from 10 s (about 11 hours in all) */
export const MAIL_RETRY_LIMIT = 12;
export const MAIL_RETRY_SECONDS = 10;
/** how often some live pg-boss instance looks for expired (abandoned) jobs */
const MAINTENANCE_SECONDS = Number(process.env.KINKLESS_QUEUE_MAINTENANCE_SECONDS ?? 10);

/** pg-boss speaks `$1` placeholders; Knex raw speaks `?`. */
function knexExecutor(db: Knex | Knex.Transaction): PgBoss.Db {
	return {
		async executeSql(text: string, values: unknown[] = []) {
			const bindings: unknown[] = [];
			const sql = text.replace(/\?/g, '\\?').replace(/\$(\d+)/g, (_, n: string) => {
				const v = values[Number(n) - 1];
				bindings.push(v === undefined ? null : v);
				return '?';
			});
			const r = await db.raw(sql, bindings as Knex.RawBinding[]);
			return { rows: r.rows ?? [] };
		}
	};
}

let sqlOnly: PgBoss | null = null;
/** A pg-boss that is never started: only its SQL is used, through the caller's transaction. */
function bossForSql(): PgBoss {
	sqlOnly ??= new PgBoss({ db: { executeSql: () => Promise.reject(new Error('pg-boss used without a transaction')) } });
	return sqlOnly;
}

/** Insert jobs within the caller's transaction. */
export async function insertJobs(db: Knex | Knex.Transaction, jobs: PgBoss.JobInsert[]): Promise<void> {
	if (jobs.length) await bossForSql().insert(jobs, { db: knexExecutor(db) });
}

/** Start pg-boss (creating or migrating its schema) and make sure our queues exist. */
export async function startBoss(connectionString: string, queue = queueName(), onError: (e: Error) => void = (e) => console.error('kinkless queue:', e.message)): Promise<PgBoss> {
	const boss = new PgBoss({ connectionString, max: 4, application_name: 'kinkless-queue', maintenanceIntervalSeconds: MAINTENANCE_SECONDS });
	boss.on('error', onError);
	await boss.start();
	await ensureQueues(boss, queue);
	return boss;
}

async function ensureQueues(boss: PgBoss, queue: string): Promise<void> {
	await boss.createQueue(failedQueue(queue), { name: failedQueue(queue), retryLimit: 5, retryDelay: 5 });
	await boss.createQueue(mailQueue(queue), { name: mailQueue(queue), retryLimit: MAIL_RETRY_LIMIT, retryDelay: MAIL_RETRY_SECONDS, retryBackoff: true });
	await boss.createQueue(queue, { name: queue, retryLimit: RETRY_LIMIT, retryDelay: RETRY_DELAY_SECONDS, deadLetter: failedQueue(queue) });
}
