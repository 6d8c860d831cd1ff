// The shapes the study components receive (what the server's studyPage returns).
export type { Outcome } from '$lib/domain/outcomes';
export type { StudyStatus as Status } from '$lib/domain/lifecycle';

export interface RunView {
	id: string;
	fitId: string;
	method: string;
	optimizer: string;
	optimizerIndex: number;
	startIndex: number;
	start: number[];
	outcome: string;
	atKink: boolean;
	/** the end point lies outside the data's range (on the fit's extrapolation) */
	outsideData: boolean;
	reason: string;
	iterations: number;
	evaluations: { f: number; grad: number };
	x: number[];
	f: number | null;
	gradNorm: number | null;
	ms: number;
}

export interface FitView {
	id: string;
	position: number;
	method: string;
	options: Record<string, unknown>;
	continuity: string;
	smoothness: null | { declared?: string; measured?: string; maxJumpD1?: number; maxJumpD2?: number; error?: string };
	fidelity: null | { looRmse?: number; looMax?: number; looPoints?: number; overshoot?: number; monotoneKept?: boolean; dataMonotone?: string | null; spuriousExtrema?: number; error?: string };
	reference: null | { kind: string; x: number[] | null; f: number | null; roots?: number[]; fRange: number; note?: string; error?: string };
	samples?: { x: number[]; f: (number | null)[] } | null;
}

export interface PathView {
	x: number[][];
	f: (number | null)[];
	grad: number[][];
	step: (number | null)[];
	violation: (number | null)[];
}
