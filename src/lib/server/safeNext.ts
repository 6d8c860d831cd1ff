/**
 * Where to send the browser after sign-in or sign-up: only a path on our own
 * origin. The value is resolved with URL against the origin and the origins are
 * compared, and anything a browser might read differently from URL is refused
 * first: backslashes (browsers treat `\` as `/`, so `/\evil.example` is
 * protocol-relative), and tab/CR/LF/other control characters (browsers strip
 * them, so `/\t/evil.example` becomes `//evil.example`). Anything refused goes to `/`.
 */
export function safeNext(next: string | null | undefined, origin: string): string {
	if (!next || !next.startsWith('/') || next.startsWith('//')) return '/';
	// eslint-disable-next-line no-control-regex
	if (/[\u0000-\u001f\u007f\\]/.test(next)) return '/';
	let target: URL;
	let base: URL;
	try {
		base = new URL(origin);
		target = new URL(next, base);
	} catch {
		return '/';
	}
	if (target.origin !== base.origin) return '/';
	// dot segments can normalise into a protocol-relative path: `/.//evil.example` → `//evil.example`
	if (target.pathname.startsWith('//')) return '/';
	return target.pathname + target.search + target.hash;
}
