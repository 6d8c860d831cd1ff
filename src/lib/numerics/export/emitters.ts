/**
 * Code emitters, one per fit representation (the fit body's
 * "representation" key), so the generator never switches on a method name:
 * any fit whose body has a registered representation can be exported.
 * Curve representations live in curveEmitters.ts; surface representations
 * register theirs the same way (`registerEmitter`).
 *
 * An emitter writes the model section of each module:
 *  - Python: constants and a function `_evaluate_points(X)` taking a float
 *    array of shape (n, INPUT_COUNT) and returning `(f, grad, hess)` with
 *    shapes (n,), (n, INPUT_COUNT) and (n, INPUT_COUNT, INPUT_COUNT), or
 *    `hess = None` where the method defines no Hessian;
 *  - TypeScript: constants and a function `evaluatePoint(x: number[])`
 *    returning `{ f, grad, hess }` (hess `null` where undefined).
 * The shared header, the input checks and the public `evaluate` are written
 * around it by codegen.ts. Emitters may rely on `INPUT_NAMES`, `DOMAIN` and
 * `EXTRAPOLATION` being defined before their section (see codegen.ts).
 */
import { FitError } from '../fits/fitError';

export interface EmitContext {
	/** names of the inputs, in the order evaluate(x) takes them */
	inputNames: string[];
}

export interface CodeEmitter {
	/** how many inputs the fit takes (1 for curves) */
	inputCount(fit: Record<string, unknown>): number;
	/** the domain as one [lo, hi] pair per input */
	domain(fit: Record<string, unknown>): [number, number][];
	python(fit: Record<string, unknown>, ctx: EmitContext): string;
	typescript(fit: Record<string, unknown>, ctx: EmitContext): string;
}

const registry = new Map<string, CodeEmitter>();

/** Make a representation exportable (a later registration replaces an earlier one). */
export function registerEmitter(representation: string, emitter: CodeEmitter): void {
	registry.set(representation, emitter);
}

export function emitterFor(fit: Record<string, unknown>): CodeEmitter {
	const r = fit.representation;
	const e = typeof r === 'string' ? registry.get(r) : undefined;
	if (!e) throw new FitError('bad-fit-file', `no code generator for fit representation ${JSON.stringify(r)}`);
	return e;
}

export function registeredRepresentations(): string[] {
	return [...registry.keys()];
}
