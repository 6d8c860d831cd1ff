import type { Knex } from 'knex';

/** One configuration for the app, the scripts and the tests; DATABASE_URL names the server. */
const config: Knex.Config = {
	client: 'pg',
	connection: process.env.DATABASE_URL ?? 'postgres://app@127.0.0.1:54329/kinkless',
	pool: { min: 0, max: Number(process.env.DB_POOL_MAX ?? 10) },
	migrations: { directory: './migrations', tableName: 'knex_migrations', loadExtensions: ['.ts'] },
	seeds: { directory: './seeds', loadExtensions: ['.ts'] }
};

export default config;
