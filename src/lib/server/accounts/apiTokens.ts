import type { Db } from '../db';
import { isUuid } from '$lib/text';
import { newSecret, sha256 } from '../tokens';

type ApiTokenRow = { id: string; user_id: string; name: string; prefix: string; created_at: Date; last_used_at: Date | null; revoked_at: Date | null };

const TOKEN_PREFIX = 'kl_';

/** Returns the token once; only its hash is stored. */
export async function create(db: Db, userId: string, name: string): Promise<{ id: string; token: string }> {
	const token = TOKEN_PREFIX + newSecret(32);
	const [row] = await db('api_tokens').insert({ user_id: userId, name, token_hash: sha256(token), prefix: token.slice(0, 9) }).returning('id');
	return { id: row.id, token };
}

export const list = (db: Db, userId: string) =>
	db<ApiTokenRow>('api_tokens').where({ user_id: userId }).whereNull('revoked_at').orderBy('created_at', 'desc').select('id', 'name', 'prefix', 'created_at', 'last_used_at');

/** Revoke one of the user's tokens; false when it is not theirs or already revoked. */
export async function revoke(db: Db, userId: string, id: string): Promise<boolean> {
	if (!isUuid(id)) return false;
	const n = await db('api_tokens').where({ id, user_id: userId }).whereNull('revoked_at').update({ revoked_at: db.fn.now() });
	return n > 0;
}

/** The user a bearer token belongs to, or null (unknown or revoked). */
export async function authenticate(db: Db, token: string): Promise<{ id: string; email: string; name: string } | null> {
	if (!token.startsWith(TOKEN_PREFIX) || token.length > 200) return null;
	const row = await db('api_tokens as t')
		.join('users as u', 'u.id', 't.user_id')
		.where({ 't.token_hash': sha256(token) })
		.whereNull('t.revoked_at')
		.first('t.id as token_id', 'u.id', 'u.email', 'u.name');
	if (!row) return null;
	await db('api_tokens').where({ id: row.token_id }).update({ last_used_at: db.fn.now() });
	return { id: row.id, email: row.email, name: row.name };
}

/** Revoke every live token of the user (offered with a password reset); how many. */
export const revokeAll = (db: Db, userId: string) => db('api_tokens').where({ user_id: userId }).whereNull('revoked_at').update({ revoked_at: db.fn.now() });
