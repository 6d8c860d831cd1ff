// The new-study form's default problem, read from a dataset's description.
// The descriptions are the demo seed's own (invented data); what each asks for
// is plain English (common practice, no source).
import { describe, expect, it } from 'vitest';
import { guessProblem } from '$lib/components/studyDefaults';

describe('the default problem from a dataset description', () => {
	it('a solve with the target the description names', () => {
		expect(guessProblem('Resting voltage of the 96-cell pack against state of charge. Solve for the charge at the 300 V cut-off.')).toEqual({ kind: 'solve', target: '300' });
		expect(guessProblem('Solve for the flow at 1,250.5 Pa.')).toEqual({ kind: 'solve', target: '1250.5' });
	});
	it('the first sense the description states', () => {
		expect(guessProblem('Drag polar of the LA-2 wing. Minimise drag, or maximise L/D, subject to a lift constraint.').kind).toBe('minimize');
		expect(guessProblem('Deliberately coarse, so the piecewise-linear fit has a kink right at the efficiency peak.').kind).toBe('maximize');
		expect(guessProblem('The curve falls monotonically; a fit that adds a bump would mislead a duct-matching solve.')).toEqual({ kind: 'solve', target: null });
	});
	it('maximize when the description says nothing', () => {
		expect(guessProblem('')).toEqual({ kind: 'maximize', target: null });
		expect(guessProblem(null)).toEqual({ kind: 'maximize', target: null });
	});
});
