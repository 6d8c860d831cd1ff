import { createHash, randomBytes } from 'node:crypto';

/** A random URL-safe secret of `bytes` bytes (default 32 = 256 bits). */
export function newSecret(bytes = 32): string {
	return randomBytes(bytes).toString('base64url');
}

/**
 * Hex SHA-256 (a string is hashed as its UTF-8 bytes). Secrets are stored this
 * way, so a leaked table cannot be replayed; uploads keep it as their fingerprint.
 */
export function sha256(data: Uint8Array | string): string {
	return createHash('sha256').update(data).digest('hex');
}
