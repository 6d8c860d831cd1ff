import type { Db } from '../db';
import { newSecret, sha256 } from '../tokens';

// Slowing down password guessing without letting a stranger lock the owner out: the
// device-cookie scheme (docs/references.md, "Sign-in limits").
// - A browser that signed in to the account before carries a device cookie; its failed
//   guesses count only against that cookie, so guesses from anywhere else never block it.
// - Any other client counts per account + address pair, per address, and (so that many
//   addresses cannot guess together) per account among clients without a device cookie.
// - A successful sign-in clears its pair or device; a password reset clears every count
//   of the account at once, as the 429 message says.
// Counting is atomic: an attempt inserts its rows first and then counts them, so of N
// parallel guesses at most `limit` see a count within the limit.

const WINDOW_MINUTES = 15;
const RESET_WINDOW_MINUTES = 60;
export const DEVICE_COOKIE = 'kinkless_device';

const limits = () => ({
	pair: Number(process.env.KINKLESS_SIGNIN_LIMIT ?? 10),
	device: Number(process.env.KINKLESS_SIGNIN_LIMIT ?? 10),
	address: Number(process.env.KINKLESS_SIGNIN_LIMIT_ADDRESS ?? 50),
	account: Number(process.env.KINKLESS_SIGNIN_LIMIT_ACCOUNT ?? 100),
	resetAccount: Number(process.env.KINKLESS_RESET_LIMIT ?? 3),
	resetAddress: Number(process.env.KINKLESS_RESET_LIMIT_ADDRESS ?? 20)
});

type Counted = { key: string; limit: number };

/**
 * Insert one attempt row per key, then count each key's rows in the window (this
 * attempt included). Returns the ids inserted and the first key over its limit.
 */
async function reserve(db: Db, keys: Counted[], windowMinutes: number): Promise<{ ids: number[]; over: Counted | null }> {
	const inserted = await db('sign_in_attempts')
		.insert(keys.map((k) => ({ key: k.key })))
		.returning('id');
	const ids = inserted.map((r: { id: string | number }) => Number(r.id));
	const rows = await db('sign_in_attempts')
		.whereIn(
			'key',
			keys.map((k) => k.key)
		)
		.andWhere('at', '>', db.raw(`now() - make_interval(mins => ?)`, [windowMinutes]))
		.groupBy('key')
		.select('key')
		.count<{ key: string; count: string }[]>('* as count');
	const counts = new Map(rows.map((r) => [r.key, Number(r.count)]));
	const over = keys.find((k) => (counts.get(k.key) ?? 0) > k.limit) ?? null;
	return { ids, over };
}

const release = (db: Db, ids: number[]) => db('sign_in_attempts').whereIn('id', ids).delete();

type SignInGate = {
	/** the sign-in may go on; call `failed` or `succeeded` after checking the password */
	allowed: boolean;
	/** why it may not (true, and names what the owner can do) */
	message: string;
	failed: () => Promise<void>;
	/** clears this attempt's counts; returns a new device cookie unless `remember` is false */
	succeeded: (userId: string, remember?: boolean) => Promise<string | null>;
};

/**
 * Decide whether a sign-in attempt for `email` from `address` may check the password.
 * `device` is the browser's device cookie and the account it belongs to (deviceOwner),
 * if any; it earns trust only when that account is `userId`, the one signing in.
 */
export async function gateSignIn(db: Db, email: string, address: string, device: { token: string; userId: string } | null, userId: string | null): Promise<SignInGate> {
	const l = limits();
	const trusted = device && userId && device.userId === userId ? device : null;
	const keys: Counted[] = trusted
		? [{ key: `device:${trusted.userId}:${sha256(trusted.token)}`, limit: l.device }]
		: [
				{ key: `pair:${email}|${address}`, limit: l.pair },
				{ key: `ip:${address}`, limit: l.address },
				{ key: `account:${email}`, limit: l.account }
			];
	const { ids, over } = await reserve(db, keys, WINDOW_MINUTES);
	if (over) {
		// a refused attempt checks no password, so it does not count
		await release(db, ids);
		const where = over.key.startsWith('device:')
			? 'from this browser'
			: over.key.startsWith('ip:')
				? 'from this network address'
				: over.key.startsWith('account:')
					? 'for this account from browsers it has not signed in from'
					: 'for this account from this network address';
		return {
			allowed: false,
			message: `too many failed sign-ins ${where}; wait ${WINDOW_MINUTES} minutes, or reset your password (a reset lifts the block at once)`,
			failed: async () => {},
			succeeded: async () => null
		};
	}
	return {
		allowed: true,
		message: '',
		failed: async () => {
			// the rows stay: they are the count. Old ones no longer matter.
			await db('sign_in_attempts').where('at', '<', db.raw(`now() - interval '1 day'`)).delete();
		},
		succeeded: async (id: string, remember = true) => {
			await release(db, ids);
			if (trusted) {
				await db('sign_in_attempts').where({ key: keys[0].key }).delete();
				await db('sign_in_devices').where({ token_hash: sha256(trusted.token) }).update({ last_used_at: db.fn.now() });
				return null;
			}
			await db('sign_in_attempts').where({ key: `pair:${email}|${address}` }).delete();
			if (!remember) return null;
			// this browser is now known to the account: hand it a device cookie
			const token = newSecret(32);
			await db('sign_in_devices').insert({ token_hash: sha256(token), user_id: id });
			return token;
		}
	};
}

/** The account a device cookie belongs to, if the cookie is known. */
export async function deviceOwner(db: Db, token: string | undefined): Promise<{ token: string; userId: string } | null> {
	if (!token || token.length > 200) return null;
	const row = await db('sign_in_devices').where({ token_hash: sha256(token) }).first('user_id');
	return row ? { token, userId: row.user_id } : null;
}

/** After a password reset: every count kept for the account goes. */
export async function clearAccount(db: Db, email: string, userId: string): Promise<void> {
	await db('sign_in_attempts')
		.where('key', 'like', `pair:${escapeLike(email)}|%`)
		.orWhere({ key: `account:${email}` })
		.orWhere('key', 'like', `device:${escapeLike(userId)}:%`)
		.delete();
}

const escapeLike = (s: string) => s.replace(/[\\%_]/g, (c) => '\\' + c);

/**
 * Reset requests: at most `resetAddress` an hour from one address (answered 429), and at
 * most `resetAccount` mails an hour to one account (further requests look the same to
 * the caller but send nothing, so the limit cannot be used to learn that an account exists).
 */
export async function gateResetRequest(db: Db, email: string, address: string): Promise<{ addressOver: boolean; accountOver: boolean }> {
	const l = limits();
	const byAddress = await reserve(db, [{ key: `reset-ip:${address}`, limit: l.resetAddress }], RESET_WINDOW_MINUTES);
	if (byAddress.over) {
		await release(db, byAddress.ids);
		return { addressOver: true, accountOver: false };
	}
	const byAccount = await reserve(db, [{ key: `reset-account:${email}`, limit: l.resetAccount }], RESET_WINDOW_MINUTES);
	if (byAccount.over) await release(db, byAccount.ids);
	return { addressOver: false, accountOver: Boolean(byAccount.over) };
}

export const RESET_WINDOW = RESET_WINDOW_MINUTES;
