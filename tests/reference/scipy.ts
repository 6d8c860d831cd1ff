/**
 * Calls Debian's SciPy (python3-scipy, /usr/bin/python3) as the live reference.
 * A reference check never skips: when SciPy is missing this throws with the
 * install command, and the test fails.
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';

export const PYTHON = '/usr/bin/python3';

export function assertScipy(): void {
	const r = existsSync(PYTHON) ? spawnSync(PYTHON, ['-c', 'import scipy, numpy; print(scipy.__version__)'], { encoding: 'utf8' }) : null;
	if (!r || r.status !== 0) {
		throw new Error('SciPy reference missing: run `apt-get install -y python3-scipy` (Debian) and retry');
	}
}

/**
 * Run a Python snippet with `data` (JSON) bound to the variable `data`; the
 * snippet assigns its answer to `out`, which comes back parsed. Non-finite
 * floats travel as null.
 */
export function runScipy<T = unknown>(code: string, data: unknown = null, timeoutMs = 120_000): T {
	assertScipy();
	const prelude = [
		'import json, sys, math',
		'import numpy as np',
		'import scipy',
		'data = json.loads(sys.stdin.read())',
		'out = None'
	].join('\n');
	const epilogue = [
		'def _clean(o):',
		'    if isinstance(o, np.ndarray): return _clean(o.tolist())',
		'    if isinstance(o, (list, tuple)): return [_clean(v) for v in o]',
		'    if isinstance(o, dict): return {k: _clean(v) for k, v in o.items()}',
		'    if isinstance(o, (np.floating, float)): return float(o) if math.isfinite(float(o)) else None',
		'    if isinstance(o, (np.integer,)): return int(o)',
		'    if isinstance(o, (np.bool_,)): return bool(o)',
		'    return o',
		'sys.stdout.write(json.dumps(_clean(out)))'
	].join('\n');
	// SciPy runs with glibc's default allocator: the huge-page setting the benches give our side
	// (scripts/allocator.mjs) measured slower for SciPy here (RectBivariateSpline.ev 54 → 78 ms), and the
	// reference should be measured at its best, not handicapped
	const { GLIBC_TUNABLES: _ours, ...env } = process.env;
	const r = spawnSync(PYTHON, ['-c', `${prelude}\n${code}\n${epilogue}`], {
		env,
		input: JSON.stringify(data),
		encoding: 'utf8',
		timeout: timeoutMs,
		maxBuffer: 256 * 1024 * 1024
	});
	if (r.status !== 0) throw new Error(`SciPy reference failed: ${r.stderr || r.error}`);
	return JSON.parse(r.stdout) as T;
}
