// fmin and quadprog ship no types.
declare module 'fmin' {
	export function nelderMead(
		f: (x: number[]) => number,
		x0: number[],
		parameters?: Record<string, unknown>
	): { x: number[]; fx: number };
	export function conjugateGradient(
		f: (x: number[], fxprime: number[]) => number,
		initial: number[],
		params?: Record<string, unknown>
	): { x: number[]; fx: number; fxprime: number[] };
	export function gradientDescent(...args: unknown[]): unknown;
	export function gradientDescentLineSearch(...args: unknown[]): unknown;
	export function bisect(f: (x: number) => number, a: number, b: number, parameters?: Record<string, unknown>): number;
}
// fmin's package entry is a UMD build under "type": "module"; its ESM entry
// file loads under vite/vitest (ssr.noExternal) and tsx alike.
declare module 'fmin/index.js' {
	export * from 'fmin';
}
declare module 'quadprog' {
	export function solveQP(
		Dmat: number[][],
		dvec: number[],
		Amat: number[][],
		bvec: number[],
		meq?: number,
		factorized?: number[]
	): {
		solution: number[];
		Lagrangian: number[];
		value: number[];
		unconstrained_solution: number[];
		iterations: number[];
		iact: number[];
		message: string;
	};
}
