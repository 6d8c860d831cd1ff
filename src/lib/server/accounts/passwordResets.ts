import type { Db } from '../db';
import { newSecret, sha256 } from '../tokens';

const LIFETIME_MINUTES = 60;

export async function create(db: Db, userId: string): Promise<string> {
	const token = newSecret(32);
	await db('password_resets').insert({
		token_hash: sha256(token),
		user_id: userId,
		expires_at: db.raw(`now() + interval '${LIFETIME_MINUTES} minutes'`)
	});
	return token;
}

type TokenState = { ok: true; userId: string } | { ok: false; reason: 'unknown' | 'used' | 'expired' };

export async function check(db: Db, token: string): Promise<TokenState> {
	const row = await db('password_resets')
		.where({ token_hash: sha256(token) })
		.first('user_id', 'used_at', db.raw('expires_at < now() as expired'));
	if (!row) return { ok: false, reason: 'unknown' };
	if (row.used_at) return { ok: false, reason: 'used' };
	if (row.expired) return { ok: false, reason: 'expired' };
	return { ok: true, userId: row.user_id };
}

/** Mark used atomically: of two concurrent uses only one wins. */
export async function consume(db: Db, token: string): Promise<TokenState> {
	const rows = await db('password_resets')
		.where({ token_hash: sha256(token) })
		.whereNull('used_at')
		.andWhere('expires_at', '>', db.fn.now())
		.update({ used_at: db.fn.now() })
		.returning('user_id');
	if (rows.length) return { ok: true, userId: rows[0].user_id };
	const state = await check(db, token);
	return state.ok ? { ok: false, reason: 'used' } : state;
}

export const MESSAGES: Record<'unknown' | 'used' | 'expired', string> = {
	unknown: 'this reset link is not valid; ask for a new one',
	used: 'this reset link was already used; ask for a new one',
	expired: 'this reset link has expired (links last one hour); ask for a new one'
};

/** Every outstanding link of the account stops working (after a reset or a password change). */
export const revokeAllFor = (db: Db, userId: string) => db('password_resets').where({ user_id: userId }).whereNull('used_at').update({ used_at: db.fn.now() });
