// The page receives runs column by column (compact, quick to load); the
// tables and charts want rows.
import type { RunColumns, RunRow } from '$lib/domain/wire';
export type { RunColumns } from '$lib/domain/wire';


export function runRows(c: RunColumns, methods: Record<string, string>): RunRow[] {
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
		outsideData: c.outsideData[i] === true,
		reason: c.reason[i],
		iterations: c.iterations[i],
		evaluations: { f: c.evalsF[i], grad: c.evalsGrad[i] },
		x: c.x.slice(i * n, (i + 1) * n) as number[],
		f: c.f[i],
		gradNorm: c.gradNorm[i],
		ms: c.ms[i]
	}));
}
