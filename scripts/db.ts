// `tsx scripts/db.ts migrate|rollback|seed` — migrations and the idempotent demo seed.
import knex from 'knex';
import config from '../knexfile';

const db = knex(config);
const cmd = process.argv[2];
try {
	if (cmd === 'migrate') {
		const [batch, names] = await db.migrate.latest();
		console.log(names.length ? `kinkless: migrated (batch ${batch}): ${names.join(', ')}` : 'kinkless: database schema is current');
	} else if (cmd === 'rollback') {
		const [batch, names] = await db.migrate.rollback(undefined, process.argv.includes('--all'));
		console.log(`kinkless: rolled back batch ${batch}: ${names.join(', ') || 'nothing'}`);
	} else if (cmd === 'seed') {
		await db.seed.run();
		console.log('kinkless: demo data in place');
	} else {
		console.error('usage: tsx scripts/db.ts migrate|rollback [--all]|seed');
		process.exitCode = 2;
	}
} finally {
	await db.destroy();
}
