import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
	await knex.schema.createTable('datasets', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.uuid('workspace_id').notNullable().references('workspaces.id').onDelete('CASCADE');
		t.text('name').notNullable();
		t.integer('version').notNullable().comment('re-uploading under the same name makes version n+1; studies keep theirs');
		t.text('shape').notNullable().comment("'curve' | 'grid' | 'scatter'");
		t.text('shape_reason').notNullable().defaultTo('');
		t.text('description').notNullable().defaultTo('');
		t.jsonb('columns').notNullable().comment('[{ name, unit, role }] in file order');
		t.integer('row_count').notNullable();
		t.binary('data').notNullable().comment('column-major little-endian float64: column c, row r at byte 8*(c*row_count + r)');
		t.text('source_format').notNullable().comment("'csv' | 'tsv' | 'xlsx' | 'json'");
		t.text('source_filename');
		t.binary('source_bytes').comment('the original upload, byte for byte (provenance)');
		t.text('source_sha256').notNullable();
		t.jsonb('notes').notNullable().defaultTo('[]');
		t.jsonb('warnings').notNullable().defaultTo('[]');
		t.text('created_by').references('users.id').onDelete('SET NULL');
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.timestamp('archived_at', { useTz: true }).comment('hidden from lists; kept because a study uses it');
		t.unique(['workspace_id', 'name', 'version']);
		t.index(['workspace_id', 'created_at']);
	});
	await knex.raw(`ALTER TABLE datasets ADD CONSTRAINT datasets_shape_check CHECK (shape IN ('curve','grid','scatter'))`);
}

export async function down(knex: Knex): Promise<void> {
	await knex.schema.dropTableIfExists('datasets');
}
