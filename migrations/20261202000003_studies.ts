import type { Knex } from 'knex';

/**
 * Studies: one dataset output, several fits, one problem, one or more
 * optimizers and a set of starts, run side by side. Runs are one row each,
 * with the whole path packed into one bytea column.
 */
export async function up(knex: Knex): Promise<void> {
	await knex.schema.createTable('studies', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.uuid('workspace_id').notNullable().references('workspaces.id').onDelete('CASCADE');
		t.text('name').notNullable();
		t.uuid('dataset_id').notNullable().references('datasets.id').comment('the exact dataset version studied (versions are immutable)');
		t.text('output').notNullable().comment('the fitted output column the problem is about');
		t.jsonb('spec').notNullable().comment('the validated request: problem (bounds filled in), fits, optimizers, starts, budgets');
		t.integer('n_inputs').notNullable();
		t.integer('start_count').notNullable();
		t.binary('starts').notNullable().comment('little-endian float64, row-major: start s, input j at byte 8*(s*n_inputs + j)');
		t.text('status').notNullable().defaultTo('queued');
		t.integer('runs_total').notNullable().comment('fits × optimizers × starts');
		t.integer('runs_done').notNullable().defaultTo(0).comment('runs stored so far (kept in the same transaction as the inserts)');
		t.integer('audits_total').notNullable().comment('one audit (smoothness, fidelity, reference optimum) per fit');
		t.integer('audits_done').notNullable().defaultTo(0);
		t.text('queue').notNullable().comment('the job queue the study was sent to');
		t.text('error').comment('why the study failed (the failed job’s error)');
		t.text('origin').notNullable().defaultTo('').comment('public origin at launch, for links in e-mail');
		t.text('created_by').references('users.id').onDelete('SET NULL');
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.timestamp('started_at', { useTz: true });
		t.timestamp('finished_at', { useTz: true }).comment('when it became done, failed or cancelled');
		t.text('cancelled_by').references('users.id').onDelete('SET NULL');
		t.index(['workspace_id', 'created_at']);
		t.index(['dataset_id']);
	});
	await knex.raw(`ALTER TABLE studies ADD CONSTRAINT studies_status_check CHECK (status IN ('queued','running','done','failed','cancelled'))`);

	await knex.schema.createTable('study_fits', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.uuid('study_id').notNullable().references('studies.id').onDelete('CASCADE');
		t.integer('position').notNullable().comment('order in the request');
		t.text('method').notNullable();
		t.jsonb('options').notNullable().defaultTo('{}').comment('options as requested');
		t.text('continuity').notNullable().comment('class the method states');
		t.jsonb('fit').notNullable().comment('fit file of the objective output (exact rebuild)');
		t.jsonb('constraint_fits').notNullable().defaultTo('[]').comment('fit files of the constraint outputs, in problem.constraints order');
		t.jsonb('smoothness').comment('smoothness audit summary; null until the audit job ran');
		t.jsonb('fidelity').comment('fidelity audit summary');
		t.jsonb('reference').comment('reference optimum from a dense search on this fit: { x, f } or { roots } for solve');
		t.jsonb('samples').comment('the fitted curve sampled for the chart: { x, f }');
		t.timestamp('audited_at', { useTz: true });
		t.unique(['study_id', 'position']);
	});

	await knex.schema.createTable('study_runs', (t) => {
		t.bigIncrements('id');
		t.uuid('study_id').notNullable().references('studies.id').onDelete('CASCADE');
		t.uuid('fit_id').notNullable().references('study_fits.id').onDelete('CASCADE');
		t.smallint('optimizer').notNullable().comment('index into spec.optimizers');
		t.integer('start_index').notNullable().comment('index into studies.starts');
		t.text('outcome').notNullable();
		t.boolean('at_kink').notNullable().defaultTo(false);
		t.text('reason').notNullable().defaultTo('');
		t.integer('iterations').notNullable();
		t.integer('evals_f').notNullable();
		t.integer('evals_grad').notNullable();
		t.integer('evals_hess').notNullable();
		t.specificType('x', 'double precision[]').notNullable().comment('end point x*');
		t.double('f').notNullable().comment('the user’s f at x* (NaN when diverged)');
		t.double('grad_norm').notNullable();
		t.specificType('ms', 'real').notNullable().comment('wall time of the run, milliseconds');
		t.integer('path_length').notNullable().comment('iterates stored, the start included');
		t.binary('path').notNullable().comment(
			'little-endian float64, L = path_length, n = studies.n_inputs: x (L×n, row-major) | f (L) | grad (L×n) | step (L) | violation (L)'
		);
		t.text('worker').notNullable().defaultTo('').comment('host/process/thread that computed it');
		t.unique(['study_id', 'fit_id', 'optimizer', 'start_index'], { indexName: 'study_runs_once' });
	});
	await knex.raw(
		`ALTER TABLE study_runs ADD CONSTRAINT study_runs_outcome_check CHECK (outcome IN ('converged','stalled','iteration-limit','left-domain','diverged'))`
	);

	await knex.schema.alterTable('studies', (t) => {
		t.uuid('pick_fit_id').references('study_fits.id').onDelete('SET NULL');
		t.text('pick_rationale');
		t.text('picked_by').references('users.id').onDelete('SET NULL');
		t.timestamp('picked_at', { useTz: true });
	});

	await knex.schema.createTable('study_shares', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.uuid('study_id').notNullable().references('studies.id').onDelete('CASCADE');
		t.text('token_hash').notNullable().unique().comment('SHA-256 of the link token; the token is shown once');
		t.text('created_by').references('users.id').onDelete('SET NULL');
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.timestamp('expires_at', { useTz: true });
		t.timestamp('revoked_at', { useTz: true });
		t.index(['study_id']);
	});
}

export async function down(knex: Knex): Promise<void> {
	await knex.schema.dropTableIfExists('study_shares');
	await knex.schema.alterTable('studies', (t) => {
		t.dropColumn('pick_fit_id');
	});
	await knex.schema.dropTableIfExists('study_runs');
	await knex.schema.dropTableIfExists('study_fits');
	await knex.schema.dropTableIfExists('studies');
}
