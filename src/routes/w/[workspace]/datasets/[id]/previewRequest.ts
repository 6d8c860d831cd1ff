// What the curve and the surface fit previews share: the debounced request to
// the fit-preview route (a newer request cancels an older one) and the way the
// audit's numbers are written.

/** How long the settings must rest before a preview is asked for, by default. */
const DEBOUNCE_MS = 300;

export interface PreviewHandlers<T> {
	loading(on: boolean): void;
	answer(preview: T): void;
	problem(message: string): void;
}

/**
 * POST `body` to the dataset's fit-preview route after `delayMs`. Returns
 * the clean-up for a Svelte `$effect`: it cancels the wait and the request.
 */
export function requestPreview<T>(datasetId: string, body: string, on: PreviewHandlers<T>, delayMs = DEBOUNCE_MS): () => void {
	const controller = new AbortController();
	const timer = setTimeout(async () => {
		on.loading(true);
		try {
			const res = await fetch(`/api/v1/datasets/${datasetId}/fit-preview`, { method: 'POST', headers: { 'content-type': 'application/json' }, body, signal: controller.signal });
			const answer = await res.json();
			if (res.ok) on.answer(answer as T);
			else on.problem(answer?.error?.message ?? `the preview failed (${res.status})`);
		} catch (e) {
			if (!controller.signal.aborted) on.problem(`the preview could not be fetched (${e instanceof Error ? e.message : String(e)})`);
		} finally {
			if (!controller.signal.aborted) on.loading(false);
		}
	}, delayMs);
	return () => {
		clearTimeout(timer);
		controller.abort();
	};
}

/** An audit number: four significant digits, exponent form when very large or small, "—" when missing. */
export function auditNumber(v: number | null | undefined): string {
	if (v === null || v === undefined || !Number.isFinite(v)) return '—';
	const a = Math.abs(v);
	return a !== 0 && (a >= 1e5 || a < 1e-3) ? v.toExponential(2) : Number(v.toPrecision(4)).toString();
}
