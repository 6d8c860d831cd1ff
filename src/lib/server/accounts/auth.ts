import { Lucia } from 'lucia';
import { NodePostgresAdapter } from '@lucia-auth/adapter-postgresql';
import { hash, verify } from '@node-rs/argon2';
import { pgPool } from '../db';

let lucia: ReturnType<typeof makeLucia> | null = null;

function makeLucia() {
	const adapter = new NodePostgresAdapter(pgPool(), { user: 'users', session: 'user_sessions' });
	return new Lucia(adapter, {
		sessionCookie: {
			name: 'kinkless_session',
			attributes: {
				// Secure whenever the app is served over https (ORIGIN says how it is reached).
				secure: (process.env.ORIGIN ?? '').startsWith('https://'),
				sameSite: 'lax'
			}
		},
		getUserAttributes: (row) => ({ email: row.email, name: row.name })
	});
}

export function auth() {
	lucia ??= makeLucia();
	return lucia;
}

declare module 'lucia' {
	interface Register {
		Lucia: ReturnType<typeof makeLucia>;
		DatabaseUserAttributes: { email: string; name: string };
	}
}

// argon2id with the library's defaults (19 MiB, 2 passes): the OWASP minimum.
export const hashPassword = (password: string) => hash(password);
export const verifyPassword = (stored: string, password: string) => verify(stored, password).catch(() => false);
