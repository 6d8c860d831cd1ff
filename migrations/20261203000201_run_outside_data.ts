import type { Knex } from 'knex';

// A run whose end point lies outside the data's range ended on the fit's
// extrapolation (flat under `hold`, a straight line under `linear`), not on the
// data: the study page and the scorecard say so.
export async function up(knex: Knex): Promise<void> {
	await knex.schema.alterTable('study_runs', (t) => {
		t.boolean('outside_data').notNullable().defaultTo(false).comment('the end point lies outside the data range (on the extrapolation)');
	});
}

export async function down(knex: Knex): Promise<void> {
	await knex.schema.alterTable('study_runs', (t) => {
		t.dropColumn('outside_data');
	});
}
