import type { Role } from '$lib/schemas';
import { fail4xx } from '../api';
import type { Db } from '../db';
import { newSecret, sha256 } from '../tokens';

const INVITE_DAYS = 7;

function slugify(name: string): string {
	const base = name
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '-')
		.replace(/^-+|-+$/g, '')
		.slice(0, 40);
	return base || 'workspace';
}

export const listForUser = (db: Db, userId: string) =>
	db('workspaces as w')
		.join('memberships as m', 'm.workspace_id', 'w.id')
		.where('m.user_id', userId)
		.orderBy('w.name')
		.select<{ id: string; slug: string; name: string; role: Role }[]>('w.id', 'w.slug', 'w.name', 'm.role');

/** The newest studies across the user's workspaces, for the home page. */
export const recentStudies = (db: Db, userId: string, limit = 8) =>
	db('studies as s')
		.join('workspaces as w', 'w.id', 's.workspace_id')
		.join('memberships as m', 'm.workspace_id', 'w.id')
		.where('m.user_id', userId)
		.orderBy('s.created_at', 'desc')
		.limit(limit)
		.select<{ id: string; name: string; status: string; slug: string; workspace: string }[]>('s.id', 's.name', 's.status', 'w.slug', 'w.name as workspace');

/** Create a workspace with a unique slug; its creator becomes owner. */
export async function create(db: Db, userId: string, name: string): Promise<{ id: string; slug: string; name: string }> {
	return db.transaction(async (trx) => {
		const base = slugify(name);
		const taken = new Set<string>((await trx('workspaces').where('slug', 'like', `${base}%`).pluck('slug')) as string[]);
		let slug = base;
		for (let i = 2; taken.has(slug) || slug === 'new'; i++) slug = `${base}-${i}`;
		const [ws] = await trx('workspaces').insert({ slug, name, created_by: userId }).returning(['id', 'slug', 'name']);
		await trx('memberships').insert({ workspace_id: ws.id, user_id: userId, role: 'owner' });
		return ws;
	});
}

export const members = (db: Db, workspaceId: string) =>
	db('memberships as m')
		.join('users as u', 'u.id', 'm.user_id')
		.where('m.workspace_id', workspaceId)
		.orderBy([{ column: 'm.role' }, { column: 'u.email' }])
		.select<{ user_id: string; email: string; name: string; role: Role }[]>('u.id as user_id', 'u.email', 'u.name', 'm.role');

export const pendingInvitations = (db: Db, workspaceId: string) =>
	db('invitations')
		.where({ workspace_id: workspaceId })
		.whereNull('accepted_at')
		.andWhere('expires_at', '>', db.fn.now())
		.orderBy('created_at', 'desc')
		.select<{ id: string; email: string; role: Role; expires_at: Date }[]>('id', 'email', 'role', 'expires_at');

export async function invite(db: Db, workspaceId: string, invitedBy: string, email: string, role: Role): Promise<string> {
	const already = await db('memberships as m').join('users as u', 'u.id', 'm.user_id').where({ 'm.workspace_id': workspaceId, 'u.email': email }).first('u.id');
	if (already) fail4xx(409, `${email} is already a member of this workspace`, 'already-member', [{ field: 'email', problem: 'already a member' }]);
	const token = newSecret(32);
	await db.transaction(async (trx) => {
		// one invitation at a time per workspace and per sender, so the counts below are exact
		await trx.raw('SELECT pg_advisory_xact_lock(hashtext(?)), pg_advisory_xact_lock(hashtext(?))', [`invite-ws:${workspaceId}`, `invite-user:${invitedBy}`]);
		await checkInviteLimits(trx, workspaceId, invitedBy, email);
		await trx('invitations').insert({
			workspace_id: workspaceId,
			email,
			role,
			token_hash: sha256(token),
			invited_by: invitedBy,
			expires_at: trx.raw(`now() + interval '${INVITE_DAYS} days'`)
		});
	});
	return token;
}

/**
 * Invitations are e-mail sent in our name to any address, so they are limited: per
 * workspace a day, per sender an hour (across workspaces), and per address in a
 * workspace a day (a few resends). The 429 names the limit that was reached.
 */
const inviteLimits = () => ({
	workspacePerDay: Number(process.env.KINKLESS_INVITE_LIMIT_WORKSPACE ?? 50),
	senderPerHour: Number(process.env.KINKLESS_INVITE_LIMIT_SENDER ?? 20),
	addressPerDay: 3
});

async function checkInviteLimits(db: Db, workspaceId: string, invitedBy: string, email: string): Promise<void> {
	const l = inviteLimits();
	const count = async (where: Record<string, string>, interval: string) =>
		Number((await db('invitations').where(where).andWhere('created_at', '>', db.raw(`now() - interval '${interval}'`)).count<{ n: string }[]>('* as n'))[0].n);
	if ((await count({ workspace_id: workspaceId, email }, '1 day')) >= l.addressPerDay) {
		fail4xx(429, `${email} was already invited ${l.addressPerDay} times today in this workspace; the last link still works for ${INVITE_DAYS} days, or try again tomorrow`, 'too-many-invitations', [
			{ field: 'email', problem: `at most ${l.addressPerDay} invitations a day to one address` }
		]);
	}
	if ((await count({ workspace_id: workspaceId }, '1 day')) >= l.workspacePerDay) {
		fail4xx(429, `this workspace has sent ${l.workspacePerDay} invitations in the last 24 hours, the most it may; try again later`, 'too-many-invitations');
	}
	if ((await count({ invited_by: invitedBy }, '1 hour')) >= l.senderPerHour) {
		fail4xx(429, `you have sent ${l.senderPerHour} invitations in the last hour, the most one person may; try again later`, 'too-many-invitations');
	}
}

type InvitationView = { id: string; email: string; role: Role; workspace_id: string; workspace_slug: string; workspace_name: string; inviter: string | null };
type InvitationState = { ok: true; invitation: InvitationView } | { ok: false; reason: 'unknown' | 'used' | 'expired' | 'other-address' };

export async function findInvitation(db: Db, token: string): Promise<InvitationState> {
	const row = await db('invitations as i')
		.join('workspaces as w', 'w.id', 'i.workspace_id')
		.leftJoin('users as u', 'u.id', 'i.invited_by')
		.where('i.token_hash', sha256(token))
		.first('i.id', 'i.email', 'i.role', 'i.accepted_at', db.raw('i.expires_at < now() as expired'), 'w.id as workspace_id', 'w.slug as workspace_slug', 'w.name as workspace_name', 'u.name as inviter');
	if (!row) return { ok: false, reason: 'unknown' };
	if (row.accepted_at) return { ok: false, reason: 'used' };
	if (row.expired) return { ok: false, reason: 'expired' };
	const { accepted_at: _a, expired: _e, ...invitation } = row;
	return { ok: true, invitation };
}

export const INVITATION_MESSAGES = {
	unknown: 'this invitation link is not valid',
	used: 'this invitation was already accepted',
	expired: `this invitation has expired (invitations last ${INVITE_DAYS} days); ask for a new one`,
	'other-address': 'this invitation is for another e-mail address: sign in (or create an account) with the invited address to accept it'
} as const;

/** Invitations are bound to their address: only the account with that e-mail may accept. */
export const sameAddress = (a: string, b: string) => a.trim().toLowerCase() === b.trim().toLowerCase();

/**
 * Accept: single use, atomic, and only by the account whose e-mail is the invited
 * address (the link went to that mailbox; holding it from anywhere else is not
 * consent of its owner). An existing membership keeps the higher of the two roles.
 */
export async function acceptInvitation(db: Db, token: string, user: { id: string; email: string }): Promise<InvitationState> {
	const userId = user.id;
	return (db as import('knex').Knex).transaction(async (trx) => {
		const state = await findInvitation(trx, token);
		if (!state.ok) return state;
		if (!sameAddress(state.invitation.email, user.email)) return { ok: false, reason: 'other-address' } as const;
		const n = await trx('invitations').where({ id: state.invitation.id }).whereNull('accepted_at').update({ accepted_at: trx.fn.now(), accepted_by: userId });
		if (n === 0) return { ok: false, reason: 'used' } as const;
		const current = await trx('memberships').where({ workspace_id: state.invitation.workspace_id, user_id: userId }).first('role');
		const rank = { viewer: 1, editor: 2, owner: 3 } as const;
		if (!current) await trx('memberships').insert({ workspace_id: state.invitation.workspace_id, user_id: userId, role: state.invitation.role });
		else if (rank[state.invitation.role] > rank[current.role as Role]) await trx('memberships').where({ workspace_id: state.invitation.workspace_id, user_id: userId }).update({ role: state.invitation.role });
		return state;
	});
}

/** Change a role or remove a member, never leaving the workspace without an owner. */
export async function changeMember(db: Db, workspaceId: string, userId: string, role: Role | null): Promise<void> {
	await (db as import('knex').Knex).transaction(async (trx) => {
		// lock the workspace's memberships so two concurrent demotions cannot both pass the check
		const rows = await trx('memberships').where({ workspace_id: workspaceId }).forUpdate().select('user_id', 'role');
		const target = rows.find((r) => r.user_id === userId);
		if (!target) fail4xx(404, 'no such member in this workspace');
		const owners = rows.filter((r) => r.role === 'owner').length;
		if (target.role === 'owner' && role !== 'owner' && owners <= 1) {
			fail4xx(409, role ? 'the last owner cannot be demoted; make someone else owner first' : 'the last owner cannot be removed; make someone else owner first', 'last-owner');
		}
		if (role) await trx('memberships').where({ workspace_id: workspaceId, user_id: userId }).update({ role });
		else await trx('memberships').where({ workspace_id: workspaceId, user_id: userId }).delete();
	});
}
