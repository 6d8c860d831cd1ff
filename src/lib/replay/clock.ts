/**
 * The replay clock: one shared position in "iterations" that every panel of a
 * replay reads, so paths of different lengths step in lockstep. A path that
 * has already ended holds its last frame.
 *
 * Plain TypeScript, no DOM or framework: the animation driver (requestAnimationFrame
 * in the browser) is injected, and `advance(ms)` moves the clock by elapsed time
 * directly, so tests and the surface map view drive it the same way.
 */

/** Speeds the reader can choose, slowest first. */
export const SPEEDS = [0.5, 1, 2, 4, 8] as const;
export type Speed = (typeof SPEEDS)[number];

/** Iterations per second at 1×. */
export const BASE_RATE = 3;

export interface ClockState {
	/** current frame (an iteration index, 0 … length − 1) */
	frame: number;
	/** position with its fraction, for drawing between frames; equals `frame` when paused */
	position: number;
	/** frames on the clock: the longest path */
	length: number;
	playing: boolean;
	speed: Speed;
	loop: boolean;
}

export interface Driver {
	/** call `cb` with a timestamp in ms at the next display frame; returns a handle for `cancel` */
	request(cb: (now: number) => void): number;
	cancel(handle: number): void;
}

type Listener = (state: Readonly<ClockState>) => void;

const clampInt = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, Math.round(v)));

export class ReplayClock {
	#lengths: number[] = [];
	#length = 1;
	#position = 0;
	#playing = false;
	#speed: Speed = 1;
	#loop = false;
	#driver: Driver | null;
	#handle: number | null = null;
	#last: number | null = null;
	#listeners = new Set<Listener>();

	constructor(options: { lengths?: readonly number[]; speed?: Speed; loop?: boolean; driver?: Driver | null } = {}) {
		this.#driver = options.driver ?? null;
		if (options.speed !== undefined) this.setSpeed(options.speed);
		this.#loop = options.loop ?? false;
		this.setLengths(options.lengths ?? []);
	}

	/** Lengths (frames) of the paths on this clock; the clock runs to the longest. A position past the new end is pulled back. */
	setLengths(lengths: readonly number[]): void {
		for (const l of lengths) if (!Number.isInteger(l) || l < 0) throw new RangeError(`path length must be a whole number ≥ 0, got ${l}`);
		this.#lengths = [...lengths];
		this.#length = Math.max(1, ...lengths);
		if (this.#position > this.#length - 1) this.#position = this.#length - 1;
		this.#emit();
	}

	get lengths(): readonly number[] {
		return this.#lengths;
	}

	get state(): Readonly<ClockState> {
		return { frame: this.frame, position: this.#position, length: this.#length, playing: this.#playing, speed: this.#speed, loop: this.#loop };
	}

	get frame(): number {
		return Math.floor(this.#position + 1e-9);
	}

	get atEnd(): boolean {
		return this.frame >= this.#length - 1;
	}

	/** The frame path `i` shows now: the clock's frame, or its own last frame once it has ended. */
	frameOf(i: number): number {
		const l = this.#lengths[i];
		if (l === undefined) throw new RangeError(`no path ${i} on this clock`);
		return Math.max(0, Math.min(this.frame, l - 1));
	}

	/** Position of path `i` with its fraction (for drawing between frames); held at its end once ended. */
	positionOf(i: number): number {
		const l = this.#lengths[i];
		if (l === undefined) throw new RangeError(`no path ${i} on this clock`);
		return Math.max(0, Math.min(this.#position, l - 1));
	}

	/** Whether path `i` has shown its last frame. */
	ended(i: number): boolean {
		const l = this.#lengths[i];
		if (l === undefined) throw new RangeError(`no path ${i} on this clock`);
		return this.frame >= l - 1;
	}

	subscribe(listener: Listener): () => void {
		this.#listeners.add(listener);
		listener(this.state);
		return () => this.#listeners.delete(listener);
	}

	play(): void {
		if (this.#playing) return;
		// playing from the end starts again from the first frame
		if (this.atEnd) this.#position = 0;
		if (this.#length <= 1) return;
		this.#playing = true;
		this.#last = null;
		this.#schedule();
		this.#emit();
	}

	pause(): void {
		if (!this.#playing) return;
		this.#playing = false;
		this.#position = this.frame;
		this.#unschedule();
		this.#emit();
	}

	toggle(): void {
		if (this.#playing) this.pause();
		else this.play();
	}

	/** Move by whole frames (negative: back); pauses. */
	step(delta: number): void {
		this.#stop();
		this.#position = clampInt(this.frame + delta, 0, this.#length - 1);
		this.#emit();
	}

	/** Jump to a frame (clamped to the clock); pauses. */
	seek(frame: number): void {
		if (!Number.isFinite(frame)) throw new RangeError(`frame must be a number, got ${frame}`);
		this.#stop();
		this.#position = clampInt(frame, 0, this.#length - 1);
		this.#emit();
	}

	/** Scrub to a fraction 0 … 1 of the clock; keeps playing if it was. */
	scrub(fraction: number): void {
		if (!Number.isFinite(fraction)) throw new RangeError(`fraction must be a number, got ${fraction}`);
		const f = Math.min(1, Math.max(0, fraction));
		this.#position = Math.round(f * (this.#length - 1));
		this.#last = null;
		this.#emit();
	}

	toStart(): void {
		this.seek(0);
	}

	toEnd(): void {
		this.seek(this.#length - 1);
	}

	setSpeed(speed: number): void {
		if (!(SPEEDS as readonly number[]).includes(speed)) throw new RangeError(`speed must be one of ${SPEEDS.join(', ')}, got ${speed}`);
		this.#speed = speed as Speed;
		this.#emit();
	}

	/** One speed up (`+1`) or down (`−1`), stopping at 0.5× and 8×. */
	changeSpeed(direction: 1 | -1): void {
		const i = SPEEDS.indexOf(this.#speed) + direction;
		this.setSpeed(SPEEDS[Math.min(SPEEDS.length - 1, Math.max(0, i))]);
	}

	setLoop(loop: boolean): void {
		this.#loop = loop;
		this.#emit();
	}

	/**
	 * Move the clock on by `ms` of playing time. At the end it wraps to the first
	 * frame when looping, else it stops on the last frame.
	 */
	advance(ms: number): void {
		if (!this.#playing || !(ms > 0)) return;
		const end = this.#length - 1;
		let p = this.#position + (ms / 1000) * BASE_RATE * this.#speed;
		if (p >= end) {
			if (this.#loop) p = end > 0 ? p % (end + 1) : 0;
			else {
				p = end;
				this.#playing = false;
				this.#unschedule();
			}
		}
		this.#position = p;
		this.#emit();
	}

	/** Stop the driver and forget the listeners (the component is going away). */
	dispose(): void {
		this.#playing = false;
		this.#unschedule();
		this.#listeners.clear();
	}

	#stop() {
		this.#playing = false;
		this.#unschedule();
	}

	#schedule() {
		if (!this.#driver || this.#handle !== null) return;
		this.#handle = this.#driver.request((now) => {
			this.#handle = null;
			if (!this.#playing) return;
			// the first display frame after play only sets the time base
			if (this.#last !== null) this.advance(Math.min(now - this.#last, 250));
			this.#last = now;
			if (this.#playing) this.#schedule();
		});
	}

	#unschedule() {
		if (this.#handle !== null) this.#driver?.cancel(this.#handle);
		this.#handle = null;
		this.#last = null;
	}

	#emit() {
		if (!this.#listeners.size) return;
		const s = this.state;
		for (const l of this.#listeners) l(s);
	}
}

/** The browser's display-frame driver (none on the server). */
export function animationFrameDriver(): Driver | null {
	if (typeof requestAnimationFrame !== 'function') return null;
	return { request: (cb) => requestAnimationFrame(cb), cancel: (h) => cancelAnimationFrame(h) };
}
