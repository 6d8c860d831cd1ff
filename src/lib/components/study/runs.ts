// The page receives runs column by column (compact, quick to load); the
// tables and charts want rows.
import type { RunView } from './types';

export interface RunColumns {
	n: number;
	fitIds: string[];
	optimizers: string[];
	starts: number[];
	id: string[];
	fit: number[];
	optimizer: number[];
	start: number[];
	outcome: string[];
	atKink: boolean[];
	/** absent in data stored before the column existed */
	outsideData?: boolean[];
	reason: string[];
	iterations: number[];
	evalsF: number[];
	evalsGrad: number[];
	x: (number | null)[];
	f: (number | null)[];
	gradNorm: (number | null)[];
	ms: number[];
}

export function runRows(c: RunColumns, methods: Record<string, string>): RunView[] {
	const n = c.n;
	return c.id.map((id, i) => ({
		id,
		fitId: c.fitIds[c.fit[i]],
		method: methods[c.fitIds[c.fit[i]]] ?? '?',
		optimizer: c.optimizers[c.optimizer[i]],
		optimizerIndex: c.optimizer[i],
		startIndex: c.start[i],
		start: c.starts.slice(c.start[i] * n, (c.start[i] + 1) * n),
		outcome: c.outcome[i],
		atKink: c.atKink[i],
		outsideData: c.outsideData?.[i] === true,
		reason: c.reason[i],
		iterations: c.iterations[i],
		evaluations: { f: c.evalsF[i], grad: c.evalsGrad[i] },
		x: c.x.slice(i * n, (i + 1) * n) as number[],
		f: c.f[i],
		gradNorm: c.gradNorm[i],
		ms: c.ms[i]
	}));
}
