// The one place role checks live; every load, action and API route calls it.
import type { Role } from '$lib/schemas';
import { fail4xx } from '../api';
import { db, type Db } from '../db';

const RANK: Record<Role, number> = { viewer: 1, editor: 2, owner: 3 };

type WorkspaceRow = { id: string; slug: string; name: string; created_at: Date };
export type Access = { user: NonNullable<App.Locals['user']>; workspace: WorkspaceRow; role: Role };

export function requireUser(locals: App.Locals): NonNullable<App.Locals['user']> {
	if (!locals.user) fail4xx(401, 'sign in first (session cookie or Authorization: Bearer <api token>)');
	return locals.user;
}

export const roleAtLeast = (role: Role, need: Role) => RANK[role] >= RANK[need];

/**
 * The caller's access to workspace `slug`, at least `need`. Non-members get 404,
 * so a workspace's existence does not leak; members below `need` get 403.
 */
export async function workspaceAccess(locals: App.Locals, slug: string, need: Role = 'viewer', handle: Db = db()): Promise<Access> {
	const user = requireUser(locals);
	const row = await handle('workspaces as w')
		.join('memberships as m', 'm.workspace_id', 'w.id')
		.where({ 'w.slug': slug, 'm.user_id': user.id })
		.first('w.id', 'w.slug', 'w.name', 'w.created_at', 'm.role');
	if (!row) fail4xx(404, `no workspace "${slug}"`);
	const { role, ...workspace } = row as WorkspaceRow & { role: Role };
	if (!roleAtLeast(role, need)) fail4xx(403, `this needs the ${need} role; you are ${role === 'viewer' ? 'a viewer' : 'an ' + role} in this workspace`);
	return { user, workspace, role };
}

/** Same rule for a resource found by id: its workspace decides. */
export async function workspaceAccessById(locals: App.Locals, workspaceId: string, need: Role = 'viewer', handle: Db = db()): Promise<Access> {
	const user = requireUser(locals);
	const ws = await handle('workspaces').where({ id: workspaceId }).first('slug');
	if (!ws) fail4xx(404, 'not found');
	return workspaceAccess({ ...locals, user }, ws.slug, need, handle);
}
