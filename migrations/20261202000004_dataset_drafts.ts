import type { Knex } from 'knex';

// An upload that has been checked but not saved yet: the upload page keeps the
// bytes here between "check" and "save", so the file is sent once and the form
// works without JavaScript. Drafts older than a day are purged on each new one.
export async function up(knex: Knex): Promise<void> {
	await knex.schema.createTable('dataset_drafts', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.uuid('workspace_id').notNullable().references('workspaces.id').onDelete('CASCADE');
		t.text('created_by').notNullable().references('users.id').onDelete('CASCADE');
		t.text('kind').notNullable().comment("'file' (bytes of an uploaded file) | 'paste' (UTF-8 of pasted cells)");
		t.text('filename').comment('the uploaded file name; null for pasted cells');
		t.binary('bytes').notNullable();
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.index(['created_at']);
	});
	await knex.raw(`ALTER TABLE dataset_drafts ADD CONSTRAINT dataset_drafts_kind_check CHECK (kind IN ('file','paste'))`);
}

export async function down(knex: Knex): Promise<void> {
	await knex.schema.dropTableIfExists('dataset_drafts');
}
