// The one live source of a study's status for its whole page: Server-Sent
// Events (members) or polling (share links) while the study runs; when it
// ends, the page's data are loaded again. The badge and the progress panel
// both read this object.
import { invalidateAll } from '$app/navigation';
import { isActive } from '$lib/domain/lifecycle';
import type { StudyStatus } from '$lib/domain/lifecycle';

export type Live = { status: StudyStatus; done: number; total: number; audits: { done: number; total: number }; error?: string | null };

export function liveStatus(initial: () => Live, urls: () => { eventsUrl: string | null; pollUrl: string | null }) {
	const live = $state<Live>({ ...initial() });
	// the page's data (reloaded after the end, or on navigation) win over the stream
	$effect.pre(() => {
		Object.assign(live, initial());
	});
	$effect(() => {
		const ended = (s: StudyStatus) => !isActive(s);
		const { eventsUrl, pollUrl } = urls();
		if (ended(initial().status)) return;
		if (eventsUrl) {
			const source = new EventSource(eventsUrl);
			source.addEventListener('progress', (e) => Object.assign(live, JSON.parse((e as MessageEvent).data)));
			source.addEventListener('end', (e) => {
				Object.assign(live, JSON.parse((e as MessageEvent).data));
				source.close();
				void invalidateAll();
			});
			return () => source.close();
		}
		if (pollUrl) {
			let stopped = false;
			const tick = async () => {
				if (stopped) return;
				try {
					const r = await fetch(pollUrl);
					if (r.ok) {
						const s = await r.json();
						Object.assign(live, { status: s.status, done: s.progress.done, total: s.progress.total, audits: s.audits, error: s.error });
						if (ended(s.status)) {
							void invalidateAll();
							return;
						}
					}
				} catch {
					// try again on the next tick
				}
				setTimeout(tick, 2000);
			};
			setTimeout(tick, 2000);
			return () => (stopped = true);
		}
	});
	return live;
}
