import type { Knex } from 'knex';

// Browsers that have signed in to an account before. A failed guess from any other
// client never blocks such a browser (see src/lib/server/accounts/rateLimit.ts), so a stranger
// cannot lock the owner out by guessing wrong on purpose.
export async function up(knex: Knex): Promise<void> {
	await knex.schema.createTable('sign_in_devices', (t) => {
		t.text('token_hash').primary().comment('SHA-256 of the device cookie');
		t.text('user_id').notNullable().references('users.id').onDelete('CASCADE');
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.timestamp('last_used_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.index(['user_id']);
	});
	await knex.raw(`COMMENT ON COLUMN sign_in_attempts.key IS '"pair:<e-mail>|<address>", "ip:<address>", "account:<e-mail>", "device:<user>:<hash>", "reset-ip:<address>" or "reset-account:<e-mail>"'`);
}

export async function down(knex: Knex): Promise<void> {
	await knex.schema.dropTable('sign_in_devices');
}
