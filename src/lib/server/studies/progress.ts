// One poller for every open progress stream of this process: while anyone
// listens, the listened-to studies are read in one query every POLL_MS and
// each listener hears its study's state when it changes.
import { db } from '../db';
import { progressOf, type Progress } from './store';

const POLL_MS = 400;
type Listener = (p: Progress) => void;
const listeners = new Map<string, Set<Listener>>();
const last = new Map<string, string>();
let timer: NodeJS.Timeout | null = null;

async function tick() {
	const ids = [...listeners.keys()];
	if (!ids.length) return;
	try {
		for (const p of await progressOf(db(), ids)) {
			const key = JSON.stringify(p);
			if (last.get(p.id) === key) continue;
			last.set(p.id, key);
			for (const fn of listeners.get(p.id) ?? []) fn(p);
		}
	} catch (e) {
		console.error('kinkless: progress poll failed:', (e as Error).message);
	}
}

/** Listen to a study's progress; returns the unsubscribe function. The first call delivers the current state. */
export function watch(id: string, fn: Listener): () => void {
	let set = listeners.get(id);
	if (!set) listeners.set(id, (set = new Set()));
	set.add(fn);
	void progressOf(db(), [id]).then(([p]) => p && fn(p));
	timer ??= setInterval(tick, POLL_MS);
	return () => {
		set!.delete(fn);
		if (!set!.size) {
			listeners.delete(id);
			last.delete(id);
		}
		if (!listeners.size && timer) {
			clearInterval(timer);
			timer = null;
		}
	};
}
