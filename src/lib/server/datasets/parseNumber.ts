import type { Cell } from './types';

// Plain decimal with optional exponent: 12, -0.5, .5, 5., 1e-3, +2.5E+4.
const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** The number in a cell, or NaN when the cell is empty or not a plain decimal number. */
export function parseNumber(cell: Cell): number {
	if (typeof cell === 'number') return Number.isFinite(cell) ? cell : NaN;
	if (cell === null || !DECIMAL.test(cell)) return NaN;
	return Number(cell);
}

export type NonNumberCode = 'thousands-separator' | 'decimal-comma' | 'non-numeric';

// "1,234" is either a thousands group or a decimal comma; we cannot tell which.
const AMBIGUOUS_COMMA = /^[+-]?\d{1,3},\d{3}$/;
const COMMA_THOUSANDS = /^[+-]?\d{1,3}(?:,\d{3})+(?:\.\d+)?(?:[eE][+-]?\d+)?$/;
const DOT_THOUSANDS = /^[+-]?\d{1,3}(?:\.\d{3}){2,}(?:,\d+)?$/;
const SPACE_THOUSANDS = /^[+-]?\d{1,3}(?:[ '\u00a0\u2009\u202f]\d{3})+(?:[.,]\d+)?$/;
const DECIMAL_COMMA = /^[+-]?\d*,\d+(?:[eE][+-]?\d+)?$/;
const PERCENT = /^[+-]?(?:\d+\.?\d*|\.\d+)\s*%$/;

/** Why a non-empty cell is not a number, as a code and a phrase about the value. */
export function describeNonNumber(text: string): { code: NonNumberCode; problem: string } {
	const quoted = JSON.stringify(text);
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
	if (PERCENT.test(text)) {
		return { code: 'non-numeric', problem: `${quoted} has a % sign — give the number alone and put % in the unit` };
	}
	return { code: 'non-numeric', problem: `${quoted} is not a number` };
}
