/**
 * The replay's keys: Space plays and pauses, ← and → step one iteration, Home
 * and End jump to the first and the last, [ and ] slow down and speed up. A key
 * pressed in a text field, a list or the scrubber (which moves itself with the
 * arrows, Home and End) is left to that control.
 */
import type { ReplayClock } from './clock';

export interface KeyTarget {
	tagName?: string;
	type?: string;
	isContentEditable?: boolean;
}

/** The keys and what they do, for the page's help line. */
export const REPLAY_KEYS: readonly [string, string][] = [
	['Space', 'play or pause'],
	['← →', 'step one iteration'],
	['Home End', 'first or last iteration'],
	['[ ]', 'slower or faster']
];

function ownsKey(t: KeyTarget | null, key: string): boolean {
	if (!t) return false;
	if (t.isContentEditable) return true;
	const tag = (t.tagName ?? '').toUpperCase();
	if (tag === 'TEXTAREA' || tag === 'SELECT') return true;
	if (tag === 'INPUT') {
		// the scrubber keeps its own arrows, Home and End; Space and the brackets still drive the clock
		if (t.type === 'range') return key !== ' ' && key !== '[' && key !== ']';
		return t.type !== 'checkbox' && t.type !== 'radio' && t.type !== 'button';
	}
	return false;
}

/** Act on one key press; true when the key was the replay's (the caller then prevents its default). */
export function replayKey(clock: ReplayClock, key: string, target: KeyTarget | null = null, mods: { ctrl?: boolean; meta?: boolean; alt?: boolean } = {}): boolean {
	if (mods.ctrl || mods.meta || mods.alt) return false;
	if (ownsKey(target, key)) return false;
	switch (key) {
		case ' ':
		case 'Spacebar':
			clock.toggle();
			return true;
		case 'ArrowLeft':
			clock.step(-1);
			return true;
		case 'ArrowRight':
			clock.step(1);
			return true;
		case 'Home':
			clock.toStart();
			return true;
		case 'End':
			clock.toEnd();
			return true;
		case '[':
			clock.changeSpeed(-1);
			return true;
		case ']':
			clock.changeSpeed(1);
			return true;
	}
	return false;
}
