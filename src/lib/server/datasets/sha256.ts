import { createHash } from 'node:crypto';

/** Hex SHA-256 of the original upload (a string is hashed as its UTF-8 bytes). */
export function sha256(data: Uint8Array | string): string {
	return createHash('sha256').update(data).digest('hex');
}
