/**
 * Run: the bookkeeping every optimizer shares — fair evaluation counting,
 * budgets (iterations, evaluations, wall time), refusals outside the domain,
 * the sign flip for `maximize`, the least-squares form of `solve`, the path,
 * and the assembly of the result. An optimizer ends a run by throwing the
 * private `Stop` sentinel through `run.stop(...)`; `run.guard` turns it into a
 * RunResult. Because the sentinel is thrown from inside `evaluate`, it also
 * stops third-party loops (fmin) that call the objective.
 */
import { allFinite, EPS, norm2, normInf } from './linalg';
import type {
	Evaluation,
	Evaluations,
	IterationRecord,
	KktResiduals,
	Multipliers,
	OptimizeOptions,
	OptimizerName,
	Outcome,
	Path,
	Problem,
	ProblemKind,
	RunResult
} from './types';

/** Options with every default filled in. */
export interface Settings {
	gradTol: number;
	stepTol: number;
	fTol: number;
	feasTol: number;
	residualTol: number;
	maxIterations: number;
	maxEvaluations: number;
	maxMilliseconds: number;
	clock: () => number;
	onIteration: ((record: IterationRecord) => void | boolean) | null;
	secondOrderCheck: boolean;
}

export const DEFAULT_SETTINGS: Omit<Settings, 'clock' | 'onIteration'> = {
	gradTol: 1e-8,
	stepTol: 1e-12,
	fTol: 1e-14,
	feasTol: 1e-8,
	residualTol: 1e-10,
	maxIterations: 1000,
	maxEvaluations: 10000,
	maxMilliseconds: 10000,
	secondOrderCheck: true
};

/** how close to a bound an input counts as on it, relative to max(1, |bound|) (common practice, no source) */
const BOUND_SLACK = 1e-10;

/** smallest gradTol honoured: about ten units of rounding (relative to the gradient scale) */
export const MIN_GRAD_TOL = 1e-15;
/** smallest step, f, feasibility and residual tolerance honoured (relative ones lose meaning below ε) */
export const MIN_TOL = 1e-16;

function defaultClock(): () => number {
	const perf = (globalThis as { performance?: { now(): number } }).performance;
	return perf && typeof perf.now === 'function' ? () => perf.now() : () => Date.now();
}

/** The private sentinel: never exported beyond this module. */
class Stop extends Error {
	constructor(
		readonly outcome: Outcome,
		readonly reason: string,
		readonly point: Point | null
	) {
		super(reason);
	}
}

/** How the user's objective is turned into the function the optimizer minimizes. */
type Mode = 'min' | 'max' | 'least-squares';

/** One evaluation of the objective, with lazily counted derivatives. */
export class Point {
	private gradRead = false;
	private hessRead = false;
	private g: number[] | null = null;
	private h: number[][] | null | undefined = undefined;
	private cons: { values: number[]; grads: number[][] } | null = null;

	constructor(
		private readonly run: Run,
		/** the evaluated input (a private copy) */
		readonly x: number[],
		/** the minimized function's value (−f when maximizing, ½(f − target)² in least-squares mode) */
		readonly f: number,
		private readonly raw: Evaluation
	) {}

	/** the user's f */
	get userF(): number {
		return this.raw.f;
	}

	get outside(): boolean {
		return this.raw.outside === true;
	}

	/** true when f and the gradient are finite (the gradient is read, and counted) */
	get usable(): boolean {
		return Number.isFinite(this.f) && allFinite(this.grad);
	}

	private countGrad(): void {
		if (!this.gradRead) {
			this.gradRead = true;
			this.run.counts.grad++;
		}
	}

	/** gradient of the minimized function; the first read counts one gradient evaluation */
	get grad(): number[] {
		this.countGrad();
		if (!this.g) {
			const raw = this.raw.grad;
			const n = this.run.n;
			const g = new Array<number>(n);
			const mode = this.run.mode;
			const r = mode === 'least-squares' ? this.raw.f - this.run.target : 0;
			for (let i = 0; i < n; i++) {
				const v = raw && i < raw.length ? raw[i] : NaN;
				g[i] = mode === 'max' ? -v : mode === 'least-squares' ? r * v : v;
			}
			this.g = g;
		}
		return this.g;
	}

	/** the user's gradient, counted like `grad` */
	get userGrad(): number[] {
		this.countGrad();
		return this.peekUserGrad();
	}

	/** the user's gradient for the record — not counted (the optimizer did not use it) */
	peekUserGrad(): number[] {
		const raw = this.raw.grad;
		const out = new Array<number>(this.run.n);
		for (let i = 0; i < out.length; i++) out[i] = raw && i < raw.length ? raw[i] : NaN;
		return out;
	}

	/** the user's Hessian if the objective gives one; the first read counts one Hessian evaluation */
	get userHess(): number[][] | null {
		const h = this.raw.hess;
		if (!h) return null;
		if (!this.hessRead) {
			this.hessRead = true;
			this.run.counts.hess++;
		}
		return h;
	}

	/** Hessian of the minimized function (null if the objective gives none; least squares: Gauss–Newton plus r·∇²f) */
	get hess(): number[][] | null {
		if (this.h !== undefined) return this.h;
		const H = this.userHess;
		const mode = this.run.mode;
		if (!H) {
			this.h = null;
		} else if (mode === 'min') {
			this.h = H;
		} else if (mode === 'max') {
			this.h = H.map((row) => row.map((v) => -v));
		} else {
			const g = this.userGrad;
			const r = this.raw.f - this.run.target;
			this.h = H.map((row, i) => row.map((v, j) => r * v + g[i] * g[j]));
		}
		return this.h;
	}

	/** values and gradients of all constraints at x (one counted call of the constraint set) */
	constraints(): { values: number[]; grads: number[][] } {
		if (!this.cons) this.cons = this.run.evaluateConstraints(this.x);
		return this.cons;
	}
}

export class Run {
	readonly n: number;
	readonly kind: ProblemKind;
	readonly mode: Mode;
	readonly target: number;
	readonly lo: number[];
	readonly hi: number[];
	readonly hasBounds: boolean;
	readonly settings: Settings;
	readonly counts: Evaluations = { f: 0, grad: 0, hess: 0, constraints: 0 };
	resets = 0;
	outsideEvaluations = 0;
	readonly notes: string[] = [];
	readonly path: Path = { x: [], f: [], grad: [], step: [], violation: [], merit: [], active: [] };
	/** last accepted iterate */
	current: Point | null = null;
	/** the first recorded point (the start) */
	private startPoint: Point | null = null;
	/** the error thrown by the objective inside its domain (propagated by guard) */
	private objectiveFault: unknown = null;
	/** gradScale(), once computed */
	private g0 = NaN;
	/** gradTol clamped to what double precision can reach (see the constructor) */
	readonly gradTol: number;
	/**
	 * The objective's own rounding level of f (`Objective.fRounding`; 0 when it
	 * gives none): the floor of fNoise. Per constraint likewise (`cRounding`).
	 */
	readonly fRounding: number;
	readonly cRounding: readonly number[];
	private readonly t0: number;
	private startX: number[] = [];

	constructor(
		readonly problem: Problem,
		readonly optimizer: OptimizerName,
		options: OptimizeOptions,
		/** per-optimizer defaults, overridden by the caller's options */
		defaults: Partial<Settings> = {},
		/** `solve` handled natively (Newton) rather than as least squares */
		nativeSolve = false
	) {
		const obj = problem.objective;
		if (!Number.isInteger(obj.n) || obj.n < 1) throw new RangeError(`objective.n must be a positive integer, got ${obj.n}`);
		this.n = obj.n;
		this.kind = problem.kind;
		if (problem.kind === 'solve') {
			if (!Number.isFinite(problem.target)) throw new RangeError('a solve problem needs a finite target');
			this.target = problem.target as number;
			this.mode = nativeSolve ? 'min' : 'least-squares';
		} else {
			this.target = 0;
			this.mode = problem.kind === 'maximize' ? 'max' : 'min';
		}
		this.lo = new Array<number>(this.n).fill(-Infinity);
		this.hi = new Array<number>(this.n).fill(Infinity);
		if (obj.bounds) {
			if (obj.bounds.length !== this.n) throw new RangeError(`bounds has ${obj.bounds.length} entries for n = ${this.n}`);
			obj.bounds.forEach(([a, b], i) => {
				if (Number.isNaN(a) || Number.isNaN(b) || a > b) throw new RangeError(`invalid bounds [${a}, ${b}] on input ${i}`);
				this.lo[i] = a;
				this.hi[i] = b;
			});
		}
		const level = (v: unknown, what: string): number => {
			if (v === undefined || v === null) return 0;
			if (typeof v !== 'number' || !(v >= 0) || v === Infinity) throw new RangeError(`${what} must be a finite number ≥ 0, got ${v}`);
			return v;
		};
		this.fRounding = level(obj.fRounding, 'objective.fRounding');
		this.cRounding = (obj.constraints ?? []).map((c, i) => level(c.rounding, `constraints[${i}].rounding`));
		this.hasBounds = this.lo.some((v) => v > -Infinity) || this.hi.some((v) => v < Infinity);
		const pick = <K extends keyof Settings>(k: K, fallback: Settings[K]): Settings[K] => {
			const v = (options as Partial<Settings>)[k];
			if (v !== undefined && v !== null) return v as Settings[K];
			const d = defaults[k];
			return d !== undefined ? (d as Settings[K]) : fallback;
		};
		this.settings = {
			gradTol: pick('gradTol', DEFAULT_SETTINGS.gradTol),
			stepTol: pick('stepTol', DEFAULT_SETTINGS.stepTol),
			fTol: pick('fTol', DEFAULT_SETTINGS.fTol),
			feasTol: pick('feasTol', DEFAULT_SETTINGS.feasTol),
			residualTol: pick('residualTol', DEFAULT_SETTINGS.residualTol),
			maxIterations: pick('maxIterations', DEFAULT_SETTINGS.maxIterations),
			maxEvaluations: pick('maxEvaluations', DEFAULT_SETTINGS.maxEvaluations),
			maxMilliseconds: pick('maxMilliseconds', DEFAULT_SETTINGS.maxMilliseconds),
			clock: options.clock ?? defaultClock(),
			onIteration: options.onIteration ?? null,
			secondOrderCheck: pick('secondOrderCheck', DEFAULT_SETTINGS.secondOrderCheck)
		};
		this.t0 = this.settings.clock();
		// A relative gradient test below a few ulps cannot be met by any
		// computed gradient: clamp it (and say so) rather than let the run
		// chase rounding; the other tolerances only end runs as `stalled`.
		const g = this.settings.gradTol;
		this.gradTol = Number.isFinite(g) && g >= MIN_GRAD_TOL ? g : MIN_GRAD_TOL;
		if (this.gradTol !== g) this.notes.push(`gradTol ${g} is below what double precision can reach; ${MIN_GRAD_TOL} used`);
		for (const k of ['stepTol', 'fTol', 'feasTol', 'residualTol'] as const) {
			const v = this.settings[k];
			if (!(v >= MIN_TOL)) {
				this.settings[k] = MIN_TOL;
				this.notes.push(`${k} ${v} is below what double precision can reach; ${MIN_TOL} used`);
			}
		}
	}

	get constraintCount(): number {
		return this.problem.objective.constraints?.length ?? 0;
	}

	get iterations(): number {
		return Math.max(0, this.path.x.length - 1);
	}

	/**
	 * Clip x into the bounds. Values within ~1e-14 (relative) of a bound are
	 * snapped onto it, so that a step computed to end on a bound (x + (lo − x))
	 * lands exactly there despite rounding and the bound is seen as active.
	 */
	project(x: ArrayLike<number>): number[] {
		const out = new Array<number>(this.n);
		for (let i = 0; i < this.n; i++) {
			let v = Math.min(this.hi[i], Math.max(this.lo[i], x[i]));
			const lo = this.lo[i];
			const hi = this.hi[i];
			if (lo > -Infinity && v - lo <= 1e-14 * (1 + Math.abs(lo))) v = lo;
			else if (hi < Infinity && hi - v <= 1e-14 * (1 + Math.abs(hi))) v = hi;
			out[i] = v;
		}
		return out;
	}

	/** validate and project the start; notes the projection */
	prepareStart(start: number[]): number[] {
		if (!Array.isArray(start) || start.length !== this.n) throw new RangeError(`start must have ${this.n} entries`);
		if (!allFinite(start)) throw new RangeError('start must be finite');
		this.startX = start.slice();
		const x = this.project(start);
		if (x.some((v, i) => v !== start[i])) this.notes.push('start projected into the bounds');
		return x;
	}

	elapsed(): number {
		return this.settings.clock() - this.t0;
	}

	private checkTime(): void {
		if (this.elapsed() > this.settings.maxMilliseconds)
			this.stop('iteration-limit', `time budget of ${this.settings.maxMilliseconds} ms exhausted`);
	}

	/** call before starting an iteration: ends the run when the iteration or time budget is spent */
	beginIteration(): void {
		if (this.iterations >= this.settings.maxIterations)
			this.stop('iteration-limit', `iteration budget of ${this.settings.maxIterations} exhausted`);
		this.checkTime();
	}

	private outsideDomain(x: number[]): boolean {
		const d = this.problem.objective.domain;
		if (!d) return false;
		for (let i = 0; i < this.n; i++) if (x[i] < d[i][0] || x[i] > d[i][1]) return true;
		return false;
	}

	evaluate(xIn: ArrayLike<number>): Point {
		if (this.counts.f >= this.settings.maxEvaluations)
			this.stop('iteration-limit', `evaluation budget of ${this.settings.maxEvaluations} exhausted`);
		this.checkTime();
		const x = Array.from(xIn);
		this.counts.f++;
		let raw: Evaluation;
		const outside = this.outsideDomain(x);
		try {
			raw = this.problem.objective.evaluate(x.slice());
		} catch (err) {
			if (err instanceof Stop) throw err;
			if (this.problem.objective.domain && !outside) {
				// a fault inside the domain is a bug of the objective, not a refusal: it propagates
				this.objectiveFault = err;
				throw err;
			}
			// a refusal is an evaluation outside the data too (the one that ends the run)
			this.outsideEvaluations++;
			this.stop('left-domain', `objective refused x = ${fmt(x)}: ${err instanceof Error ? err.message : String(err)}`);
		}
		if (!raw || typeof raw.f !== 'number') throw new TypeError('objective.evaluate must return { f, grad }');
		if (outside || raw.outside) {
			this.outsideEvaluations++;
			if (raw.outside && this.problem.objective.refuseOutside)
				this.stop('left-domain', `asked for x = ${fmt(x)} outside the data, where the fit refuses to extrapolate`);
		}
		let f: number;
		if (this.mode === 'min') f = raw.f;
		else if (this.mode === 'max') f = -raw.f;
		else {
			const r = raw.f - this.target;
			f = 0.5 * r * r;
		}
		return new Point(this, x, f, raw);
	}

	evaluateConstraints(x: number[]): { values: number[]; grads: number[][] } {
		const cs = this.problem.objective.constraints ?? [];
		if (cs.length) this.counts.constraints++;
		const values: number[] = [];
		const grads: number[][] = [];
		for (const c of cs) {
			let v;
			try {
				v = c.evaluate(x.slice());
			} catch (err) {
				if (err instanceof Stop) throw err;
				this.stop('left-domain', `constraint ${c.label ?? ''} refused x = ${fmt(x)}: ${err instanceof Error ? err.message : String(err)}`);
			}
			values.push(v.value);
			grads.push(Array.from({ length: this.n }, (_, i) => (v.grad && i < v.grad.length ? v.grad[i] : NaN)));
		}
		return { values, grads };
	}

	/** largest violation of the general constraints at x (bounds are kept by projection) */
	violation(values: number[]): number {
		const cs = this.problem.objective.constraints ?? [];
		let v = 0;
		for (let i = 0; i < cs.length; i++) {
			const c = cs[i].kind === 'eq' ? Math.abs(values[i]) : Math.max(0, values[i]);
			if (!(c <= v)) v = c; // NaN propagates
		}
		return v;
	}

	/**
	 * The gradient scale of the first-order test: max(1, ‖∇F(start)‖∞), F the
	 * minimized function (the user's ∇f for `solve` run as least squares).
	 * A gradient, unlike f, does not change when a constant is added to f, so
	 * the test ‖projected ∇F‖∞ ≤ gradTol·gradScale is invariant to an offset in
	 * f, and relative to the start it follows a scaling of f (the floor 1 keeps
	 * a start that is already nearly stationary from asking for more than
	 * rounding allows). Nocedal & Wright (2006, §3.1 and the discussion of
	 * stopping tests) base the test on the gradient, not on f; see
	 * docs/references.md.
	 */
	gradScale(): number {
		if (Number.isNaN(this.g0)) {
			const s = this.startPoint;
			if (!s) return 1;
			const g = this.mode === 'least-squares' ? s.peekUserGrad() : s.grad;
			const v = normInf(g);
			this.g0 = Number.isFinite(v) ? Math.max(1, v) : 1;
		}
		return this.g0;
	}

	/** the first-order tolerance: gradTol·gradScale() (the same at every point of a run) */
	gradTolAt(_p?: Point): number {
		return this.gradTol * this.gradScale();
	}

	/**
	 * The rounding level of f near p: a few units in the last place of |f|.
	 * Differences of f below it are not information (what f-change tests,
	 * line searches and probes must allow for); it grows with an offset in f
	 * because the stored values lose their low digits, not because a
	 * tolerance does.
	 */
	fNoise(f: number): number {
		if (!Number.isFinite(f)) return 0;
		if (this.mode !== 'least-squares') return Math.max(8 * EPS * Math.abs(f), this.fRounding);
		// F = ½r², r = f − target: the user's f carries 8ε(|target| + |r|) (or the
		// fit's own rounding level, when larger), which F carries times |r|
		const r = Math.sqrt(2 * Math.abs(f));
		const d = Math.max(8 * EPS * (Math.abs(this.target) + r), this.fRounding);
		return r * d + d * d;
	}

	/**
	 * The rounding level of a merit function f + Σ wᵢ·|cᵢ| at the value phi:
	 * fNoise(phi) plus each weight times its constraint's rounding level (zero
	 * where the constraint gives none; a few ulps of its value are inside
	 * fNoise's relative term already).
	 */
	meritNoise(phi: number, weights: readonly number[]): number {
		let s = this.fNoise(phi);
		for (let i = 0; i < weights.length && i < this.cRounding.length; i++) s += Math.abs(weights[i]) * this.cRounding[i];
		return s;
	}

	/**
	 * How much lower f must be at a probe near p to count as a descent the
	 * end-point checks believe: 1e-12 of the change of F over the run (at
	 * least 1e-12), plus the rounding level of L0 — differences only, so an
	 * offset in f changes nothing but the rounding term.
	 */
	fDropTol(p: Point, L0: number): number {
		return 1e-12 * this.fChangeScale(p) + this.fNoise(L0);
	}

	/** max(1, |F(start) − F(p)|): the shift-invariant scale of f-change tests */
	fChangeScale(p: Point): number {
		const s = this.startPoint;
		const change = s && Number.isFinite(s.f) && Number.isFinite(p.f) ? Math.abs(s.f - p.f) : 0;
		return Math.max(1, change);
	}

	/**
	 * Is `measure` (a gradient or KKT residual of the minimized function) small
	 * enough at p? For `solve` as least squares: is the target met — or is the
	 * point stationary without a root? There ∇(½r²) = r∇f, so the test divides
	 * by |r|: it fires where the user's f is stationary (no root nearby), not
	 * merely because r is small (which the residual test decides).
	 */
	firstOrderMet(p: Point, measure: number): boolean {
		if (this.mode === 'least-squares') {
			if (this.residualMet(p)) return true;
			const r = Math.abs(p.userF - this.target);
			return measure / r <= this.gradTolAt(p);
		}
		return measure <= this.gradTolAt(p);
	}

	/**
	 * The residual a `solve` run must reach: residualTol·max(1, |r(start)|)
	 * plus the rounding level of the target. Relative to the starting residual,
	 * not to |target|, so that adding a constant to f and to the target changes
	 * nothing but that rounding term (with which a target of 1e9 can be met to
	 * the digits f really has).
	 */
	residualTolerance(r0: number): number {
		return this.settings.residualTol * Math.max(1, Number.isFinite(r0) ? r0 : 1) + 8 * EPS * Math.abs(this.target);
	}

	residualMet(p: Point): boolean {
		const s = this.startPoint ?? p;
		return Math.abs(p.userF - this.target) <= this.residualTolerance(Math.abs(s.userF - this.target));
	}

	/**
	 * The projected gradient's size, in the gradient's units: ‖gᵢ‖∞ over the
	 * inputs, leaving out each input that sits on a bound (within
	 * 1e-10·max(1, |bound|)) which its −gᵢ points beyond — the bound-constrained
	 * first-order condition (Nocedal & Wright 2006, §16.7 and eq. 12.34 for a
	 * box). Not ‖x − P(x − g)‖∞: that caps a component at the room to its
	 * bound, a length, so when f is scaled up the cap falls below a
	 * tolerance that scales with f and a start with a large gradient reads as
	 * stationary (scaling f by 1e6 did that). Without bounds it is ‖g‖∞.
	 */
	projectedGradNorm(x: number[], g: number[]): number {
		let m = 0;
		for (let i = 0; i < this.n; i++) {
			const gi = g[i];
			const v = gi > 0 ? (this.onBound(x[i], this.lo[i]) ? 0 : gi) : gi < 0 ? (this.onBound(x[i], this.hi[i]) ? 0 : -gi) : gi === 0 ? 0 : NaN;
			if (!(v <= m)) m = v; // NaN propagates
		}
		return m;
	}

	/** xᵢ on the (finite) bound b, within BOUND_SLACK·max(1, |b|) */
	private onBound(xi: number, b: number): boolean {
		return Number.isFinite(b) && Math.abs(xi - b) <= BOUND_SLACK * Math.max(1, Math.abs(b));
	}

	/** labels of the bounds x sits on: lo<j> / hi<j> */
	activeBounds(x: number[]): string[] {
		if (!this.hasBounds) return [];
		const out: string[] = [];
		for (let i = 0; i < this.n; i++) {
			if (x[i] <= this.lo[i]) out.push(`lo${i}`);
			else if (x[i] >= this.hi[i]) out.push(`hi${i}`);
		}
		return out;
	}

	/** append an accepted iterate (the start is iteration 0) */
	record(p: Point, extra: { violation?: number; merit?: number; active?: string[] } = {}): void {
		const prev = this.path.x.length ? this.path.x[this.path.x.length - 1] : null;
		let step = 0;
		if (prev) {
			const d = new Array<number>(this.n);
			for (let i = 0; i < this.n; i++) d[i] = p.x[i] - prev[i];
			step = norm2(d);
		}
		if (!prev) this.startPoint = p;
		const rec: IterationRecord = {
			iteration: this.path.x.length,
			x: p.x.slice(),
			f: p.userF,
			grad: p.peekUserGrad(),
			step,
			violation: extra.violation ?? 0,
			merit: extra.merit ?? p.f,
			active: extra.active ?? this.activeBounds(p.x)
		};
		this.path.x.push(rec.x);
		this.path.f.push(rec.f);
		this.path.grad.push(rec.grad);
		this.path.step.push(rec.step);
		this.path.violation.push(rec.violation);
		this.path.merit.push(rec.merit);
		this.path.active.push(rec.active);
		this.current = p;
		if (this.settings.onIteration && this.settings.onIteration(rec) === false)
			this.stop('iteration-limit', 'stopped by the caller');
	}

	/** end the run (throws the sentinel); `point` defaults to the last accepted iterate */
	stop(outcome: Outcome, reason: string, point: Point | null = null): never {
		throw new Stop(outcome, reason, point);
	}

	/**
	 * Run the optimizer body; a Stop becomes the result. A fault of the
	 * objective inside its domain, and a bad start (before any evaluation),
	 * propagate; any other error raised on the way (arithmetic that went
	 * non-finite inside the optimizer or a library it drives) ends the run as
	 * `diverged` with the error in the reason, so one run can never fail a study.
	 */
	guard(body: () => RunResult): RunResult {
		try {
			return body();
		} catch (err) {
			if (err instanceof Stop) return this.finish(err.point ?? this.current, err.outcome, err.reason);
			if (err === this.objectiveFault || (this.counts.f === 0 && err instanceof RangeError)) throw err;
			const msg = err instanceof Error ? err.message : String(err);
			return this.finish(this.current, 'diverged', `the computation broke down (${msg}); the last accepted point is reported`);
		}
	}

	isStop(err: unknown): boolean {
		return err instanceof Stop;
	}

	/** the outcome carried by a sentinel, or null for any other error */
	stopOutcome(err: unknown): Outcome | null {
		return err instanceof Stop ? err.outcome : null;
	}

	finish(
		point: Point | null,
		outcome: Outcome,
		reason: string,
		extra: { multipliers?: Multipliers | null; kkt?: KktResiduals | null } = {}
	): RunResult {
		if (point && this.path.x.length === 0) {
			// ended at the start (e.g. f not finite there): the path still shows it
			try {
				this.record(point);
			} catch (err) {
				if (!(err instanceof Stop)) throw err;
			}
		}
		const x = point ? point.x.slice() : this.startX.slice();
		const f = point ? point.userF : NaN;
		const g = point ? point.peekUserGrad() : new Array<number>(this.n).fill(NaN);
		if (point && this.current !== point && this.path.x.length && outcome !== 'left-domain') {
			// the final point was reached inside a wrapped loop and not yet recorded
			const last = this.path.x[this.path.x.length - 1];
			if (last.some((v, i) => v !== point.x[i])) {
				try {
					this.record(point);
				} catch (err) {
					if (!(err instanceof Stop)) throw err;
				}
			}
		}
		if (outcome === 'converged' && (!Number.isFinite(f) || !allFinite(x))) {
			outcome = 'diverged';
			reason = `non-finite value at the end point (${reason})`;
		}
		const kinkAt = this.problem.objective.kinkAt;
		let atKink = false;
		// every run that ends on a knot where f′ jumps says so, whatever its optimizer and outcome
		// (a derivative-free method can "converge" at the corner of a linear fit)
		if (kinkAt && allFinite(x)) {
			try {
				atKink = !!kinkAt(x.slice());
			} catch {
				atKink = false;
			}
		}
		// the end point lies outside the data: the fit there is its extrapolation rule, not the data
		const outsideData = allFinite(x) && this.outsideDomain(x);
		if (outsideData && outcome === 'converged') reason = `${reason} — outside the data, on the fit's extrapolation`;
		return {
			optimizer: this.optimizer,
			kind: this.kind,
			outcome,
			reason,
			atKink,
			outsideData,
			x,
			f,
			gradNorm: norm2(g),
			iterations: this.iterations,
			evaluations: { ...this.counts },
			resets: this.resets,
			outsideEvaluations: this.outsideEvaluations,
			multipliers: extra.multipliers ?? null,
			kkt: extra.kkt ?? null,
			start: this.startX.slice(),
			ms: this.elapsed(),
			notes: this.notes.slice(),
			path: this.path
		};
	}
}

/** short vector text for reasons */
export function fmt(x: ArrayLike<number>): string {
	const parts: string[] = [];
	for (let i = 0; i < x.length; i++) parts.push(Number(x[i]).toPrecision(6).replace(/\.?0+(e|$)/, '$1'));
	return `(${parts.join(', ')})`;
}

/** max-norm of x for relative step tests */
export function scaleOf(x: number[]): number {
	return 1 + normInf(x);
}

/**
 * The record of a run whose optimizer threw (a fault of the objective, which
 * `optimize` lets propagate): `diverged` at the start, with the error as the
 * reason — what a study stores instead of failing.
 */
export function brokenRun(problem: Problem, optimizer: OptimizerName, start: number[], err: unknown): RunResult {
	const n = problem.objective.n;
	const x = Array.isArray(start) && start.length === n ? start.slice() : new Array<number>(n).fill(NaN);
	const msg = err instanceof Error ? err.message : String(err);
	return {
		optimizer,
		kind: problem.kind,
		outcome: 'diverged',
		reason: `the objective failed at or after the start (${msg})`,
		atKink: false,
		outsideData: false,
		x,
		f: NaN,
		gradNorm: NaN,
		iterations: 0,
		evaluations: { f: 0, grad: 0, hess: 0, constraints: 0 },
		resets: 0,
		outsideEvaluations: 0,
		multipliers: null,
		kkt: null,
		start: x.slice(),
		ms: 0,
		notes: [],
		path: { x: [x.slice()], f: [NaN], grad: [new Array<number>(n).fill(NaN)], step: [0], violation: [0], merit: [NaN], active: [[]] }
	};
}
