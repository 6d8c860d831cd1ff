import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
	await knex.schema.createTable('users', (t) => {
		t.text('id').primary().comment('lucia user id');
		t.text('email').notNullable().comment('stored lower-case');
		t.text('name').notNullable();
		t.text('password_hash').notNullable().comment('argon2id');
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.unique(['email']);
	});
	await knex.schema.createTable('user_sessions', (t) => {
		t.text('id').primary().comment('lucia session id');
		t.text('user_id').notNullable().references('users.id').onDelete('CASCADE');
		t.timestamp('expires_at', { useTz: true }).notNullable();
		t.index(['user_id']);
	});
	await knex.schema.createTable('password_resets', (t) => {
		t.text('token_hash').primary().comment('SHA-256 of the e-mailed token');
		t.text('user_id').notNullable().references('users.id').onDelete('CASCADE');
		t.timestamp('expires_at', { useTz: true }).notNullable();
		t.timestamp('used_at', { useTz: true });
	});
	await knex.schema.createTable('sign_in_attempts', (t) => {
		t.bigIncrements('id');
		t.text('key').notNullable().comment('"email:<address>" or "ip:<address>"');
		t.timestamp('at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.index(['key', 'at']);
	});
	await knex.schema.createTable('api_tokens', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.text('user_id').notNullable().references('users.id').onDelete('CASCADE');
		t.text('name').notNullable();
		t.text('token_hash').notNullable().unique().comment('SHA-256 of the token; the token is shown once');
		t.text('prefix').notNullable().comment('first characters, to recognise it in the list');
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.timestamp('last_used_at', { useTz: true });
		t.timestamp('revoked_at', { useTz: true });
	});
	await knex.schema.createTable('workspaces', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.text('slug').notNullable().unique();
		t.text('name').notNullable();
		t.text('created_by').references('users.id').onDelete('SET NULL');
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
	});
	await knex.schema.createTable('memberships', (t) => {
		t.uuid('workspace_id').notNullable().references('workspaces.id').onDelete('CASCADE');
		t.text('user_id').notNullable().references('users.id').onDelete('CASCADE');
		t.text('role').notNullable();
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.primary(['workspace_id', 'user_id']);
		t.index(['user_id']);
	});
	await knex.raw(`ALTER TABLE memberships ADD CONSTRAINT memberships_role_check CHECK (role IN ('owner','editor','viewer'))`);
	await knex.schema.createTable('invitations', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.uuid('workspace_id').notNullable().references('workspaces.id').onDelete('CASCADE');
		t.text('email').notNullable();
		t.text('role').notNullable();
		t.text('token_hash').notNullable().unique();
		t.text('invited_by').references('users.id').onDelete('SET NULL');
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.timestamp('expires_at', { useTz: true }).notNullable();
		t.timestamp('accepted_at', { useTz: true });
		t.text('accepted_by').references('users.id').onDelete('SET NULL');
	});
	await knex.raw(`ALTER TABLE invitations ADD CONSTRAINT invitations_role_check CHECK (role IN ('owner','editor','viewer'))`);
	await knex.schema.createTable('caught_mail', (t) => {
		t.bigIncrements('id');
		t.timestamp('received_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.text('mail_from').notNullable();
		t.specificType('rcpt_to', 'text[]').notNullable();
		t.text('subject').notNullable().defaultTo('');
		t.text('text').notNullable().defaultTo('');
		t.text('html');
		t.text('raw').notNullable().comment('the whole message as received');
	});
}

export async function down(knex: Knex): Promise<void> {
	for (const table of ['caught_mail', 'invitations', 'memberships', 'workspaces', 'api_tokens', 'sign_in_attempts', 'password_resets', 'user_sessions', 'users']) {
		await knex.schema.dropTableIfExists(table);
	}
}
