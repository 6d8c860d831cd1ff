// Axis ticks and labels for the charts: plain numbers, never SI prefixes that
// read as units ("100m" next to m³/s) and never "6e+2"; units on derivative
// axes as output unit per input unit (f′) and per input unit squared (f″).

const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/** A tick label: plain digits between 1e-4 and 1e7 (up to 6 significant), else a × 10ⁿ. */
export function tick(v: number): string {
	if (!Number.isFinite(v)) return '';
	if (v === 0) return '0';
	const a = Math.abs(v);
	if (a >= 1e-4 && a < 1e7) return Number(v.toPrecision(6)).toLocaleString('en-US', { maximumSignificantDigits: 6, useGrouping: a >= 1e4 });
	const [m, e] = v.toExponential(3).split('e');
	const mant = String(Number(m));
	const exp = String(Number(e)).replace(/./g, (c) => SUPERSCRIPT[c] ?? c);
	return `${mant === '1' ? '' : mant === '-1' ? '−' : `${mant.replace('-', '−')}×`}10${exp}`;
}

/** `name [unit]`, or the name alone when there is no unit */
export const axisLabel = (name: string, unit: string | null | undefined) => (unit ? `${name} [${unit}]` : name);

/** The unit of the k-th derivative of an output with unit `out` against an input with unit `inp`. */
export function derivativeUnit(out: string | null | undefined, inp: string | null | undefined, order: 1 | 2): string | null {
	const o = out && out !== '-' ? out : null;
	const i = inp && inp !== '-' ? inp : null;
	if (!o && !i) return null;
	const wrapped = i && /[\s/·*^²³]/.test(i) ? `(${i})` : i;
	const per = wrapped ? (order === 1 ? wrapped : `${wrapped}²`) : null;
	if (!per) return o;
	return `${o ?? '1'}/${per}`;
}
