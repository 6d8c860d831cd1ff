// The replay clock: stepping, scrubbing, speed, loop and lockstep of paths of
// different lengths. Expected frames follow from the clock's definition
// (BASE_RATE iterations per second at 1×); common practice, no outside source.
import { describe, expect, it } from 'vitest';
import { BASE_RATE, ReplayClock, SPEEDS, type Driver } from '$lib/replay/clock';

/** A hand-cranked display-frame driver: `frame(t)` runs what was requested, at time t ms. */
function manualDriver() {
	let next: ((now: number) => void) | null = null;
	let handles = 0;
	const driver: Driver = {
		request(cb) {
			next = cb;
			return ++handles;
		},
		cancel() {
			next = null;
		}
	};
	return {
		driver,
		frame(now: number) {
			const cb = next;
			next = null;
			cb?.(now);
		},
		/** display frames every 16 ms from `from` to `to` (inclusive) */
		run(from: number, to: number) {
			for (let t = from; t < to; t += 16) this.frame(t);
			this.frame(to);
		},
		get pending() {
			return next !== null;
		}
	};
}

describe('replay clock: stepping', () => {
	it('steps forward and back one frame at a time, clamped to the longest path', () => {
		const c = new ReplayClock({ lengths: [4, 7] });
		expect(c.state.length).toBe(7);
		expect(c.frame).toBe(0);
		c.step(-1);
		expect(c.frame).toBe(0);
		for (let i = 1; i <= 6; i++) {
			c.step(1);
			expect(c.frame).toBe(i);
		}
		c.step(1);
		expect(c.frame).toBe(6);
		expect(c.atEnd).toBe(true);
		c.step(-2);
		expect(c.frame).toBe(4);
		c.toStart();
		expect(c.frame).toBe(0);
		c.toEnd();
		expect(c.frame).toBe(6);
	});

	it('a step pauses a playing clock on a whole frame', () => {
		const m = manualDriver();
		const c = new ReplayClock({ lengths: [50], driver: m.driver });
		c.play();
		m.run(0, 500); // half a second at 1×
		expect(c.state.position).toBeCloseTo(0.5 * BASE_RATE, 12);
		c.step(1);
		expect(c.state.playing).toBe(false);
		expect(c.frame).toBe(Math.floor(0.5 * BASE_RATE) + 1);
		expect(c.state.position).toBe(c.frame);
		expect(m.pending).toBe(false);
	});

	it('refuses lengths and frames that are not numbers', () => {
		expect(() => new ReplayClock({ lengths: [3, -1] })).toThrow(RangeError);
		expect(() => new ReplayClock({ lengths: [2.5] })).toThrow(/whole number/);
		const c = new ReplayClock({ lengths: [3] });
		expect(() => c.seek(NaN)).toThrow(RangeError);
		expect(() => c.scrub(Infinity)).toThrow(RangeError);
		expect(() => c.frameOf(1)).toThrow(/no path 1/);
	});
});

describe('replay clock: scrubbing and seeking', () => {
	it('maps a fraction of the scrubber to the nearest frame, clamped to 0…1', () => {
		const c = new ReplayClock({ lengths: [11] });
		c.scrub(0.5);
		expect(c.frame).toBe(5);
		c.scrub(0.26);
		expect(c.frame).toBe(3); // 2.6 → 3
		c.scrub(1);
		expect(c.frame).toBe(10);
		c.scrub(-3);
		expect(c.frame).toBe(0);
		c.scrub(7);
		expect(c.frame).toBe(10);
	});

	it('seeks to a frame, rounding and clamping', () => {
		const c = new ReplayClock({ lengths: [5] });
		c.seek(2.4);
		expect(c.frame).toBe(2);
		c.seek(99);
		expect(c.frame).toBe(4);
		c.seek(-5);
		expect(c.frame).toBe(0);
	});

	it('scrubbing while playing keeps playing from the new place', () => {
		const m = manualDriver();
		const c = new ReplayClock({ lengths: [101], driver: m.driver });
		c.play();
		m.frame(0);
		c.scrub(0.5);
		expect(c.frame).toBe(50);
		expect(c.state.playing).toBe(true);
		m.frame(1000); // first frame after a scrub sets the time base again
		expect(c.frame).toBe(50);
		m.run(1016, 2000);
		expect(c.frame).toBe(50 + BASE_RATE);
	});

	it('shorter lengths pull the position back inside the clock', () => {
		const c = new ReplayClock({ lengths: [20] });
		c.seek(15);
		c.setLengths([6, 3]);
		expect(c.frame).toBe(5);
		c.setLengths([]);
		expect(c.state.length).toBe(1);
		expect(c.frame).toBe(0);
	});
});

describe('replay clock: lockstep of paths of different lengths', () => {
	it('every path shows the shared frame until it ends, then holds its last frame', () => {
		const lengths = [3, 8, 5, 1];
		const c = new ReplayClock({ lengths });
		const seen: number[][] = [];
		for (let k = 0; k < 8; k++) {
			if (k) c.step(1);
			seen.push(lengths.map((_, i) => c.frameOf(i)));
		}
		expect(seen).toEqual([
			[0, 0, 0, 0],
			[1, 1, 1, 0],
			[2, 2, 2, 0],
			[2, 3, 3, 0],
			[2, 4, 4, 0],
			[2, 5, 4, 0],
			[2, 6, 4, 0],
			[2, 7, 4, 0]
		]);
		// ended: from the frame each path shows its last one
		c.seek(2);
		expect(lengths.map((_, i) => c.ended(i))).toEqual([true, false, false, true]);
		c.toEnd();
		expect(lengths.map((_, i) => c.ended(i))).toEqual([true, true, true, true]);
	});

	it('positions with fractions stop at each path’s end while the clock plays on', () => {
		const m = manualDriver();
		const c = new ReplayClock({ lengths: [2, 10], driver: m.driver, speed: 1 });
		c.play();
		m.run(0, 1000); // BASE_RATE frames in one second
		expect(c.positionOf(0)).toBe(1);
		expect(c.positionOf(1)).toBeCloseTo(BASE_RATE, 9);
		expect(c.ended(0)).toBe(true);
		expect(c.ended(1)).toBe(false);
	});

	it('an empty path (no iterations) shows frame 0 and counts as ended', () => {
		const c = new ReplayClock({ lengths: [0, 4] });
		c.step(2);
		expect(c.frameOf(0)).toBe(0);
		expect(c.ended(0)).toBe(true);
		expect(c.frameOf(1)).toBe(2);
	});
});

describe('replay clock: playing, speed and loop', () => {
	it('plays at BASE_RATE × speed frames per second and stops on the last frame', () => {
		for (const speed of SPEEDS) {
			const m = manualDriver();
			const c = new ReplayClock({ lengths: [1000], driver: m.driver, speed });
			c.play();
			m.frame(100);
			for (let t = 116; t <= 1100; t += 16) m.frame(t);
			m.frame(1100);
			expect(c.state.position).toBeCloseTo(BASE_RATE * speed, 9);
			c.dispose();
		}
		const m = manualDriver();
		const c = new ReplayClock({ lengths: [4], driver: m.driver, speed: 8 });
		c.play();
		m.run(0, 200); // 4.8 frames at 8× would pass the end
		expect(c.frame).toBe(3);
		expect(c.state.playing).toBe(false);
		expect(m.pending).toBe(false);
	});

	it('one long display frame (a background tab) moves at most 250 ms', () => {
		const m = manualDriver();
		const c = new ReplayClock({ lengths: [1000], driver: m.driver });
		c.play();
		m.frame(0);
		m.frame(60_000);
		expect(c.state.position).toBeCloseTo(0.25 * BASE_RATE, 12);
	});

	it('speeds step through 0.5× … 8× and stop at either end', () => {
		const c = new ReplayClock({ lengths: [3] });
		expect(c.state.speed).toBe(1);
		c.changeSpeed(-1);
		expect(c.state.speed).toBe(0.5);
		c.changeSpeed(-1);
		expect(c.state.speed).toBe(0.5);
		for (let i = 0; i < 6; i++) c.changeSpeed(1);
		expect(c.state.speed).toBe(8);
		expect(() => c.setSpeed(3)).toThrow(/speed must be one of/);
	});

	it('looping wraps to the first frame instead of stopping', () => {
		const c = new ReplayClock({ lengths: [5], loop: true });
		c.play();
		c.advance((1000 * 4) / BASE_RATE); // exactly to the last frame
		expect(c.frame).toBe(4);
		expect(c.state.playing).toBe(true);
		c.advance((1000 * 1.5) / BASE_RATE);
		expect(c.frame).toBe(0);
		expect(c.state.position).toBeCloseTo(0.5, 9);
		c.setLoop(false);
		c.advance((1000 * 10) / BASE_RATE);
		expect(c.frame).toBe(4);
		expect(c.state.playing).toBe(false);
	});

	it('play at the end starts over; pause rests on a whole frame; toggle alternates', () => {
		const c = new ReplayClock({ lengths: [6] });
		c.toEnd();
		c.play();
		expect(c.frame).toBe(0);
		c.advance(1000 / BASE_RATE / 2);
		expect(c.state.position).toBeCloseTo(0.5, 9);
		c.toggle();
		expect(c.state.playing).toBe(false);
		expect(c.state.position).toBe(0);
		c.toggle();
		expect(c.state.playing).toBe(true);
		// a single-frame clock has nothing to play
		const one = new ReplayClock({ lengths: [1] });
		one.play();
		expect(one.state.playing).toBe(false);
	});

	it('tells listeners of every change and stops after unsubscribe', () => {
		const c = new ReplayClock({ lengths: [5] });
		const frames: number[] = [];
		const off = c.subscribe((s) => frames.push(s.frame));
		c.step(1);
		c.step(1);
		c.seek(4);
		off();
		c.step(-1);
		expect(frames).toEqual([0, 1, 2, 4]);
	});
});
