/**
 * A fixed set of worker threads, one task at a time each. A thread that dies
 * (crash, out of memory, terminated after its time ran out) rejects its task
 * and is replaced, so the caller can hand the job back to the queue for a
 * retry.
 */
import { Worker } from 'node:worker_threads';

/** A task whose thread ran out of time (`timeout`) or died under it (`died`: crash, exit, out of memory). */
export class ThreadLost extends Error {
	constructor(
		readonly kind: 'timeout' | 'died',
		message: string
	) {
		super(message);
	}
}

type Pending = { resolve: (v: unknown) => void; reject: (e: Error) => void; timer: NodeJS.Timeout | null };
type Slot = { worker: Worker; busy: Pending | null; ready: Promise<void>; dead: boolean };
type Queued = { task: unknown; timeoutMs: number } & Pending;

export class ThreadPool {
	private slots: Slot[] = [];
	private queue: Queued[] = [];
	private closed = false;
	/** tasks given to threads that then died or ran out of time */
	lost = 0;

	constructor(
		private readonly script: string | URL,
		size: number,
		private readonly workerData: unknown = undefined,
		private readonly log: (msg: string) => void = (m) => console.error(m),
		private readonly opts: { name?: string; resourceLimits?: import('node:worker_threads').ResourceLimits } = {}
	) {
		for (let i = 0; i < size; i++) this.slots.push(this.spawn());
	}

	get size(): number {
		return this.slots.length;
	}

	/** resolves when every thread has loaded its code */
	ready(): Promise<void> {
		return Promise.all(this.slots.map((s) => s.ready)).then(() => undefined);
	}

	private spawn(): Slot {
		const worker = new Worker(this.script, { workerData: this.workerData, ...(this.opts.resourceLimits ? { resourceLimits: this.opts.resourceLimits } : {}) });
		let markReady: () => void = () => {};
		const slot: Slot = { worker, busy: null, ready: new Promise<void>((r) => (markReady = r)), dead: false };
		worker.on('message', (m: { ready?: true; ok?: boolean; result?: unknown; error?: string }) => {
			if (m.ready) {
				markReady();
				return;
			}
			const p = slot.busy;
			if (!p) return;
			slot.busy = null;
			if (p.timer) clearTimeout(p.timer);
			if (m.ok) p.resolve(m.result);
			else p.reject(new Error(m.error ?? 'the worker thread failed'));
			this.next(slot);
		});
		const died = (why: string) => {
			slot.dead = true;
			markReady();
			const i = this.slots.indexOf(slot);
			const p = slot.busy;
			slot.busy = null;
			if (p) {
				if (p.timer) clearTimeout(p.timer);
				this.lost++;
				p.reject(new ThreadLost('died', why));
			}
			if (this.closed || i < 0) return;
			this.log(`kinkless: ${this.opts.name ?? 'study thread'} ${why}; starting a new one`);
			const fresh = this.spawn();
			this.slots[i] = fresh;
			this.next(fresh);
		};
		worker.on('error', (e) => died(`crashed: ${e.message}`));
		worker.on('exit', (code) => {
			if (this.slots.includes(slot)) died(`exited (code ${code})`);
		});
		return slot;
	}

	run<R>(task: unknown, timeoutMs: number): Promise<R> {
		if (this.closed) return Promise.reject(new Error('the thread pool is closed'));
		return new Promise<R>((resolve, reject) => {
			this.queue.push({ task, timeoutMs, resolve: resolve as (v: unknown) => void, reject, timer: null });
			const idle = this.slots.find((s) => !s.busy && !s.dead);
			if (idle) this.next(idle);
		});
	}

	private next(slot: Slot): void {
		if (slot.busy || slot.dead || this.closed) return;
		const q = this.queue.shift();
		if (!q) return;
		slot.busy = q;
		slot.worker.postMessage(q.task);
		// the time budget counts from when the thread has loaded its code, not from a fresh thread's start-up
		void slot.ready.then(() => {
			if (slot.busy !== q || slot.dead) return;
			q.timer = setTimeout(() => {
				// a task past its time: the thread may be stuck; replace it
				slot.dead = true;
				void slot.worker.terminate();
				if (slot.busy === q) {
					slot.busy = null;
					this.lost++;
					q.reject(new ThreadLost('timeout', `timed out after ${Math.round(q.timeoutMs / 1000)} s`));
				}
			}, q.timeoutMs);
		});
	}

	/** Terminate one thread (its task is rejected, a new thread replaces it). */
	terminateOne(index = 0): Promise<number> {
		return this.slots[index].worker.terminate();
	}

	async close(): Promise<void> {
		this.closed = true;
		for (const q of this.queue.splice(0)) q.reject(new Error('the thread pool is closed'));
		await Promise.all(this.slots.map((s) => s.worker.terminate()));
	}
}
