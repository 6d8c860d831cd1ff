// One line about each fit and optimizer, for the study pages (our own words).
import { CURVE_METHOD_CATALOGUE, OPTIMIZER_CATALOGUE } from '$lib/domain/methods';
const notes = (c: Readonly<Record<string, { note: string }>>): Readonly<Record<string, string>> => Object.fromEntries(Object.entries(c).map(([k, v]) => [k, v.note]));
export const FIT_NOTES = notes(CURVE_METHOD_CATALOGUE);

export const OPTIMIZER_NOTES = notes(OPTIMIZER_CATALOGUE);

import { OUTCOME_MEANINGS } from '$lib/domain/outcomes';
/** each outcome's meaning, looked up by the stored outcome text */
export const OUTCOME_NOTES: Readonly<Record<string, string>> = OUTCOME_MEANINGS;

/** A number for a table cell: a few significant digits, no trailing zeros. */
export function num(v: number | null | undefined, digits = 4): string {
	if (v === null || v === undefined || !Number.isFinite(v)) return '—';
	if (v === 0) return '0';
	const a = Math.abs(v);
	if (a >= 1e6 || a < 1e-4) return v.toExponential(Math.max(0, digits - 1)).replace(/\.?0+e/, 'e');
	return String(Number(v.toPrecision(digits)));
}

export const pct = (v: number) => `${Math.round(v * 100)}%`;
