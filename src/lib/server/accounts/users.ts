import { generateIdFromEntropySize } from 'lucia';
import type { Db } from '../db';
import { hashPassword } from './auth';

type UserRow = { id: string; email: string; name: string; password_hash: string; created_at: Date };

export const findByEmail = (db: Db, email: string) => db<UserRow>('users').where({ email: email.toLowerCase() }).first();
export const findById = (db: Db, id: string) => db<UserRow>('users').where({ id }).first();

/** Create a user; returns null when the e-mail is taken (unique index decides, no race). */
export async function create(db: Db, input: { email: string; password: string; name: string }): Promise<UserRow | null> {
	const row = {
		id: generateIdFromEntropySize(10),
		email: input.email.toLowerCase(),
		name: input.name,
		password_hash: await hashPassword(input.password)
	};
	const inserted = await db('users').insert(row).onConflict('email').ignore().returning('*');
	return (inserted[0] as UserRow | undefined) ?? null;
}

export async function setPassword(db: Db, id: string, password: string): Promise<void> {
	await db('users').where({ id }).update({ password_hash: await hashPassword(password) });
}

export const setName = (db: Db, id: string, name: string) => db('users').where({ id }).update({ name });

/** Change the e-mail; false when another account has it (the unique index decides). */
export async function setEmail(db: Db, id: string, email: string): Promise<boolean> {
	const n = await db('users').where({ id }).update({ email: email.toLowerCase() }).catch((e: { code?: string }) => {
		if (e.code === '23505') return 0;
		throw e;
	});
	return Number(n) > 0;
}
