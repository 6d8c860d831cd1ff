/**
 * Checks on the user's text shared by every input path. PostgreSQL text cannot
 * hold NUL, and other control characters in names only confuse; tab, line
 * feed and carriage return are ordinary in free text and stay allowed.
 */
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/;

/** "U+0000 at character 4", or null when `s` has no forbidden control character. */
export function controlCharacterIn(s: string): string | null {
	const m = CONTROL.exec(s);
	if (!m) return null;
	return `U+${m[0].charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')} at character ${m.index + 1}`;
}

/** The first string inside `value` (object, array, string) with a control character: its path and what was found. */
export function findControlCharacter(value: unknown, path: (string | number)[] = []): { path: string; found: string } | null {
	if (typeof value === 'string') {
		const found = controlCharacterIn(value);
		return found ? { path: path.join('.') || 'body', found } : null;
	}
	if (Array.isArray(value)) {
		for (let i = 0; i < value.length; i++) {
			const hit = findControlCharacter(value[i], [...path, i]);
			if (hit) return hit;
		}
		return null;
	}
	if (value && typeof value === 'object') {
		for (const [k, v] of Object.entries(value)) {
			const keyHit = controlCharacterIn(k);
			if (keyHit) return { path: [...path, k].join('.'), found: `${keyHit} of the name` };
			const hit = findControlCharacter(v, [...path, k]);
			if (hit) return hit;
		}
	}
	return null;
}

/** One id check: a UUID in its canonical 8-4-4-4-12 hexadecimal form. */
export const UUID_PATTERN = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
export const isUuid = (id: string): boolean => UUID_PATTERN.test(id);
