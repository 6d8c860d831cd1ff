// Refused new-study fields are named by the form's own labels, never by
// internal paths (common practice, no source: the labels are the form's).
import { describe, expect, it } from 'vitest';
import { studyFieldLabel } from '$lib/components/fieldLabels';

describe('new-study problems in the form’s own words', () => {
	const ctx = { input: 'J', fits: ['linear', 'pchip'], optimizers: ['sqp', 'bfgs'] };
	it('names bounds, starts, budgets, fits and optimizers as the form labels them', () => {
		expect(studyFieldLabel('problem.bounds.0', ctx)).toBe('Lower and upper bound on J');
		expect(studyFieldLabel('problem.bounds.0.1', ctx)).toBe('Upper bound on J');
		expect(studyFieldLabel('starts.latinHypercube', ctx)).toBe('Number of starts');
		expect(studyFieldLabel('starts.points.3', ctx)).toBe('Start values (value 4)');
		expect(studyFieldLabel('budgets.maxEvaluations', ctx)).toBe('Evaluations per run');
		expect(studyFieldLabel('optimizers.1.options.gradTol', ctx)).toBe('Gradient tolerance');
		expect(studyFieldLabel('fits.1', ctx)).toBe('Fits to compare (pchip)');
		expect(studyFieldLabel('problem.target', ctx)).toBe('Target value');
		expect(studyFieldLabel('datasetId', ctx)).toBe('Dataset and output');
	});
	it('no label ever shows a dotted path for a known field', () => {
		for (const f of ['problem.bounds', 'problem.constraints.0.value', 'starts.seed', 'starts.grid', 'optimizers', 'fits.0.options.degree', 'budgets', '(body)'])
			expect(studyFieldLabel(f, ctx)).not.toMatch(/\w\.\w/);
	});
});
