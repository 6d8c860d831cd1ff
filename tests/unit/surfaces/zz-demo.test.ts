import { it } from 'vitest';
import { mulberry32 } from '../../../src/lib/numerics/math';
import { buildSurfaceFits } from '../../../src/lib/server/offload/surfaceWork';
import { surfaceFromJSON } from '../../../src/lib/numerics/fits/surfaceFile';
import { surfaceProblem } from '../../../src/lib/server/studies/surfaceProblem';
import { optimize } from '../../../src/lib/numerics/optimize/optimize';
import { makeStarts } from '../../../src/lib/numerics/optimize/starts';
function noise(seed: number): (sd: number) => number {
	const u = mulberry32(seed);
	return (sd) => sd * Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
}
it('demo', () => {
	const n = noise(2207);
	const T: number[] = [], S: number[] = [], E: number[] = [];
	for (let speed = 500; speed <= 4000; speed += 500) for (const torque of [5, 10, 20, 30, 40, 55, 70, 85]) {
		const w = (speed * 2 * Math.PI) / 60; const out = torque * w;
		const losses = 0.35 * torque * torque + 0.004 * w ** 1.8 + 0.05 * w + 35;
		T.push(torque); S.push(speed); E.push(Number((out / (out + losses) + n(0.0015)).toFixed(4)));
	}
	const methods = ['grid-linear', 'grid-cubic-natural', 'grid-cubic-not-a-knot', 'grid-akima', 'grid-pchip'] as const;
	const b = buildSurfaceFits({ kind: 'build-surface', inputs: [Float64Array.from(T), Float64Array.from(S)], columns: { e: Float64Array.from(E) }, fits: methods.map((method) => ({ method, options: {}, outputs: ['e'] })) });
	if (!b.ok) throw new Error(JSON.stringify(b));
	const bounds = (globalThis as any).B ?? [[5, 85], [500, 4000]];
	const starts = makeStarts({ latinHypercube: 20, seed: 1 }, 2, bounds);
	methods.forEach((m, i) => {
		const fit = surfaceFromJSON(b.fits[i][0]);
		const p = surfaceProblem(fit, [], { kind: 'maximize', bounds, constraints: [] } as never);
		for (const o of ['sqp', 'bfgs'] as const) {
			const tally: Record<string, number> = {};
			const xs = new Set<string>();
			for (const s of starts) { const r = optimize(p, o, {}, s); const k = r.outcome + (r.atKink ? '+kink' : ''); tally[k] = (tally[k] ?? 0) + 1; xs.add(r.x.map((v) => v.toFixed(2)).join(',') + ' f=' + r.f.toFixed(5)); }
			console.log(m, o, JSON.stringify(tally), [...xs].slice(0, 4).join(' | '));
		}
	});
});
