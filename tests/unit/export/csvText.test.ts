// CSV text cells: formula injection defused (OWASP "CSV Injection": cells
// starting with = + - @ tab CR) and RFC 4180 quoting.
import { describe, expect, it } from 'vitest';
import { csvText } from '$lib/csv';

describe('csvText', () => {
	it.each([
		['=HYPERLINK("http://evil.example","x")', `"'=HYPERLINK(""http://evil.example"",""x"")"`],
		['+SUM(A1:A9)', "'+SUM(A1:A9)"],
		['-2+3', "'-2+3"],
		['@cmd', "'@cmd"],
		['\tTab', "'\tTab"],
		['\rCR', `"'\rCR"`]
	])('defuses %j', (input, expected) => {
		expect(csvText(input)).toBe(expected);
	});

	it.each([
		['thrust [N]', 'thrust [N]'],
		['eta, total', '"eta, total"'],
		['say "hi"', '"say ""hi"""'],
		['a\nb', '"a\nb"'],
		['x=1', 'x=1']
	])('quotes %j as RFC 4180 asks, and leaves inner = alone', (input, expected) => {
		expect(csvText(input)).toBe(expected);
	});
});
