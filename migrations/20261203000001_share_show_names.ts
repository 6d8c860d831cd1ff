import type { Knex } from 'knex';

// Whether a share link shows member names (who launched the study, who picked
// its fit). Off by default: a link holder sees the study, not the team.
export async function up(knex: Knex): Promise<void> {
	await knex.schema.alterTable('study_shares', (t) => {
		t.boolean('show_names').notNullable().defaultTo(false).comment('true when the owner chose to show member names to link holders');
	});
}

export async function down(knex: Knex): Promise<void> {
	await knex.schema.alterTable('study_shares', (t) => {
		t.dropColumn('show_names');
	});
}
