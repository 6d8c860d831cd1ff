// Account flows shared by the pages' form actions and the JSON API.
import type { Cookies } from '@sveltejs/kit';
import type { z } from 'zod';
import type { signInSchema, signUpSchema } from '$lib/schemas';
import { fail4xx } from '../api';
import { auth, hashPassword, verifyPassword } from './auth';
import { db } from '../db';
import * as apiTokens from './apiTokens';
import { actionMail, send } from '../mail';
import * as passwordResets from './passwordResets';
import * as rateLimit from './rateLimit';
import * as users from './users';

// A fixed hash to verify against when the account does not exist, so the timing
// of a wrong password and of an unknown e-mail look alike.
let dummyHash: Promise<string> | null = null;
const dummy = () => (dummyHash ??= hashPassword('not-a-real-password-' + Math.random()));

export async function signUp(input: z.output<typeof signUpSchema>) {
	const user = await users.create(db(), input);
	if (!user) fail4xx(409, 'an account with this e-mail already exists; sign in or reset the password', 'email-taken', [{ field: 'email', problem: 'already registered' }]);
	return user;
}

export async function startSession(cookies: Cookies, userId: string, previousSessionId?: string | null) {
	const lucia = auth();
	// a new session id at every sign-in (no fixation); the old one is dropped
	if (previousSessionId) await lucia.invalidateSession(previousSessionId);
	const session = await lucia.createSession(userId, {});
	const c = lucia.createSessionCookie(session.id);
	cookies.set(c.name, c.value, { path: '/', ...c.attributes });
	return session;
}

export async function endSession(cookies: Cookies, sessionId: string | undefined) {
	const lucia = auth();
	if (sessionId) await lucia.invalidateSession(sessionId);
	const c = lucia.createBlankSessionCookie();
	cookies.set(c.name, c.value, { path: '/', ...c.attributes });
}

const deviceCookieOptions = () => ({
	path: '/',
	httpOnly: true,
	sameSite: 'lax' as const,
	secure: (process.env.ORIGIN ?? '').startsWith('https://'),
	maxAge: 60 * 60 * 24 * 365
});

/**
 * Check e-mail and password under the sign-in limits (rateLimit.ts). On success the
 * browser keeps (or gets) a device cookie, so later wrong guesses from elsewhere never
 * lock it out.
 */
export async function signIn(input: z.output<typeof signInSchema>, address: string, cookies: Cookies) {
	const handle = db();
	const user = await users.findByEmail(handle, input.email);
	const device = await rateLimit.deviceOwner(handle, cookies.get(rateLimit.DEVICE_COOKIE));
	const gate = await rateLimit.gateSignIn(handle, input.email, address, device, user?.id ?? null);
	if (!gate.allowed) fail4xx(429, gate.message, 'too-many-sign-ins');
	const ok = await verifyPassword(user?.password_hash ?? (await dummy()), input.password);
	if (!user || !ok) {
		await gate.failed();
		fail4xx(401, 'wrong e-mail or password', 'bad-credentials');
	}
	const deviceToken = await gate.succeeded(user.id);
	if (deviceToken) cookies.set(rateLimit.DEVICE_COOKIE, deviceToken, deviceCookieOptions());
	return user;
}

/**
 * Always looks the same to the caller, whether or not the account exists: the answer
 * goes out before the account is even looked up (so its timing tells nothing), and
 * the mail is prepared and sent afterwards.
 */
export async function requestPasswordReset(email: string, origin: string, address: string) {
	const gate = await rateLimit.gateResetRequest(db(), email, address);
	if (gate.addressOver) fail4xx(429, `too many password-reset requests from this network address; try again in ${rateLimit.RESET_WINDOW} minutes`, 'too-many-resets');
	if (gate.accountOver) return;
	void sendResetMail(email, origin).catch((e) => console.error('password-reset mail failed', e));
}

async function sendResetMail(email: string, origin: string) {
	const user = await users.findByEmail(db(), email);
	if (!user) return;
	const token = await passwordResets.create(db(), user.id);
	await actionMail({
		to: user.email,
		subject: 'Reset your Kinkless password',
		intro: `Someone (we hope you) asked to reset the password of ${user.email}. The link works once, for one hour.`,
		actionLabel: 'Choose a new password',
		url: `${origin}/reset-password/${token}`,
		outro: 'If you did not ask, ignore this message; your password stays as it is.'
	});
}

/**
 * Set a new password through an e-mailed link. Every session of the account ends, every
 * other outstanding reset link stops working, the sign-in limits of the account are
 * lifted, and (when asked) every API token is revoked.
 */
export async function resetPassword(token: string, password: string, opts: { revokeTokens: boolean }) {
	const state = await passwordResets.consume(db(), token);
	if (!state.ok) fail4xx(400, passwordResets.MESSAGES[state.reason], `reset-${state.reason}`);
	const user = await users.findById(db(), state.userId);
	if (!user) fail4xx(400, passwordResets.MESSAGES.unknown, 'reset-unknown');
	await users.setPassword(db(), user.id, password);
	await passwordResets.revokeAllFor(db(), user.id);
	await auth().invalidateUserSessions(user.id);
	await rateLimit.clearAccount(db(), user.email, user.id);
	if (opts.revokeTokens) await apiTokens.revokeAll(db(), user.id);
	return user.id;
}

/** Settings: a new password needs the current one; every other session of the account ends. */
export async function changePassword(userId: string, current: string, next: string, address: string, cookies: Cookies, sessionId: string | null) {
	const user = await currentPasswordOrFail(userId, current, address);
	await users.setPassword(db(), user.id, next);
	await passwordResets.revokeAllFor(db(), user.id);
	await auth().invalidateUserSessions(user.id);
	// this browser stays signed in, on a fresh session id
	await startSession(cookies, user.id, sessionId);
}

/** Settings: a new e-mail needs the current password; the old address is told. */
export async function changeEmail(userId: string, current: string, email: string, address: string) {
	const user = await currentPasswordOrFail(userId, current, address);
	const next = email.toLowerCase();
	if (next === user.email) return user.email;
	const changed = await users.setEmail(db(), user.id, next);
	if (!changed) fail4xx(409, 'an account with this e-mail already exists', 'email-taken', [{ field: 'email', problem: 'already registered' }]);
	await passwordResets.revokeAllFor(db(), user.id);
	await send({
		to: user.email,
		subject: 'Your Kinkless e-mail address was changed',
		text: `The e-mail address of your Kinkless account was changed from ${user.email} to ${next}. If you did not make this change, tell your workspace admin at once: whoever did can now receive this account's reset links.`
	}).catch((e) => console.error('address-change notice failed', e));
	return next;
}

// Under the same limits as sign-in, so a borrowed session cannot guess the password.
async function currentPasswordOrFail(userId: string, current: string, address: string) {
	const user = await users.findById(db(), userId);
	if (!user) fail4xx(401, 'sign in first', 'unauthenticated');
	const gate = await rateLimit.gateSignIn(db(), user.email, address, null, user.id);
	if (!gate.allowed) fail4xx(429, gate.message, 'too-many-sign-ins');
	if (!(await verifyPassword(user.password_hash, current))) {
		await gate.failed();
		fail4xx(400, 'the current password is wrong', 'bad-credentials', [{ field: 'current', problem: 'does not match' }]);
	}
	await gate.succeeded(user.id, false);
	return user;
}
