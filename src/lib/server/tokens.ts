import { createHash, randomBytes } from 'node:crypto';

/** A random URL-safe secret of `bytes` bytes (default 32 = 256 bits). */
export function newSecret(bytes = 32): string {
	return randomBytes(bytes).toString('base64url');
}

/** Secrets are stored as SHA-256: a leaked table cannot be replayed. */
export function sha256(text: string): string {
	return createHash('sha256').update(text).digest('hex');
}
