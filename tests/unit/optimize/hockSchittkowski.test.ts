/**
 * SQP on Hock & Schittkowski (1981) problems 21, 35, 71, 76 from the published
 * starts, against the published optima (sources and confidence words in
 * problems.ts) and against SciPy 1.10 SLSQP run live on the same statements.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { sqp } from '$lib/numerics/optimize';
import type { RunResult } from '$lib/numerics/optimize';
import { expectAllClose, expectClose } from '../../reference/tolerance';
import { runScipy } from '../../reference/scipy';
import { HOCK_SCHITTKOWSKI, SCIPY_PROBLEMS_PY } from './problems';

interface ScipyRun {
	x: number[];
	fun: number;
	nit: number;
	nfev: number;
	status: number;
}

let scipy: Record<string, ScipyRun>;
const ours: Record<string, RunResult> = {};

beforeAll(() => {
	// SciPy SLSQP at ftol 1e-10: docs/references.md notes HS 71 converges there (status 8 at 1e-14)
	scipy = runScipy<Record<string, ScipyRun>>(
		`${SCIPY_PROBLEMS_PY}
out = {}
for name in data:
    r = solve(name, 'SLSQP', 1e-10)
    out[name] = {'x': r.x, 'fun': r.fun, 'nit': r.nit, 'nfev': r.nfev, 'status': r.status}`,
		HOCK_SCHITTKOWSKI.map((p) => p.name)
	);
	for (const p of HOCK_SCHITTKOWSKI) ours[p.name] = sqp({ kind: 'minimize', objective: p.objective }, {}, p.start);
});

describe.each(HOCK_SCHITTKOWSKI.map((p) => [p.name, p] as const))('%s', (name, p) => {
	it('converges to the published optimum (x*, f* to 1e-6)', () => {
		const r = ours[name];
		expect(r.outcome, r.reason).toBe('converged');
		expectAllClose(r.x, p.xStar, 1e-6, `${name} x* (${p.source})`);
		expectClose(r.f, p.fStar, 1e-6, `${name} f* (${p.source})`);
		expect(r.kkt?.feasibility ?? 1).toBeLessThanOrEqual(1e-8);
		expect(r.path.x.length).toBe(r.iterations + 1);
	});

	it('reports the published multipliers', () => {
		const r = ours[name];
		const m = r.multipliers;
		expect(m).not.toBeNull();
		p.multipliers?.constraints?.forEach((v, i) => {
			if (v !== null) expectClose(m!.constraints[i], v, 1e-6, `${name} λ${i} with its sign, L = f + Σλc (${p.source})`);
		});
		p.multipliers?.lower?.forEach((v, i) => {
			if (v !== null) expectClose(m!.lower[i], v, 1e-6, `${name} bound multiplier x${i + 1} (${p.source})`);
		});
		// inequality multipliers are non-negative
		p.objective.constraints!.forEach((c, i) => {
			if (c.kind === 'ineq') expect(m!.constraints[i]).toBeGreaterThanOrEqual(0);
		});
	});

	it('agrees with SciPy SLSQP (live) to 1e-6, within 2× its iterations', () => {
		const s = scipy[name];
		expect(s.status, 'SciPy SLSQP status').toBe(0);
		const r = ours[name];
		expectAllClose(r.x, s.x, 1e-6, `${name} x vs SciPy SLSQP`);
		expectClose(r.f, s.fun, 1e-6, `${name} f vs SciPy SLSQP`);
		expect(r.iterations, `ours ${r.iterations} vs SciPy ${s.nit}`).toBeLessThanOrEqual(2 * s.nit);
	});
});

describe('HS 71 in detail', () => {
	it('meets the KKT conditions at the computed multipliers to 1e-8', () => {
		const r = ours['HS 71'];
		expect(r.kkt!.stationarity).toBeLessThanOrEqual(1e-8 * 17.014);
		expect(r.kkt!.complementarity).toBeLessThanOrEqual(1e-8 * 17.014);
		// with L = f + μ(25 − x₁x₂x₃x₄) + λ(Σx² − 40), stationarity in x₂ (1.3794 − 0.5523·5.2711 + 9.486λ = 0) makes λ positive
		expectClose(r.multipliers!.constraints[1], 0.16146856677050575, 1e-6, 'HS 71 λ_eq (docs/references.md, computed; sign from our convention)');
		// the path's last row is the end point; the active set there names both constraints and the bound x₁ ≥ 1
		const last = r.path.active[r.path.active.length - 1];
		expect(last).toEqual(expect.arrayContaining(['c0', 'c1', 'lo0']));
	});
});
