// The curve methods as the fit preview offers them: one list for the API's
// schema and the page's picker. Plain TypeScript, safe in the browser.
import { CURVE_METHOD_CATALOGUE, type CurveOption } from './domain/methods';
import type { Continuity, CurveMethod } from '$lib/numerics/fits';

type PreviewOption = CurveOption;

interface CurveMethodChoice {
	id: CurveMethod;
	label: string;
	/** the class the method promises */
	declared: Continuity;
	/** the options this method takes besides `extrapolation` */
	options: readonly PreviewOption[];
	/** options that must be given */
	required?: readonly PreviewOption[];
}

export const CURVE_METHOD_CHOICES: readonly CurveMethodChoice[] = (Object.keys(CURVE_METHOD_CATALOGUE) as CurveMethod[]).map((id) => {
	const { label, continuity, options, required } = CURVE_METHOD_CATALOGUE[id];
	return { id, label, declared: continuity, options, ...(required ? { required } : {}) };
});

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
