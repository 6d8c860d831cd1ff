/**
 * A run's path packed into one bytea: little-endian float64 columns
 * x (L×n, row-major) | f (L) | grad (L×n) | step (L) | violation (L).
 * One row per run keeps a study of thousands of runs to one INSERT per batch
 * and one SELECT per page; typed arrays make packing a copy, not a loop of
 * conversions.
 */
import type { Path } from '../numerics/optimize/types';

export interface StoredPath {
	x: number[][];
	f: number[];
	grad: number[][];
	step: number[];
	violation: number[];
}

export function packPath(path: Pick<Path, 'x' | 'f' | 'grad' | 'step' | 'violation'>, n: number): Buffer {
	const L = path.f.length;
	const out = new Float64Array(L * (2 * n + 3));
	let o = 0;
	for (let i = 0; i < L; i++) for (let j = 0; j < n; j++) out[o++] = path.x[i]?.[j] ?? NaN;
	for (let i = 0; i < L; i++) out[o++] = path.f[i];
	for (let i = 0; i < L; i++) for (let j = 0; j < n; j++) out[o++] = path.grad[i]?.[j] ?? NaN;
	for (let i = 0; i < L; i++) out[o++] = path.step[i] ?? NaN;
	for (let i = 0; i < L; i++) out[o++] = path.violation[i] ?? 0;
	// Float64Array is platform-endian; every platform Node supports here is little-endian.
	return Buffer.from(out.buffer, out.byteOffset, out.byteLength);
}

/** Non-finite numbers become null (JSON has no NaN). */
const j = (v: number): number => (Number.isFinite(v) ? v : (null as unknown as number));

export function unpackPath(bytes: Buffer, n: number, L: number): StoredPath {
	if (bytes.byteLength !== 8 * L * (2 * n + 3)) throw new RangeError(`packed path has ${bytes.byteLength} bytes; expected ${8 * L * (2 * n + 3)}`);
	const a = new Float64Array(L * (2 * n + 3));
	new Uint8Array(a.buffer).set(bytes);
	let o = 0;
	const rows = () => Array.from({ length: L }, () => Array.from({ length: n }, () => j(a[o++])));
	const col = () => Array.from({ length: L }, () => j(a[o++]));
	const x = rows();
	const f = col();
	const grad = rows();
	const step = col();
	const violation = col();
	return { x, f, grad, step, violation };
}
