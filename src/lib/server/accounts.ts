// Account flows shared by the pages' form actions and the JSON API.
import type { Cookies } from '@sveltejs/kit';
import type { z } from 'zod';
import type { signInSchema, signUpSchema } from '$lib/schemas';
import { fail4xx } from './api';
import { auth, hashPassword, verifyPassword } from './auth';
import { db } from './db';
import { actionMail } from './mail';
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

export async function signIn(input: z.output<typeof signInSchema>, address: string) {
	const handle = db();
	if (await rateLimit.signInBlocked(handle, input.email, address)) {
		fail4xx(429, `too many failed sign-ins; wait ${rateLimit.WINDOW} minutes or reset your password`);
	}
	const user = await users.findByEmail(handle, input.email);
	const ok = await verifyPassword(user?.password_hash ?? (await dummy()), input.password);
	if (!user || !ok) {
		await rateLimit.recordFailure(handle, input.email, address);
		fail4xx(401, 'wrong e-mail or password', 'bad-credentials');
	}
	await rateLimit.clearAccount(handle, input.email);
	return user;
}

/** Always looks the same to the caller, whether or not the account exists. */
export async function requestPasswordReset(email: string, origin: string) {
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

export async function resetPassword(token: string, password: string) {
	const state = await passwordResets.consume(db(), token);
	if (!state.ok) fail4xx(400, passwordResets.MESSAGES[state.reason], `reset-${state.reason}`);
	await users.setPassword(db(), state.userId, password);
	// every existing session of that account ends
	await auth().invalidateUserSessions(state.userId);
	return state.userId;
}
