/**
 * A run's reason in the study's own words. The optimizers report in their
 * internal sense — a maximize study is run as the minimization of −f, and a
 * stalled line search says "a kink, a step or noise" whatever the fit — so
 * before a reason is stored it is reworded here with what the study knows:
 * its sense (maximize / minimize / solve), its bounds (named when the end
 * point sits on one), whether the fit has a measured kink at all, and the
 * fit's knots (an optimum on a data point is a property of the method).
 * The optimizers' math and outcomes are untouched; only wording changes.
 */

export interface ReasonContext {
	kind: 'minimize' | 'maximize' | 'solve' | string;
	/** one [lo, hi] per input */
	bounds: [number, number][];
	/** the input's name, for naming bounds and data points */
	inputName?: string;
	/** the fit's measured continuity (smoothness audit), null when unknown */
	measured: string | null;
	/** does the fit have interior knots where f′ (or f) jumps? */
	kinked: boolean;
	/** the fit's knots when they are the data's x values (interpolants), else empty */
	dataX?: ArrayLike<number>;
	/** the fit method, for the data-point note */
	method?: string;
}

interface RawRun {
	outcome: string;
	reason: string;
	x: number[];
	atKink: boolean;
}

const fmt = (v: number) => (Number.isFinite(v) ? String(Number(v.toPrecision(6))) : String(v));

/** Where x sits on a bound (relative tolerance 1e-9 of the bounds' width), named. */
export function boundNote(x: number[], ctx: Pick<ReasonContext, 'bounds' | 'inputName'>): string | null {
	const name = ctx.inputName ?? 'x';
	for (let j = 0; j < ctx.bounds.length && j < x.length; j++) {
		const [lo, hi] = ctx.bounds[j];
		const tol = 1e-9 * Math.max(Math.abs(hi - lo), Number.MIN_VALUE);
		if (Math.abs(x[j] - lo) <= tol) return `ends on the lower bound ${name} = ${fmt(lo)}`;
		if (Math.abs(x[j] - hi) <= tol) return `ends on the upper bound ${name} = ${fmt(hi)}`;
	}
	return null;
}

/** The data point x sits on (1e-6 of the local spacing), if any. */
export function dataPointAt(x: number, dataX: ArrayLike<number> | undefined): number | null {
	if (!dataX || dataX.length < 2 || !Number.isFinite(x)) return null;
	let lo = 0;
	let hi = dataX.length - 1;
	while (hi - lo > 1) {
		const mid = (lo + hi) >> 1;
		if (dataX[mid] <= x) lo = mid;
		else hi = mid;
	}
	for (const i of [lo, hi]) {
		const h = Math.abs(dataX[Math.min(i + 1, dataX.length - 1)] - dataX[Math.max(i - 1, 0)]) / 2;
		// 1e-6 of the spacing: a converged run stops within ~‖∇f‖/f″ of the optimum, far below this, while an optimum between points is a sizeable share of an interval away
		if (Math.abs(x - dataX[i]) <= 1e-6 * h) return dataX[i];
	}
	return null;
}

/** The optimizer's minimize-sense phrases, turned to a maximize study's sense. */
function toMaximizeSense(reason: string): string {
	return reason
		.replace(/negative curvature (-?[\d.e+-]+) along ([^:]+): a maximum, not a minimum/g, (_, c: string, v: string) => `curvature of f +${fmt(Math.abs(Number(c)))} along ${v}: a minimum of f, not a maximum`)
		.replace(/negative curvature (-?[\d.e+-]+) along ([^:]+): a saddle, not a minimum/g, (_, c: string, v: string) => `curvature of f +${fmt(Math.abs(Number(c)))} along ${v}: a saddle, not a maximum`)
		.replace(/curvature ≥ (-?[\d.e+-]+)/g, (_, c: string) => `curvature of f ≤ −${fmt(Math.abs(Number(c)))}`)
		.replace(/\bf decreases\b/g, 'f increases')
		.replace(/\bno decrease\b/g, 'no increase')
		.replace(/\bno descent\b/g, 'no ascent')
		.replace(/f → −∞ \(unbounded below\)/g, 'f → +∞ (unbounded above)')
		.replace(/flat minimum/g, 'flat maximum')
		.replace(/\bdescent\b/g, 'ascent');
}

/** "the bound lo0" / "hi0" (internal names) as the study's bounds. */
function nameBounds(reason: string, ctx: ReasonContext): string {
	const name = ctx.inputName ?? 'x';
	return reason.replace(/the bound (lo|hi)(\d+)/g, (_, side: string, j: string) => {
		const b = ctx.bounds[Number(j)];
		if (!b) return `the ${side === 'lo' ? 'lower' : 'upper'} bound`;
		return `the ${side === 'lo' ? 'lower' : 'upper'} bound ${name} = ${fmt(side === 'lo' ? b[0] : b[1])}`;
	});
}

/** The stalled-line-search blame, only where the fit has what it blames. */
function blame(reason: string, run: RawRun, ctx: ReasonContext): string {
	const smooth = ctx.measured && ctx.measured !== 'C0' && ctx.measured !== 'discontinuous' ? ctx.measured.replace('Cinf', 'C∞') : null;
	return reason
		.replace(/: a kink, a step or noise/g, () => {
			if (ctx.kinked && run.atKink) return ': at a kink of the fit (its slope jumps here)';
			if (ctx.kinked) return ': a kink of the fit nearby, or rounding noise';
			return `: the fit has no kink${smooth ? ` (measured ${smooth})` : ''}, so rounding in f stops the search — the gradient is already small`;
		})
		.replace(/: a step or discontinuity/g, () => (ctx.measured && ctx.measured !== 'discontinuous' ? `: the fit has no step${smooth ? ` (measured ${smooth})` : ''}, so rounding in f is finer than the tolerance allows` : ': a step or discontinuity'));
}

/** The reason as the study page and API show it. */
export function studyReason(run: RawRun, ctx: ReasonContext): string {
	let reason = blame(run.reason, run, ctx);
	if (ctx.kind === 'maximize') reason = toMaximizeSense(reason);
	reason = nameBounds(reason, ctx);
	const notes: string[] = [];
	const bound = boundNote(run.x, ctx);
	if (bound && !reason.includes(bound.replace('ends on ', ''))) notes.push(bound);
	if (run.outcome === 'converged' && ctx.kind !== 'solve' && run.x.length === 1) {
		const p = dataPointAt(run.x[0], ctx.dataX);
		if (p !== null && !bound)
			notes.push(`the ${ctx.kind === 'maximize' ? 'maximum' : 'minimum'} sits on the data point ${ctx.inputName ?? 'x'} = ${fmt(p)}: ${ctx.method ? `${ctx.method} puts` : 'the method puts'} this extremum at a data point, not between points`);
	}
	return notes.length ? `${reason}; ${notes.join('; ')}` : reason;
}
