import type { Db } from './db';

// Failed sign-ins per account and per client address within a sliding window.
const WINDOW_MINUTES = 15;
const limits = () => ({
	perAccount: Number(process.env.KINKLESS_SIGNIN_LIMIT ?? 10),
	perAddress: Number(process.env.KINKLESS_SIGNIN_LIMIT_ADDRESS ?? 50)
});

export async function signInBlocked(db: Db, email: string, address: string): Promise<boolean> {
	const since = db.raw(`now() - interval '${WINDOW_MINUTES} minutes'`);
	const rows = await db('sign_in_attempts')
		.whereIn('key', [`email:${email}`, `ip:${address}`])
		.andWhere('at', '>', since)
		.groupBy('key')
		.select('key')
		.count<{ key: string; count: number }[]>('* as count');
	const { perAccount, perAddress } = limits();
	return rows.some((r) => (r.key.startsWith('email:') ? Number(r.count) >= perAccount : Number(r.count) >= perAddress));
}

export async function recordFailure(db: Db, email: string, address: string): Promise<void> {
	await db('sign_in_attempts').insert([{ key: `email:${email}` }, { key: `ip:${address}` }]);
	// keep the table small: old attempts no longer count
	await db('sign_in_attempts').where('at', '<', db.raw(`now() - interval '1 day'`)).delete();
}

export const clearAccount = (db: Db, email: string) => db('sign_in_attempts').where({ key: `email:${email}` }).delete();
export const WINDOW = WINDOW_MINUTES;
