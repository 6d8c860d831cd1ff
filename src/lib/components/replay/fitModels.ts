// Fetching what the replay and the surface paths draw, on demand and once per
// page: a run's path (from the path API, signed in or through a share token)
// and a fit's file (rebuilt in the browser, so its derivatives are exact).
import { fitFromJSON } from '$lib/numerics/fits/fitCurve';
import { surfaceFromJSON } from '$lib/numerics/fits/surfaceFile';
import type { SurfaceFit } from '$lib/numerics/fits/surfaceTypes';
import type { CurveFit } from '$lib/numerics/fits/types';
import type { ReplayPath } from '$lib/replay/lockstep';

const cache = new Map<string, Promise<unknown>>();

async function getJson(url: string): Promise<unknown> {
	const r = await fetch(url, { headers: { accept: 'application/json' } });
	if (!r.ok) {
		let message = `HTTP ${r.status}`;
		try {
			message = ((await r.json()) as { error?: { message?: string } }).error?.message ?? message;
		} catch {
			/* not JSON: keep the status */
		}
		throw new Error(message);
	}
	return r.json();
}

function once<T>(url: string, read: (json: unknown) => T): Promise<T> {
	let p = cache.get(url) as Promise<T> | undefined;
	if (!p) {
		p = getJson(url).then(read);
		// a failed fetch may be tried again later
		p.catch(() => cache.delete(url));
		cache.set(url, p);
	}
	return p;
}

export const loadPath = (url: string) => once<ReplayPath>(url, (j) => j as ReplayPath);

/** The fit file inside an export document (`{ fit: {…} }`), or a bare fit file as it is. */
const fitBody = (j: unknown): unknown => (j && typeof j === 'object' && 'fit' in j ? (j as { fit: unknown }).fit : j);

/** The curve fit behind an export document or a bare fit file. */
export const loadFit = (url: string) => once<CurveFit>(url, (j) => fitFromJSON(fitBody(j)));

/** The surface fit behind an export document or a bare fit file. */
export const loadSurfaceFit = (url: string) => once<SurfaceFit>(url, (j) => surfaceFromJSON(fitBody(j)));

/** f, f′ and f″ at x, or NaN where the fit refuses x. */
export function jetAt(fit: CurveFit, x: number): { f: number; df: number; d2f: number } {
	if (!Number.isFinite(x)) return { f: NaN, df: NaN, d2f: NaN };
	try {
		return fit.evaluate(x);
	} catch {
		return { f: NaN, df: NaN, d2f: NaN };
	}
}
