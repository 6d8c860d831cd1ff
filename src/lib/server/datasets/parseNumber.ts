import { clipForMessage } from './limits';
import type { Cell } from './types';

// Plain decimal with optional exponent: 12, -0.5, .5, 5., 1e-3, +2.5E+4.
const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** The number in a cell, or NaN when the cell is empty or not a plain, finite decimal number. */
export function parseNumber(cell: Cell): number {
	if (typeof cell === 'number') return Number.isFinite(cell) ? cell : NaN;
	if (cell === null || !DECIMAL.test(cell)) return NaN;
	const v = Number(cell);
	return Number.isFinite(v) ? v : NaN;
}

/**
 * A field of a text table as a cell: trimmed, null when blank, a number when
 * it is a plain decimal number. Converting while reading keeps a large table
 * as arrays of doubles rather than as millions of small strings.
 */
export function toCell(field: string): Cell {
	const text = field.trim();
	if (text === '') return null;
	const v = parseNumber(text);
	return Number.isNaN(v) ? text : v;
}

type NonNumberCode = 'thousands-separator' | 'decimal-comma' | 'non-numeric';

// "1,234" is either a thousands group or a decimal comma; we cannot tell which.
const AMBIGUOUS_COMMA = /^[+-]?\d{1,3},\d{3}$/;
const COMMA_THOUSANDS = /^[+-]?\d{1,3}(?:,\d{3})+(?:\.\d+)?(?:[eE][+-]?\d+)?$/;
// "1.234.567" or "1.234,5": dots grouping thousands, as some locales write them
const DOT_THOUSANDS = /^[+-]?\d{1,3}(?:(?:\.\d{3}){2,}|(?:\.\d{3})+,\d+)$/;
const SPACE_THOUSANDS = /^[+-]?\d{1,3}(?:[ '\u00a0\u2009\u202f]\d{3})+(?:[.,]\d+)?$/;
const DECIMAL_COMMA = /^[+-]?\d*,\d+(?:[eE][+-]?\d+)?$/;
const PERCENT = /^[+-]?(?:\d+\.?\d*|\.\d+)\s*%$/;

/** Why a non-empty cell is not a number, as a code and a phrase about the value. */
export function describeNonNumber(text: string): { code: NonNumberCode; problem: string } {
	const quoted = JSON.stringify(clipForMessage(text));
	if (AMBIGUOUS_COMMA.test(text)) {
		return {
			code: 'thousands-separator',
			problem: `${quoted} has a comma; thousands separators and decimal commas are not accepted — write ${text.replace(',', '')} or ${text.replace(',', '.')}`
		};
	}
	if (COMMA_THOUSANDS.test(text) || DOT_THOUSANDS.test(text) || SPACE_THOUSANDS.test(text)) {
		return {
			code: 'thousands-separator',
			problem: `${quoted} has a thousands separator, which is not accepted — write the digits without it, with a decimal point`
		};
	}
	if (DECIMAL_COMMA.test(text)) {
		return {
			code: 'decimal-comma',
			problem: `${quoted} has a decimal comma, which is not accepted — write ${text.replace(',', '.')}`
		};
	}
	if (DECIMAL.test(text)) return { code: 'non-numeric', problem: `${quoted} is out of range for a number` };
	if (PERCENT.test(text)) {
		return { code: 'non-numeric', problem: `${quoted} has a % sign — give the number alone and put % in the unit` };
	}
	return { code: 'non-numeric', problem: `${quoted} is not a number` };
}
