/**
 * Generated evaluation code for an exported fit: a Python module (NumPy only)
 * and a TypeScript module, both self-contained. Each starts with a header a
 * reviewer can check against the fit file (dataset, version, checksum,
 * method, continuity, domain, extrapolation rule, the caution), then the
 * named constants and the model section written by the fit's
 * representation emitter (emitters.ts), then the public `evaluate`.
 */
import type { FitExport } from './fitExport';
import { emitterFor, type EmitContext } from './emitters';
import { pyFloat, pyString, tsNumber, tsString, wrapText } from './literals';
import './curveEmitters';
import './surfaceEmitters';

const RULES: Record<string, string> = {
	refuse: 'refuse: a point outside the domain is an error',
	hold: 'hold: outside the domain, the value at the nearest edge (derivatives zero)',
	linear: 'linear: outside the domain, the tangent line at the nearest edge',
	extend: 'extend: outside the domain, the edge piece continues'
};

function label(c: { name: string; unit: string | null }): string {
	return c.unit ? `${c.name} [${c.unit}]` : c.name;
}

/** The header lines shared by both languages (without comment markers). */
function headerLines(doc: FitExport, domain: [number, number][]): string[] {
	const fit = doc.fit;
	const s = doc.source;
	const inputs = s.inputs.map(label).join(', ');
	return [
		`Kinkless fit: ${label(s.output)} as a function of ${inputs}`,
		'',
		`Dataset:       ${s.dataset.name}, version ${s.dataset.version}`,
		`Dataset SHA-256: ${s.dataset.sha256}`,
		`Method:        ${String(fit.method)}`,
		`Continuity:    ${String(fit.continuity)}`,
		...domain.map((d, i) => `Domain:        ${s.inputs[i]?.name ?? `x${i}`} in [${d[0]}, ${d[1]}]${s.inputs[i]?.unit ? ` ${s.inputs[i].unit}` : ''}`),
		`Extrapolation: ${RULES[String(fit.extrapolation)] ?? String(fit.extrapolation)}`,
		`Fit file:      format ${doc.format} version ${doc.version}, ${doc.checksum}`,
		`Written by:    Kinkless ${doc.kinkless}`,
		'',
		'CAUTION:',
		...wrapText(doc.caution, 84).map((l) => `  ${l}`)
	];
}

function context(doc: FitExport): EmitContext {
	return { inputNames: doc.source.inputs.map((c) => c.name) };
}

/** The Python module's text. */
export function generatePython(doc: FitExport): string {
	const emitter = emitterFor(doc.fit);
	const domain = emitter.domain(doc.fit);
	const n = emitter.inputCount(doc.fit);
	const names = doc.source.inputs.map((c) => c.name);
	return [
		'"""',
		...headerLines(doc, domain),
		'',
		'Usage:',
		'  f, grad, hess = evaluate(x)',
		`x is one point (a number or a sequence of ${n} input${n === 1 ? '' : 's'} in the order ${names.join(', ')}),`,
		`or an array of points of shape (n, ${n})${n === 1 ? ' (a flat array of n numbers is n points too)' : ''}.`,
		`For one point: f is a float, grad has shape (${n},), hess shape (${n}, ${n}).`,
		`For n points: f has shape (n,), grad (n, ${n}), hess (n, ${n}, ${n}).`,
		'hess is None where the method defines no second derivative.',
		'"""',
		'import numpy as np',
		'',
		`DATASET = ${pyString(doc.source.dataset.name)}`,
		`DATASET_VERSION = ${doc.source.dataset.version}`,
		`DATASET_SHA256 = ${pyString(doc.source.dataset.sha256)}`,
		`METHOD = ${pyString(String(doc.fit.method))}`,
		`CONTINUITY = ${pyString(String(doc.fit.continuity))}`,
		`EXTRAPOLATION = ${pyString(String(doc.fit.extrapolation))}`,
		`FIT_FILE_CHECKSUM = ${pyString(doc.checksum)}`,
		`CAUTION = ${pyString(doc.caution)}`,
		`INPUT_NAMES = (${names.map(pyString).join(', ')}${names.length === 1 ? ',' : ''})`,
		`INPUT_COUNT = ${n}`,
		`# [lo, hi] per input`,
		`DOMAIN = (${domain.map((d) => `(${pyFloat(d[0])}, ${pyFloat(d[1])})`).join(', ')}${domain.length === 1 ? ',' : ''})`,
		'',
		emitter.python(doc.fit, context(doc)),
		'',
		'',
		'def evaluate(x):',
		'    """f, gradient and Hessian of the fit at one point or an array of points (see above)."""',
		'    a = np.asarray(x, dtype=float)',
		'    if a.ndim == 0 and INPUT_COUNT == 1:',
		'        single, points = True, a.reshape(1, 1)',
		'    elif a.ndim == 1 and a.shape[0] == INPUT_COUNT:',
		'        single, points = True, a.reshape(1, INPUT_COUNT)',
		'    elif a.ndim == 1 and INPUT_COUNT == 1:',
		'        single, points = False, a.reshape(-1, 1)',
		'    elif a.ndim == 2 and a.shape[1] == INPUT_COUNT:',
		'        single, points = False, a',
		'    else:',
		'        raise ValueError(f"x must be one point of {INPUT_COUNT} inputs or an array of shape (n, {INPUT_COUNT}); got shape {a.shape}")',
		'    bad = np.isnan(points).any(axis=1)',
		'    if bad.any():',
		'        raise ValueError(f"cannot evaluate at point {int(np.argmax(bad))}: it contains NaN")',
		'    f, grad, hess = _evaluate_points(points)',
		'    if single:',
		'        return float(f[0]), grad[0], None if hess is None else hess[0]',
		'    return f, grad, hess',
		''
	].join('\n');
}

/** The TypeScript module's text. */
export function generateTypeScript(doc: FitExport): string {
	const emitter = emitterFor(doc.fit);
	const domain = emitter.domain(doc.fit);
	const n = emitter.inputCount(doc.fit);
	const names = doc.source.inputs.map((c) => c.name);
	return [
		'/**',
		...headerLines(doc, domain).map((l) => (l ? ` * ${l}` : ' *')),
		' *',
		' * Usage: const { f, grad, hess } = evaluate([x]);',
		` * x lists the ${n} input${n === 1 ? '' : 's'} in the order ${names.join(', ')}; hess is null where the method`,
		' * defines no second derivative.',
		' */',
		'',
		`export const DATASET = ${tsString(doc.source.dataset.name)};`,
		`export const DATASET_VERSION = ${doc.source.dataset.version};`,
		`export const DATASET_SHA256 = ${tsString(doc.source.dataset.sha256)};`,
		`export const METHOD = ${tsString(String(doc.fit.method))};`,
		`export const CONTINUITY = ${tsString(String(doc.fit.continuity))};`,
		`export const EXTRAPOLATION = ${tsString(String(doc.fit.extrapolation))};`,
		`export const FIT_FILE_CHECKSUM = ${tsString(doc.checksum)};`,
		`export const CAUTION = ${tsString(doc.caution)};`,
		`export const INPUT_NAMES: readonly string[] = [${names.map(tsString).join(', ')}];`,
		`/** [lo, hi] per input */`,
		`export const DOMAIN: readonly (readonly [number, number])[] = [${domain.map((d) => `[${tsNumber(d[0])}, ${tsNumber(d[1])}]`).join(', ')}];`,
		'',
		emitter.typescript(doc.fit, context(doc)),
		'',
		'/** f, gradient and Hessian of the fit at x (the inputs in the order of INPUT_NAMES). */',
		'export function evaluate(x: number[]): { f: number; grad: number[]; hess: number[][] | null } {',
		`\tif (!Array.isArray(x) || x.length !== ${n}) throw new RangeError(\`x must list ${n} input${n === 1 ? '' : 's'} (\${INPUT_NAMES.join(', ')})\`);`,
		'\tfor (let i = 0; i < x.length; i++) {',
		"\t\tif (typeof x[i] !== 'number' || Number.isNaN(x[i])) throw new RangeError(`cannot evaluate: ${INPUT_NAMES[i]} = ${x[i]} is not a number`);",
		'\t}',
		'\treturn evaluatePoint(x);',
		'}',
		''
	].join('\n');
}
