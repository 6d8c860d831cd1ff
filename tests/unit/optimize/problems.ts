/**
 * Reference problems shared by the optimizer tests and the benchmark, stated
 * once in TypeScript and once in Python (for SciPy, run live), with their
 * published optima.
 *
 * Sources (confidence words as in docs/references.md):
 * - W. Hock, K. Schittkowski, Test Examples for Nonlinear Programming Codes,
 *   LNEMS 187, Springer 1981 — statements and optima **corroborated**, each
 *   optimum checked against the KKT conditions (**computed**).
 * - H. H. Rosenbrock, Comput. J. 3:175–184, 1960, chained n-D form —
 *   minimum at all ones, f = 0 (**computed**).
 * Constraint convention here: value ≤ 0 (SciPy's is fun ≥ 0; the Python side
 * states them its own way).
 */
import type { Objective } from '../../../src/lib/numerics/optimize/types';

const INF = Infinity;

export interface ReferenceProblem {
	name: string;
	objective: Objective;
	start: number[];
	/** published optimum */
	xStar: number[];
	fStar: number;
	/** where the source gives them: the multiplier per constraint, signed for L = f + Σλc / per bound */
	multipliers?: { constraints?: (number | null)[]; lower?: (number | null)[] };
	source: string;
}

export function rosenbrock(n: number): Objective {
	return {
		n,
		evaluate(x) {
			let f = 0;
			const g = new Array<number>(n).fill(0);
			for (let i = 0; i < n - 1; i++) {
				const a = x[i + 1] - x[i] * x[i];
				const b = 1 - x[i];
				f += 100 * a * a + b * b;
				g[i] += -400 * x[i] * a - 2 * b;
				g[i + 1] += 200 * a;
			}
			return { f, grad: g };
		}
	};
}

/** (−1.2, 1, −1.2, 1, …): Rosenbrock's start, chained */
export function rosenbrockStart(n: number): number[] {
	return Array.from({ length: n }, (_, i) => (i % 2 === 0 ? -1.2 : 1));
}

export const HS21: ReferenceProblem = {
	name: 'HS 21',
	source: 'Hock & Schittkowski (1981) no. 21 — corroborated',
	start: [-1, -1],
	xStar: [2, 0],
	fStar: -99.96,
	objective: {
		n: 2,
		bounds: [
			[2, 50],
			[-50, 50]
		],
		evaluate: (x) => ({ f: 0.01 * x[0] ** 2 + x[1] ** 2 - 100, grad: [0.02 * x[0], 2 * x[1]] }),
		constraints: [{ kind: 'ineq', label: '10x₁ − x₂ ≥ 10', evaluate: (x) => ({ value: -(10 * x[0] - x[1] - 10), grad: [-10, 1] }) }]
	}
};

export const HS35: ReferenceProblem = {
	name: 'HS 35',
	source: 'Hock & Schittkowski (1981) no. 35 — corroborated; multiplier 2/9 computed',
	start: [0.5, 0.5, 0.5],
	xStar: [4 / 3, 7 / 9, 4 / 9],
	fStar: 1 / 9,
	multipliers: { constraints: [2 / 9] },
	objective: {
		n: 3,
		bounds: [
			[0, INF],
			[0, INF],
			[0, INF]
		],
		evaluate: (x) => ({
			f: 9 - 8 * x[0] - 6 * x[1] - 4 * x[2] + 2 * x[0] ** 2 + 2 * x[1] ** 2 + x[2] ** 2 + 2 * x[0] * x[1] + 2 * x[0] * x[2],
			grad: [-8 + 4 * x[0] + 2 * x[1] + 2 * x[2], -6 + 4 * x[1] + 2 * x[0], -4 + 2 * x[2] + 2 * x[0]]
		}),
		constraints: [{ kind: 'ineq', label: 'x₁ + x₂ + 2x₃ ≤ 3', evaluate: (x) => ({ value: x[0] + x[1] + 2 * x[2] - 3, grad: [1, 1, 2] }) }]
	}
};

export const HS71: ReferenceProblem = {
	name: 'HS 71',
	// the published point is rounded (f there is 17.0140168); this is the KKT-accurate one
	source: 'Hock & Schittkowski (1981) no. 71 — corroborated; KKT-accurate optimum and multipliers computed (docs/references.md)',
	start: [1, 5, 5, 1],
	xStar: [1, 4.7429996372644174, 3.8211499841848737, 1.3794082931726723],
	fStar: 17.0140172891563,
	multipliers: { constraints: [0.55229366012072678, 0.16146856677050575], lower: [1.0878712286669403, null, null, null] },
	objective: {
		n: 4,
		bounds: [
			[1, 5],
			[1, 5],
			[1, 5],
			[1, 5]
		],
		evaluate: (x) => ({
			f: x[0] * x[3] * (x[0] + x[1] + x[2]) + x[2],
			grad: [x[3] * (2 * x[0] + x[1] + x[2]), x[0] * x[3], x[0] * x[3] + 1, x[0] * (x[0] + x[1] + x[2])]
		}),
		constraints: [
			{
				kind: 'ineq',
				label: 'x₁x₂x₃x₄ ≥ 25',
				evaluate: (x) => ({ value: 25 - x[0] * x[1] * x[2] * x[3], grad: [-x[1] * x[2] * x[3], -x[0] * x[2] * x[3], -x[0] * x[1] * x[3], -x[0] * x[1] * x[2]] })
			},
			{ kind: 'eq', label: 'Σxᵢ² = 40', evaluate: (x) => ({ value: x[0] ** 2 + x[1] ** 2 + x[2] ** 2 + x[3] ** 2 - 40, grad: x.map((v) => 2 * v) }) }
		]
	}
};

export const HS76: ReferenceProblem = {
	name: 'HS 76',
	source: 'Hock & Schittkowski (1981) no. 76 — corroborated; exact optimum (3/11, 23/11, 0, 6/11), multipliers 5/11 and 19/11 computed',
	start: [0.5, 0.5, 0.5, 0.5],
	xStar: [3 / 11, 23 / 11, 0, 6 / 11],
	fStar: -103 / 22,
	multipliers: { constraints: [5 / 11, 0, 0], lower: [null, null, 19 / 11, null] },
	objective: {
		n: 4,
		bounds: [
			[0, INF],
			[0, INF],
			[0, INF],
			[0, INF]
		],
		evaluate: (x) => ({
			f: x[0] ** 2 + 0.5 * x[1] ** 2 + x[2] ** 2 + 0.5 * x[3] ** 2 - x[0] * x[2] + x[2] * x[3] - x[0] - 3 * x[1] + x[2] - x[3],
			grad: [2 * x[0] - x[2] - 1, x[1] - 3, 2 * x[2] - x[0] + x[3] + 1, x[3] + x[2] - 1]
		}),
		constraints: [
			{ kind: 'ineq', evaluate: (x) => ({ value: x[0] + 2 * x[1] + x[2] + x[3] - 5, grad: [1, 2, 1, 1] }) },
			{ kind: 'ineq', evaluate: (x) => ({ value: 3 * x[0] + x[1] + 2 * x[2] - x[3] - 4, grad: [3, 1, 2, -1] }) },
			{ kind: 'ineq', evaluate: (x) => ({ value: -(x[1] + 4 * x[2] - 1.5), grad: [0, -1, -4, 0] }) }
		]
	}
};

export const HOCK_SCHITTKOWSKI: ReferenceProblem[] = [HS21, HS35, HS71, HS76];

/**
 * The same problems for SciPy (Python), keyed like the TypeScript ones, plus
 * Rosenbrock. `problem(name)` returns (f, grad, constraints, bounds, x0).
 */
export const SCIPY_PROBLEMS_PY = String.raw`
from scipy.optimize import minimize, rosen, rosen_der
import warnings, time
warnings.simplefilter('ignore')
INF = np.inf
def _hs21():
    f = lambda x: 0.01*x[0]**2 + x[1]**2 - 100
    g = lambda x: np.array([0.02*x[0], 2*x[1]])
    c = [{'type': 'ineq', 'fun': lambda x: 10*x[0] - x[1] - 10, 'jac': lambda x: np.array([10.0, -1.0])}]
    return f, g, c, [(2, 50), (-50, 50)], [-1.0, -1.0]
def _hs35():
    f = lambda x: 9 - 8*x[0] - 6*x[1] - 4*x[2] + 2*x[0]**2 + 2*x[1]**2 + x[2]**2 + 2*x[0]*x[1] + 2*x[0]*x[2]
    g = lambda x: np.array([-8 + 4*x[0] + 2*x[1] + 2*x[2], -6 + 4*x[1] + 2*x[0], -4 + 2*x[2] + 2*x[0]])
    c = [{'type': 'ineq', 'fun': lambda x: 3 - x[0] - x[1] - 2*x[2], 'jac': lambda x: np.array([-1.0, -1.0, -2.0])}]
    return f, g, c, [(0, None)]*3, [0.5, 0.5, 0.5]
def _hs71():
    f = lambda x: x[0]*x[3]*(x[0] + x[1] + x[2]) + x[2]
    g = lambda x: np.array([x[3]*(2*x[0] + x[1] + x[2]), x[0]*x[3], x[0]*x[3] + 1, x[0]*(x[0] + x[1] + x[2])])
    c = [{'type': 'ineq', 'fun': lambda x: x[0]*x[1]*x[2]*x[3] - 25, 'jac': lambda x: np.array([x[1]*x[2]*x[3], x[0]*x[2]*x[3], x[0]*x[1]*x[3], x[0]*x[1]*x[2]])},
         {'type': 'eq', 'fun': lambda x: np.sum(x**2) - 40, 'jac': lambda x: 2*x}]
    return f, g, c, [(1, 5)]*4, [1.0, 5.0, 5.0, 1.0]
def _hs76():
    f = lambda x: x[0]**2 + 0.5*x[1]**2 + x[2]**2 + 0.5*x[3]**2 - x[0]*x[2] + x[2]*x[3] - x[0] - 3*x[1] + x[2] - x[3]
    g = lambda x: np.array([2*x[0] - x[2] - 1, x[1] - 3, 2*x[2] - x[0] + x[3] + 1, x[3] + x[2] - 1])
    c = [{'type': 'ineq', 'fun': lambda x: 5 - x[0] - 2*x[1] - x[2] - x[3], 'jac': lambda x: np.array([-1.0, -2.0, -1.0, -1.0])},
         {'type': 'ineq', 'fun': lambda x: 4 - 3*x[0] - x[1] - 2*x[2] + x[3], 'jac': lambda x: np.array([-3.0, -1.0, -2.0, 1.0])},
         {'type': 'ineq', 'fun': lambda x: x[1] + 4*x[2] - 1.5, 'jac': lambda x: np.array([0.0, 1.0, 4.0, 0.0])}]
    return f, g, c, [(0, None)]*4, [0.5]*4
def _rosen(n, x0):
    return rosen, rosen_der, [], None, list(x0)
def problem(name):
    if name == 'HS 21': return _hs21()
    if name == 'HS 35': return _hs35()
    if name == 'HS 71': return _hs71()
    if name == 'HS 76': return _hs76()
    if name.startswith('rosen'):
        n = int(name.split(':')[1]); start = name.split(':')[2]
        x0 = [(-1.2 if i % 2 == 0 else 1.0) for i in range(n)] if start == 'classic' else [0.0]*n
        return _rosen(n, x0)
    raise ValueError(name)
def solve(name, method, tol):
    f, g, c, b, x0 = problem(name)
    if method == 'SLSQP':
        return minimize(f, np.array(x0), jac=g, constraints=c, bounds=b, method='SLSQP', options={'ftol': tol, 'maxiter': 1000})
    return minimize(f, np.array(x0), jac=g, method='BFGS', options={'gtol': tol, 'maxiter': 5000})
`;
