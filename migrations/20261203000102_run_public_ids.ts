import type { Knex } from 'knex';

// Runs are named outside the database by a random id: the sequential key stays
// internal (ordering, joins), so one run's id says nothing about its neighbours'.
export async function up(knex: Knex): Promise<void> {
	await knex.schema.alterTable('study_runs', (t) => {
		t.uuid('public_id').notNullable().defaultTo(knex.raw('gen_random_uuid()')).comment('the id the API and pages show');
		t.unique(['public_id']);
	});
}

export async function down(knex: Knex): Promise<void> {
	await knex.schema.alterTable('study_runs', (t) => {
		t.dropUnique(['public_id']);
		t.dropColumn('public_id');
	});
}
