// Chart ticks and derivative units. Plain decimal notation and the unit of a
// derivative (dy/dx has the unit of y per unit of x; d²y/dx² per unit of x squared)
// are elementary (common practice, no source); the expected strings are written out by hand.
import { describe, expect, it } from 'vitest';
import { derivativeUnit, tick } from '$lib/components/chartFormat';

describe('chart ticks', () => {
	it('plain numbers: no SI prefixes, no e-notation in the everyday range', () => {
		expect(tick(0.1)).toBe('0.1'); // not "100m"
		expect(tick(600)).toBe('600'); // not "6e+2"
		expect(tick(0.0025)).toBe('0.0025');
		expect(tick(-0.35)).toBe('-0.35');
		expect(tick(12500)).toBe('12,500');
		expect(tick(0)).toBe('0');
		expect(tick(1 / 3)).toBe('0.333333');
	});
	it('very large or small values as a power of ten, sign kept', () => {
		expect(tick(2.5e-6)).toBe('2.5×10⁻⁶');
		expect(tick(1e8)).toBe('10⁸');
		expect(tick(-3e9)).toBe('−3×10⁹');
		expect(tick(Number.NaN)).toBe('');
	});
});

describe('derivative units', () => {
	it('output unit per input unit, and per input unit squared', () => {
		expect(derivativeUnit('m³/s', 'Pa', 1)).toBe('m³/s/Pa');
		expect(derivativeUnit('m³/s', 'Pa', 2)).toBe('m³/s/Pa²');
		expect(derivativeUnit('N', 'm s', 1)).toBe('N/(m s)');
		expect(derivativeUnit('N', 'm/s', 2)).toBe('N/(m/s)²');
		expect(derivativeUnit('-', '-', 1)).toBeNull();
		expect(derivativeUnit('-', 'K', 2)).toBe('1/K²');
		expect(derivativeUnit('W', null, 1)).toBe('W');
	});
});
