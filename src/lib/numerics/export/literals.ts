/**
 * Number and array literals for generated code. Finite doubles are written by
 * ECMAScript's Number → String conversion, the shortest decimal that reads
 * back to the same double; Python's float() and every JavaScript engine parse
 * decimals correctly rounded, so the constants in the generated code are the
 * engine's doubles bit for bit.
 */

/** A double as a Python float literal. */
export function pyFloat(v: number): string {
	if (Number.isNaN(v)) return 'float("nan")';
	if (v === Infinity) return 'float("inf")';
	if (v === -Infinity) return 'float("-inf")';
	if (Object.is(v, -0)) return '-0.0';
	const s = String(v);
	return /[.e]/.test(s) ? s : `${s}.0`;
}

/** A double as a TypeScript literal. */
export function tsNumber(v: number): string {
	if (Number.isNaN(v)) return 'NaN';
	if (v === Infinity) return 'Infinity';
	if (v === -Infinity) return '-Infinity';
	if (Object.is(v, -0)) return '-0';
	return String(v);
}

/** Items joined with ", " and wrapped to lines of at most `width` characters, each line indented. */
export function wrapItems(items: string[], indent: string, width = 100): string {
	const lines: string[] = [];
	let line = '';
	for (const item of items) {
		const next = line ? `${line}, ${item}` : item;
		if (line && indent.length + next.length + 1 > width) {
			lines.push(`${indent}${line},`);
			line = item;
		} else line = next;
	}
	if (line) lines.push(`${indent}${line}`);
	return lines.join('\n');
}

/** A Python string literal (JSON's escaping is valid Python for these texts). */
export function pyString(s: string): string {
	return JSON.stringify(s);
}

/** A TypeScript string literal. */
export function tsString(s: string): string {
	return JSON.stringify(s);
}

/** Text broken into lines of at most `width` characters at spaces. */
export function wrapText(text: string, width = 88): string[] {
	const out: string[] = [];
	let line = '';
	for (const word of text.split(/\s+/).filter(Boolean)) {
		if (line && line.length + 1 + word.length > width) {
			out.push(line);
			line = word;
		} else line = line ? `${line} ${word}` : word;
	}
	if (line) out.push(line);
	return out;
}
