/**
 * The run contract shared by every optimizer: fair counting, budgets (with an
 * injectable clock), the per-iteration callback, the path, maximize and solve.
 */
import { describe, expect, it } from 'vitest';
import { OPTIMIZERS, optimize, type Objective, type OptimizerName } from '$lib/numerics/optimize';
import { rosenbrock } from './problems';

const ALL = Object.keys(OPTIMIZERS) as OptimizerName[];

/** a smooth bowl with a Hessian, counting calls */
function bowl() {
	const counter = { calls: 0 };
	const objective: Objective = {
		n: 2,
		evaluate: ([x, y]) => {
			counter.calls++;
			return { f: (x - 1) ** 2 + 3 * (y + 2) ** 2 + 0.5 * x * y, grad: [2 * (x - 1) + 0.5 * y, 6 * (y + 2) + 0.5 * x], hess: [[2, 0.5], [0.5, 6]] };
		}
	};
	return { objective, counter };
}

describe('fair counting', () => {
	it.each(ALL)('%s: evaluations.f equals the objective calls; grads ≤ f; Nelder–Mead reads none', (o) => {
		const { objective, counter } = bowl();
		const r = optimize({ kind: 'minimize', objective }, o, {}, [3, 3]);
		expect(r.outcome, r.reason).toBe('converged');
		expect(r.evaluations.f).toBe(counter.calls);
		expect(r.evaluations.grad).toBeLessThanOrEqual(r.evaluations.f);
		if (o === 'nelder-mead') expect(r.evaluations.grad).toBe(0);
		else expect(r.evaluations.grad).toBeGreaterThan(0);
		if (o === 'newton') expect(r.evaluations.hess).toBeGreaterThan(0);
		else expect(r.evaluations.hess).toBeLessThanOrEqual(1); // at most the end-point check reads one
		expect(r.evaluations.constraints).toBe(0);
	});
});

describe('budgets end the run as iteration-limit, never hang', () => {
	const slow = { kind: 'minimize' as const, objective: rosenbrock(2) };

	it.each(ALL)('%s: maxEvaluations', (o) => {
		const r = optimize(slow, o, { maxEvaluations: 7 }, [-1.2, 1]);
		expect(r.outcome).toBe('iteration-limit');
		expect(r.reason).toMatch(/evaluation budget of 7/);
		expect(r.evaluations.f).toBeLessThanOrEqual(7);
		expect(r.x.every(Number.isFinite)).toBe(true);
	});

	it.each(ALL)('%s: maxIterations', (o) => {
		const r = optimize(slow, o, { maxIterations: 3 }, [-1.2, 1]);
		expect(r.outcome).toBe('iteration-limit');
		expect(r.iterations).toBeLessThanOrEqual(3);
		expect(r.path.x.length).toBe(r.iterations + 1);
	});

	it.each(ALL)('%s: maxMilliseconds on an injected clock (1 ms per reading)', (o) => {
		let t = 0;
		const r = optimize(slow, o, { maxMilliseconds: 25, clock: () => t++ }, [-1.2, 1]);
		expect(r.outcome).toBe('iteration-limit');
		expect(r.reason).toMatch(/time budget of 25 ms/);
	});
});

describe('per-iteration callback and path', () => {
	it.each(ALL)('%s: called for the start and every iteration, with the path’s rows', (o) => {
		const { objective } = bowl();
		const seen: number[] = [];
		const r = optimize({ kind: 'minimize', objective }, o, { onIteration: (rec) => void seen.push(rec.iteration) }, [3, 3]);
		expect(seen).toEqual(Array.from({ length: r.iterations + 1 }, (_, i) => i));
		const p = r.path;
		for (const col of [p.x, p.f, p.grad, p.step, p.violation, p.merit, p.active]) expect(col.length).toBe(r.iterations + 1);
		expect(p.step[0]).toBe(0);
		expect(p.x[0]).toEqual([3, 3]);
		expect(p.x[p.x.length - 1]).toEqual(r.x);
	});

	it('returning false from the callback stops the run', () => {
		const { objective } = bowl();
		const r = optimize({ kind: 'minimize', objective }, 'bfgs', { onIteration: (rec) => rec.iteration < 2 }, [3, 3]);
		expect(r.outcome).toBe('iteration-limit');
		expect(r.reason).toMatch(/stopped by the caller/);
		expect(r.iterations).toBe(2);
	});
});

describe('maximize and solve', () => {
	const hill: Objective = { n: 1, bounds: [[-3, 3]], evaluate: ([x]) => ({ f: 2 - (x - 1) ** 2, grad: [-2 * (x - 1)], hess: [[-2]] }) };

	it.each(ALL)('%s maximizes; the path stores the user’s f, which rises', (o) => {
		const r = optimize({ kind: 'maximize', objective: hill }, o, {}, [-2]);
		expect(r.outcome, r.reason).toBe('converged');
		expect(Math.abs(r.x[0] - 1)).toBeLessThan(1e-6);
		expect(r.f).toBeCloseTo(2, 10);
		expect(r.path.f[0]).toBeCloseTo(2 - 9, 12);
		if (o !== 'newton') for (let i = 1; i < r.path.f.length; i++) expect(r.path.f[i]).toBeGreaterThanOrEqual(r.path.f[i - 1] - 1e-12);
		// the merit is what was minimized
		expect(r.path.merit[0]).toBeCloseTo(-r.path.f[0], 12);
	});

	it.each(ALL)('%s solves f = target (Newton natively, the others as least squares)', (o) => {
		const r = optimize({ kind: 'solve', target: 1.5, objective: hill }, o, {}, [2.5]);
		expect(r.outcome, r.reason).toBe('converged');
		expect(Math.abs(r.f - 1.5)).toBeLessThanOrEqual(1e-10);
	});

	it.each(ALL.filter((o) => o !== 'newton'))('%s: an unreachable target is a local minimum of |f − target|, not a root', (o) => {
		const r = optimize({ kind: 'solve', target: 5, objective: hill }, o, {}, [2.5]);
		expect(r.outcome).toBe('stalled');
		expect(r.reason).toMatch(/no root/);
	});

	it('Newton solves a square system f = target, h = 0 (equations from the objective and an equality constraint)', () => {
		const objective: Objective = {
			n: 2,
			evaluate: ([x, y]) => ({ f: x * x + y * y, grad: [2 * x, 2 * y] }),
			constraints: [{ kind: 'eq', evaluate: ([x, y]) => ({ value: x - 2 * y, grad: [1, -2] }) }]
		};
		const r = optimize({ kind: 'solve', target: 5, objective }, 'newton', {}, [1, 1]);
		expect(r.outcome, r.reason).toBe('converged');
		expect(r.x[0]).toBeCloseTo(2, 10);
		expect(r.x[1]).toBeCloseTo(1, 10);
	});

	it('Newton solves one equation in two inputs by minimum-norm steps', () => {
		const objective: Objective = { n: 2, evaluate: ([x, y]) => ({ f: x * x + 2 * y * y, grad: [2 * x, 4 * y] }) };
		const r = optimize({ kind: 'solve', target: 3, objective }, 'newton', {}, [2, 2]);
		expect(r.outcome, r.reason).toBe('converged');
		expect(Math.abs(r.f - 3)).toBeLessThanOrEqual(3e-10);
	});
});

describe('input contracts', () => {
	const { objective } = bowl();
	it('general constraints need sqp', () => {
		const constrained: Objective = { ...objective, constraints: [{ kind: 'ineq', evaluate: ([x]) => ({ value: x, grad: [1, 0] }) }] };
		for (const o of ['bfgs', 'conjugate-gradient', 'steepest-descent', 'nelder-mead', 'newton'] as const)
			expect(() => optimize({ kind: 'minimize', objective: constrained }, o, {}, [0, 0])).toThrow(RangeError);
		expect(optimize({ kind: 'minimize', objective: constrained }, 'sqp', {}, [0, 0]).outcome).toBe('converged');
	});
	it('a start of the wrong length or with NaN is rejected; one outside the bounds is projected (and noted)', () => {
		expect(() => optimize({ kind: 'minimize', objective }, 'bfgs', {}, [0])).toThrow(RangeError);
		expect(() => optimize({ kind: 'minimize', objective }, 'bfgs', {}, [0, NaN])).toThrow(RangeError);
		const boxed: Objective = { ...objective, bounds: [[-1, 1], [-1, 1]] };
		const r = optimize({ kind: 'minimize', objective: boxed }, 'sqp', {}, [5, 5]);
		expect(r.start).toEqual([5, 5]);
		expect(r.path.x[0]).toEqual([1, 1]);
		expect(r.notes).toContain('start projected into the bounds');
	});
	it('solve needs a finite target; unknown optimizers are rejected', () => {
		expect(() => optimize({ kind: 'solve', objective }, 'newton', {}, [0, 0])).toThrow(RangeError);
		expect(() => optimize({ kind: 'minimize', objective }, 'simplex' as OptimizerName, {}, [0, 0])).toThrow(RangeError);
	});
});
