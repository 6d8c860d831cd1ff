// The replay's keys, each checked against what the clock does (common
// practice, no outside source: the key map is our own design).
import { describe, expect, it } from 'vitest';
import { ReplayClock } from '$lib/replay/clock';
import { replayKey } from '$lib/replay/keys';

const clock = () => new ReplayClock({ lengths: [5, 12, 8] });

describe('replay keys', () => {
	it('→ and ← step one iteration, clamped; Home and End jump to the ends of the longest path', () => {
		const c = clock();
		expect(replayKey(c, 'ArrowRight')).toBe(true);
		expect(replayKey(c, 'ArrowRight')).toBe(true);
		expect(c.frame).toBe(2);
		expect(replayKey(c, 'ArrowLeft')).toBe(true);
		expect(c.frame).toBe(1);
		replayKey(c, 'End');
		expect(c.frame).toBe(11);
		// an ended shorter path holds its own last frame
		expect([c.frameOf(0), c.frameOf(1), c.frameOf(2)]).toEqual([4, 11, 7]);
		replayKey(c, 'ArrowRight');
		expect(c.frame).toBe(11);
		replayKey(c, 'Home');
		expect(c.frame).toBe(0);
		replayKey(c, 'ArrowLeft');
		expect(c.frame).toBe(0);
	});

	it('Space plays and pauses; [ and ] change speed one notch, stopping at 0.5× and 8×', () => {
		const c = clock();
		replayKey(c, ' ');
		expect(c.state.playing).toBe(true);
		replayKey(c, ' ');
		expect(c.state.playing).toBe(false);
		for (let i = 0; i < 6; i++) replayKey(c, ']');
		expect(c.state.speed).toBe(8);
		replayKey(c, '[');
		expect(c.state.speed).toBe(4);
		for (let i = 0; i < 6; i++) replayKey(c, '[');
		expect(c.state.speed).toBe(0.5);
	});

	it('leaves keys to text fields and lists, and arrows/Home/End to the scrubber, which still takes Space and brackets', () => {
		const c = clock();
		for (const target of [{ tagName: 'INPUT', type: 'text' }, { tagName: 'TEXTAREA' }, { tagName: 'SELECT' }, { tagName: 'DIV', isContentEditable: true }]) {
			expect(replayKey(c, 'ArrowRight', target)).toBe(false);
			expect(replayKey(c, ' ', target)).toBe(false);
		}
		const scrubber = { tagName: 'INPUT', type: 'range' };
		expect(replayKey(c, 'ArrowRight', scrubber)).toBe(false);
		expect(replayKey(c, 'End', scrubber)).toBe(false);
		expect(c.frame).toBe(0);
		expect(replayKey(c, ']', scrubber)).toBe(true);
		expect(c.state.speed).toBe(2);
		// a button or a checkbox in the replay does not own the keys
		expect(replayKey(c, 'ArrowRight', { tagName: 'BUTTON' })).toBe(true);
		expect(replayKey(c, 'ArrowRight', { tagName: 'INPUT', type: 'checkbox' })).toBe(true);
		expect(c.frame).toBe(2);
	});

	it('ignores other keys and keys with Ctrl, Meta or Alt (the browser’s own shortcuts)', () => {
		const c = clock();
		expect(replayKey(c, 'a')).toBe(false);
		expect(replayKey(c, 'ArrowRight', null, { ctrl: true })).toBe(false);
		expect(replayKey(c, 'End', null, { meta: true })).toBe(false);
		expect(replayKey(c, ' ', null, { alt: true })).toBe(false);
		expect(c.frame).toBe(0);
		expect(c.state.playing).toBe(false);
	});
});
