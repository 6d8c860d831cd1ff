// The curve methods as the fit preview offers them: one list for the API's
// schema and the page's picker. Plain TypeScript, safe in the browser.
import { CURVE_METHOD_CATALOGUE } from './domain/methods';
import type { CurveMethod } from '$lib/numerics/fits';

export type PreviewOption = 'degree' | 'lambda' | 'width' | 'slopes';

export interface CurveMethodChoice {
	id: CurveMethod;
	label: string;
	/** the class the method promises */
	declared: 'C0' | 'C1' | 'C2' | 'Cinf';
	/** the options this method takes besides `extrapolation` */
	options: readonly PreviewOption[];
	/** options that must be given */
	required?: readonly PreviewOption[];
}

export const CURVE_METHOD_CHOICES: readonly CurveMethodChoice[] = [
	{ id: 'linear', label: CURVE_METHOD_CATALOGUE['linear'].label, declared: 'C0', options: [] },
	{ id: 'cubic-natural', label: CURVE_METHOD_CATALOGUE['cubic-natural'].label, declared: 'C2', options: [] },
	{ id: 'cubic-not-a-knot', label: CURVE_METHOD_CATALOGUE['cubic-not-a-knot'].label, declared: 'C2', options: [] },
	{ id: 'cubic-clamped', label: CURVE_METHOD_CATALOGUE['cubic-clamped'].label, declared: 'C2', options: ['slopes'], required: ['slopes'] },
	{ id: 'akima', label: CURVE_METHOD_CATALOGUE['akima'].label, declared: 'C1', options: [] },
	{ id: 'akima-modified', label: CURVE_METHOD_CATALOGUE['akima-modified'].label, declared: 'C1', options: [] },
	{ id: 'pchip', label: CURVE_METHOD_CATALOGUE['pchip'].label, declared: 'C1', options: [] },
	{ id: 'local-quadratic', label: CURVE_METHOD_CATALOGUE['local-quadratic'].label, declared: 'C0', options: [] },
	{ id: 'local-cubic', label: CURVE_METHOD_CATALOGUE['local-cubic'].label, declared: 'C0', options: [] },
	{ id: 'polynomial-global', label: CURVE_METHOD_CATALOGUE['polynomial-global'].label, declared: 'Cinf', options: [] },
	{ id: 'polynomial-least-squares', label: CURVE_METHOD_CATALOGUE['polynomial-least-squares'].label, declared: 'Cinf', options: ['degree'] },
	{ id: 'smoothing-spline', label: CURVE_METHOD_CATALOGUE['smoothing-spline'].label, declared: 'C2', options: ['lambda'] },
	{ id: 'softened-linear', label: CURVE_METHOD_CATALOGUE['softened-linear'].label, declared: 'C1', options: ['width'] }
];

export const CURVE_METHOD_IDS = CURVE_METHOD_CHOICES.map((m) => m.id) as [CurveMethod, ...CurveMethod[]];

export const EXTRAPOLATIONS = ['refuse', 'hold', 'linear', 'extend'] as const;

/** The fit preview's answer: the shape `POST /api/v1/datasets/:id/fit-preview` returns (README, "Datasets"). */
export interface FitPreview {
	method: CurveMethod;
	continuity: {
		declared: 'C0' | 'C1' | 'C2' | 'Cinf';
		measured: 'C0' | 'C1' | 'C2' | 'Cinf' | 'discontinuous';
		worst: { x: number; jumpD1: number; jumpD2: number }[];
	};
	fidelity: { looRmse: number | null; looMax: number | null; overshoot: number; monotoneKept: boolean; spuriousExtrema: number };
	samples: { x: number[]; f: number[]; df: number[]; d2f: number[] };
	at?: { x: number[]; f: number[]; df: number[]; d2f: number[] };
}
