// What a lockstep replay opens with and keeps, for every replay on the study
// page: the curve replay (ReplayView) and the map view of studies over two or
// more inputs (SurfacePaths). One clock, at the first iteration when the view
// opens and again whenever the optimizer or the start changes; the first
// optimizer and the start where the fits disagree most (`tellingStart`); the
// shown runs' paths fetched on demand, once; the clock's lengths set when they
// are all there; the keys anywhere in the view's region; the reader's wish for
// less motion; and what a screen reader hears after a step.
import { untrack } from 'svelte';
import type { RunRow } from '$lib/domain/wire';
import { animationFrameDriver, ReplayClock } from '$lib/replay/clock';
import { replayKey } from '$lib/replay/keys';
import { lockstepRuns, startsOf, tellingStart, type ReplayPath } from '$lib/replay/lockstep';
import { loadPath } from './fitModels';

export interface ReplaySource {
	runs: () => RunRow[];
	/** the fits' ids, in the order their panels are drawn */
	fitIds: () => string[];
	pathUrl: (runId: string) => string;
	/** the runs on the clock (default: the lockstep runs of the chosen start and optimizer) */
	shown?: () => RunRow[];
	/** anything else the panels wait for before the clock is set (the fit files, say) */
	ready?: () => boolean;
	/** a run's name in messages (its fit's method) */
	nameOf: (run: RunRow) => string;
}

export class ReplaySession {
	readonly clock = new ReplayClock({ driver: animationFrameDriver() });
	optimizerIndex = $state(0);
	startIndex = $state(0);
	/** the clock's frame and whether it plays, for what Svelte renders (the moving layers follow the clock itself) */
	frame = $state(0);
	playing = $state(false);
	reducedMotion = $state(false);
	paths = $state<Record<string, ReplayPath>>({});
	problems = $state<string[]>([]);
	readonly #src: ReplaySource;

	readonly starts = $derived.by(() => startsOf(this.#src.runs()));
	readonly lockstep = $derived.by(() => lockstepRuns(this.#src.runs(), this.#src.fitIds(), this.startIndex, this.optimizerIndex));
	readonly shown = $derived.by(() => (this.#src.shown ? this.#src.shown() : this.lockstep));
	readonly pathsReady = $derived.by(() => this.shown.length > 0 && this.shown.every((r) => this.paths[r.id]));
	readonly ready = $derived.by(() => this.pathsReady && (this.#src.ready?.() ?? true));

	/** Call while a component initialises (it sets up effects that end with the component). */
	constructor(src: ReplaySource) {
		this.#src = src;
		this.startIndex = tellingStart(untrack(src.runs), 0) ?? 0;
		const clock = this.clock;
		$effect(() => () => clock.dispose());
		$effect(() => {
			if (typeof matchMedia !== 'function') return;
			const q = matchMedia('(prefers-reduced-motion: reduce)');
			this.reducedMotion = q.matches;
			const on = () => (this.reducedMotion = q.matches);
			q.addEventListener('change', on);
			return () => q.removeEventListener('change', on);
		});
		$effect(() =>
			untrack(() =>
				clock.subscribe((s) => {
					if (s.frame !== this.frame) this.frame = s.frame;
					if (s.playing !== this.playing) this.playing = s.playing;
				})
			)
		);
		// the shown runs' paths, each fetched once
		$effect(() => {
			for (const r of this.shown)
				if (!untrack(() => this.paths[r.id]))
					loadPath(src.pathUrl(r.id)).then(
						(p) => {
							this.paths[r.id] = p;
						},
						(e: Error) => void (this.problems = [...this.problems, `the path of the ${src.nameOf(r)} run: ${e.message}`])
					);
		});
		// the clock runs to the longest shown path; where it stands is left as it is
		$effect(() => {
			if (!this.ready) return;
			const lengths = this.shown.map((r) => this.lengthOf(r));
			untrack(() => clock.setLengths(lengths));
		});
	}

	/** Frames of a shown run's path (its iterations and the start), before its path is there too. */
	lengthOf(r: RunRow): number {
		return this.paths[r.id]?.f.length ?? r.iterations + 1;
	}

	/** Whether run `r` has shown its last iterate. */
	ended(r: RunRow): boolean {
		return this.frame >= this.lengthOf(r) - 1;
	}

	/** The iteration run `r` shows now (held at its end once it has ended). */
	iterationOf(r: RunRow): number {
		return Math.min(this.frame, this.lengthOf(r) - 1);
	}

	/** Another optimizer or start: the clock goes back to the first iteration. */
	choose(pick: { optimizerIndex?: number; startIndex?: number }): void {
		if (pick.optimizerIndex !== undefined) this.optimizerIndex = pick.optimizerIndex;
		if (pick.startIndex !== undefined) this.startIndex = pick.startIndex;
		this.clock.toStart();
	}

	/** Where each shown run is, for a screen reader after a step (nothing while playing, which would never stop talking). */
	get announcement(): string {
		if (!this.ready || this.playing) return '';
		const where = this.shown.map((r) => (this.ended(r) ? `${this.#src.nameOf(r)} ended ${r.outcome}${r.atKink ? ' at a kink' : ''}` : `${this.#src.nameOf(r)} at iteration ${this.frame} of ${r.iterations}`));
		return `Iteration ${this.frame}: ${where.join('; ')}.`;
	}

	/** The replay's keys anywhere in the region this is attached to (see $lib/replay/keys). */
	readonly keys = (node: HTMLElement) => {
		const clock = this.clock;
		const down = (e: KeyboardEvent) => {
			if (replayKey(clock, e.key, e.target as HTMLElement, { ctrl: e.ctrlKey, meta: e.metaKey, alt: e.altKey })) e.preventDefault();
		};
		// Space on a focused button would also click it on key-up
		const up = (e: KeyboardEvent) => {
			if (e.key === ' ' && (e.target as HTMLElement).tagName === 'BUTTON') e.preventDefault();
		};
		// a click on a chart or a label keeps the keys here (focus would otherwise fall to the page)
		const press = (e: PointerEvent) => {
			if (!(e.target as HTMLElement).closest('button, input, select, a, label, textarea')) node.focus({ preventScroll: true });
		};
		node.addEventListener('keydown', down);
		node.addEventListener('keyup', up);
		node.addEventListener('pointerdown', press);
		return () => {
			node.removeEventListener('keydown', down);
			node.removeEventListener('keyup', up);
			node.removeEventListener('pointerdown', press);
		};
	};
}
