import knex, { type Knex } from 'knex';
import pg from 'pg';
import config from '../../../knexfile';

// bigint counts (COUNT(*)) come back as strings by default; ours fit in a double.
pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v));

let instance: Knex | null = null;
let pool: pg.Pool | null = null;

/** The app's Knex handle (one per process). */
export function db(): Knex {
	instance ??= knex(config);
	return instance;
}

/** A raw pg pool for lucia's adapter (it speaks pg directly). */
export function pgPool(): pg.Pool {
	if (!pool) {
		pool = new pg.Pool({ connectionString: String(config.connection), max: 5 });
		// an idle connection dropped by a database restart: the pool replaces it on the next request
		pool.on('error', (e) => console.error('kinkless: idle database connection lost:', e.message));
	}
	return pool;
}

export type Db = Knex | Knex.Transaction;
