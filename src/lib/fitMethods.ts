// The curve methods as the fit preview offers them: one list for the API's
// schema and the page's picker. Plain TypeScript, safe in the browser.
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
	{ id: 'linear', label: 'Piecewise linear', declared: 'C0', options: [] },
	{ id: 'cubic-natural', label: 'Cubic spline, natural ends', declared: 'C2', options: [] },
	{ id: 'cubic-not-a-knot', label: 'Cubic spline, not-a-knot ends', declared: 'C2', options: [] },
	{ id: 'cubic-clamped', label: 'Cubic spline, clamped ends', declared: 'C2', options: ['slopes'], required: ['slopes'] },
	{ id: 'akima', label: 'Akima (1970)', declared: 'C1', options: [] },
	{ id: 'akima-modified', label: 'Akima, modified', declared: 'C1', options: [] },
	{ id: 'pchip', label: 'PCHIP (Fritsch–Carlson, monotone)', declared: 'C1', options: [] },
	{ id: 'local-quadratic', label: 'Local quadratic (Lagrange)', declared: 'C0', options: [] },
	{ id: 'local-cubic', label: 'Local cubic (Lagrange)', declared: 'C0', options: [] },
	{ id: 'polynomial-global', label: 'Global interpolating polynomial', declared: 'Cinf', options: [] },
	{ id: 'polynomial-least-squares', label: 'Least-squares polynomial', declared: 'Cinf', options: ['degree'] },
	{ id: 'smoothing-spline', label: 'Smoothing spline (λ or GCV)', declared: 'C2', options: ['lambda'] },
	{ id: 'softened-linear', label: 'Softened linear', declared: 'C1', options: ['width'] }
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
