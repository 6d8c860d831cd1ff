import type { Knex } from 'knex';
import { hash } from '@node-rs/argon2';

// Demo account and workspace for the invented "Larkmoor Aero" scenario. Idempotent.
export const DEMO_EMAIL = 'demo@larkmoor.example';
export const DEMO_PASSWORD = 'larkmoor-demo-2026';
export const DEMO_WORKSPACE = 'larkmoor-aero';

export async function seed(knex: Knex): Promise<void> {
	let user = await knex('users').where({ email: DEMO_EMAIL }).first();
	if (!user) {
		user = { id: 'demo-user-larkmoor', email: DEMO_EMAIL, name: 'Demo engineer (Larkmoor Aero)', password_hash: await hash(DEMO_PASSWORD) };
		await knex('users').insert(user);
	}
	let ws = await knex('workspaces').where({ slug: DEMO_WORKSPACE }).first();
	if (!ws) {
		[ws] = await knex('workspaces').insert({ slug: DEMO_WORKSPACE, name: 'Larkmoor Aero (demo)', created_by: user.id }).returning('*');
	}
	await knex('memberships').insert({ workspace_id: ws.id, user_id: user.id, role: 'owner' }).onConflict(['workspace_id', 'user_id']).ignore();
}
