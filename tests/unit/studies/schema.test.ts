import { describe, expect, it } from 'vitest';
import { studyFormSchema, studyInputSchema } from '$lib/server/studies/launchRequest';

const id = '3f1a2b4c-5d6e-4f70-8a9b-0c1d2e3f4a5b';
const base = { datasetId: id, output: 'eta', problem: { kind: 'maximize' }, fits: [{ method: 'pchip' }], optimizers: [{ method: 'sqp' }], starts: { grid: 4 } };
const fields = (r: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) => (r.error?.issues ?? []).map((i) => `${i.path.join('.')}: ${i.message}`);

describe('the study request schema', () => {
	it('accepts a minimal request and fills nothing it was not given', () => {
		const r = studyInputSchema.safeParse(base);
		expect(r.success).toBe(true);
		expect(r.data).toEqual(base);
	});

	it('names each bad field', () => {
		const r = studyInputSchema.safeParse({ ...base, fits: [{ method: 'spline' }], optimizers: [{ method: 'sqp', options: { maxIterations: 1.5 } }], starts: { grid: 2, points: [[1]] } });
		expect(fields(r)).toEqual([
			expect.stringMatching(/^fits\.0\.method: unknown fit method/),
			'optimizers.0.options.maxIterations: maxIterations must be a whole number',
			'starts: give one kind of starts, not points and grid'
		]);
	});

	it('requires slopes for cubic-clamped and refuses options of other methods', () => {
		const r = studyInputSchema.safeParse({ ...base, fits: [{ method: 'cubic-clamped' }, { method: 'linear', options: { lambda: 1 } }] });
		expect(fields(r)).toEqual(['fits.0.options.slopes: cubic-clamped needs slopes: [f′ at the first x, f′ at the last x]', 'fits.1.options.lambda: lambda applies only to smoothing-spline, not linear']);
	});
});

describe('the form, through the same schema', () => {
	const form = {
		source: `${id}:pack voltage`,
		kind: 'solve',
		target: '300',
		boundLo: '',
		boundHi: '80',
		'c0.output': 'temperature',
		'c0.op': '<=',
		'c0.value': '45',
		'c1.output': '',
		'fit.pchip': 'on',
		'fit.polynomial-least-squares': 'on',
		'fit.polynomial-least-squares.degree': '4',
		extrapolation: 'hold',
		'opt.newton': 'on',
		'opt.sqp': 'on',
		gradTol: '1e-9',
		maxIterations: '200',
		startsKind: 'points',
		startsPoints: '10, 20;30\n40'
	};

	it('turns flat fields into the API request', () => {
		const r = studyFormSchema.safeParse(form);
		expect(r.success, JSON.stringify(r.error?.issues)).toBe(true);
		expect(r.data).toEqual({
			datasetId: id,
			output: 'pack voltage',
			problem: { kind: 'solve', target: 300, bounds: [[null, 80]], constraints: [{ output: 'temperature', op: '<=', value: 45 }] },
			fits: [{ method: 'pchip', options: { extrapolation: 'hold' } }, { method: 'polynomial-least-squares', options: { extrapolation: 'hold', degree: 4 } }],
			optimizers: [{ method: 'sqp', options: { gradTol: 1e-9 } }, { method: 'newton', options: { gradTol: 1e-9 } }],
			starts: { points: [[10], [20], [30], [40]] },
			budgets: { maxIterations: 200 }
		});
	});
});
