/**
 * Text cells of every CSV the app writes. A cell starting with `=`, `+`, `-`,
 * `@`, tab or carriage return is read by spreadsheet programs as a formula
 * (CSV or formula injection, OWASP's "CSV Injection" page), so such text gets
 * a leading `'`, which spreadsheets show as a plain-text marker. Numbers are
 * written as numbers by the callers (`-1.5` stays `-1.5`); this is for text.
 * Then the RFC 4180 quoting: quotes doubled, the cell quoted when it holds a
 * quote, comma or line break.
 */
export function csvText(s: string): string {
	const t = /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
	return /[",\n\r]/.test(t) ? `"${t.replace(/"/g, '""')}"` : t;
}
