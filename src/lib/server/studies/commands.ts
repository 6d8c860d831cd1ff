// What the API routes and the study page's form actions both do.
import type { Knex } from 'knex';
import { fail4xx } from '../api';
import * as store from './store';

export async function cancelStudy(db: Knex, study: store.Study, userId: string): Promise<void> {
	if (!store.isActive(study.status) || !(await store.cancel(db, study.id, userId))) {
		const now = await store.get(db, study.id);
		fail4xx(409, `the study has already ended (${now?.status ?? study.status}); only a queued or running study can be cancelled`, 'conflict');
	}
}

export async function pickFit(db: Knex, study: store.Study, userId: string, input: { fitId: string; rationale: string }): Promise<NonNullable<store.Study['pick']>> {
	if (store.isActive(study.status)) fail4xx(409, 'the study is still running; pick a fit when it has ended', 'conflict');
	if (!(await store.pick(db, study.id, input.fitId, input.rationale, userId))) {
		fail4xx(422, 'fitId is not a fit of this study', 'invalid', [{ field: 'fitId', problem: 'not a fit of this study' }]);
	}
	return (await store.get(db, study.id))!.pick!;
}
