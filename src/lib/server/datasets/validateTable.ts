import { clipForMessage, MAX_COLUMNS, MAX_ROWS, formatCount } from './limits';
import { describeNonNumber, parseNumber } from './parseNumber';
import { MAX_LISTED_PROBLEMS, orderProblems, problemGroup } from './problemReport';
import { rowList } from './rowList';
import type { ParsedTable, Role, Shape, ValidationIssue, ValidationReport } from './types';

const MAX_DUPLICATE_GROUPS = 10;
const MAX_MISSING_LISTED = 10;
// Several inputs filling at least this share of their tensor product are
// taken for a grid with holes rather than for scattered points.
const GRID_MIN_FILL = 0.75;
const MAX_GRID_INPUTS = 4;
const MAX_SCATTER_INPUTS = 6;

/**
 * Checks a parsed table as a dataset: roles, numbers in every cell, inputs
 * that vary and do not repeat, and its shape (curve, grid or scatter).
 * `roles` overrides roles set on the columns; by default the first column
 * is the input and the rest are outputs. `options.shape = 'scatter'` takes a
 * table of several inputs as scattered points even where its inputs (nearly)
 * fill a grid: the user's choice for a grid with missing cells.
 */
export function validateTable(parsed: ParsedTable, roles?: Record<string, Role>, options: { shape?: 'scatter' } = {}): ValidationReport {
	const errors: ValidationIssue[] = [];
	// problems found but not kept (each check keeps its first MAX_LISTED_PROBLEMS in row order), by group
	const uncollected = new Map<string, number>();
	const warnings = [...parsed.warnings];
	const notes = [...parsed.notes];
	const n = parsed.rows.length;
	const names = parsed.columns.map((c) => c.name);

	const seen = new Map<string, number>();
	for (const name of names) seen.set(name, (seen.get(name) ?? 0) + 1);
	for (const [name, count] of seen) {
		if (count > 1) {
			errors.push({
				code: 'duplicate-column',
				column: name,
				message: `column name "${name}" appears ${count} times; column names must be unique`
			});
		}
	}

	if (roles) {
		for (const [name, role] of Object.entries(roles)) {
			if (!seen.has(name)) {
				errors.push({
					code: 'unknown-column',
					column: name,
					message: `a role is given for column "${name}", but the table has no such column (columns: ${names.join(', ')})`
				});
			} else if (role !== 'input' && role !== 'output') {
				errors.push({
					code: 'invalid-role',
					column: name,
					value: String(role),
					message: `column "${name}" has role ${JSON.stringify(role)}; a role is "input" or "output"`
				});
			}
		}
	}
	const explicit = parsed.columns.map((c) => {
		const r = roles && Object.hasOwn(roles, c.name) ? roles[c.name] : c.role;
		return r === 'input' || r === 'output' ? r : undefined;
	});
	const anyInput = explicit.includes('input');
	const columns = parsed.columns.map((c, j) => ({
		name: c.name,
		unit: c.unit,
		role: explicit[j] ?? (j === 0 && !anyInput ? 'input' : 'output')
	})) satisfies ValidationReport['columns'];
	const inputs = columns.flatMap((c, j) => (c.role === 'input' ? [j] : []));
	const outputs = columns.flatMap((c, j) => (c.role === 'output' ? [j] : []));

	if (columns.length > MAX_COLUMNS) {
		errors.push({ code: 'too-many-columns', message: `table has ${columns.length} columns; the limit is ${MAX_COLUMNS} columns` });
	}
	if (n > MAX_ROWS) {
		errors.push({ code: 'too-many-rows', message: `table has ${formatCount(n)} rows; the limit is ${formatCount(MAX_ROWS)} rows` });
	}
	if (inputs.length === 0) {
		errors.push({ code: 'no-input', message: 'the table has no input column; at least one column must be an input' });
	}
	if (outputs.length === 0) {
		errors.push({ code: 'no-output', message: 'the table has no output column; at least one column must be an output' });
	}

	// Rows with the wrong number of fields were left out of the table; they are reported with the cells of the rest.
	for (const b of parsed.badRows ?? []) errors.push({ code: b.code, row: b.row, message: `row ${b.row} ${b.problem}` });
	const badRowsLeft = (parsed.badRowCount ?? 0) - (parsed.badRows?.length ?? 0);
	if (badRowsLeft > 0) uncollected.set(problemGroup({ code: 'field-count' }), badRowsLeft);

	const data = columns.map(() => new Float64Array(n));
	const numeric = columns.map((_, j) => readColumn(parsed, j, data[j], errors, uncollected));

	let shape: Shape | null = null;
	let shapeReason: string;
	if (inputs.length === 0) {
		shapeReason = 'no column is an input, so there is no shape';
	} else if (!inputs.every((j) => numeric[j])) {
		shapeReason = 'the shape can be told once every input cell holds a number';
	} else {
		({ shape, shapeReason } = analyseInputs(
			inputs.map((j) => data[j]),
			inputs.map((j) => columns[j].name),
			parsed.rowNumbers,
			errors,
			warnings,
			notes,
			options.shape === 'scatter'
		));
	}

	for (const j of outputs) {
		if (numeric[j] && n > 1 && data[j].every((v) => v === data[j][0])) {
			warnings.push(`output column "${columns[j].name}" has the same value (${data[j][0]}) in every row`);
		}
	}

	const ok = errors.length === 0;
	const ordered = orderProblems(
		errors,
		columns.map((c) => c.name),
		uncollected
	);
	return {
		ok,
		shape,
		shapeReason,
		columns,
		rowCount: n,
		errors: ordered.listed,
		problemCount: ordered.count,
		warnings,
		notes,
		...(ok ? { data } : {})
	};
}

/**
 * Fills `out` with column j's numbers; reports bad cells (the first
 * MAX_LISTED_PROBLEMS in row order, the rest counted in `uncollected`) and
 * says whether all were numbers.
 */
function readColumn(parsed: ParsedTable, j: number, out: Float64Array, errors: ValidationIssue[], uncollected: Map<string, number>): boolean {
	const name = parsed.columns[j].name;
	const problems: ValidationIssue[] = [];
	let empty = 0;
	let text = 0;
	for (let i = 0; i < parsed.rows.length; i++) {
		const cell = parsed.rows[i][j];
		const v = parseNumber(cell);
		if (!Number.isNaN(v)) {
			out[i] = v;
			continue;
		}
		out[i] = NaN;
		const isEmpty = cell === null || (typeof cell === 'string' && cell.trim() === '');
		if (isEmpty) empty++;
		else text++;
		if (problems.length >= MAX_LISTED_PROBLEMS) continue;
		const row = parsed.rowNumbers[i];
		if (isEmpty) {
			problems.push({ code: 'empty-cell', row, column: name, message: `row ${row}, column "${name}": the cell is empty` });
		} else {
			const value = clipForMessage(String(cell));
			const { code, problem } =
				typeof cell === 'number' ? { code: 'non-numeric', problem: `${value} is not a finite number` } : describeNonNumber(String(cell));
			problems.push({ code, row, column: name, value, message: `row ${row}, column "${name}": ${problem}` });
		}
	}
	const bad = empty + text;
	if (bad === 0) return true;

	const n = parsed.rows.length;
	if (empty === n) {
		errors.push({ code: 'empty-column', column: name, message: `column "${name}" has no values` });
	} else if (text + empty === n && n > 1 && text > 1) {
		// A column of words (a comment column, say) is one problem, not one per row.
		const examples = problems.flatMap((p) => (p.value !== undefined ? [JSON.stringify(p.value)] : [])).slice(0, 3);
		errors.push({
			code: 'text-column',
			column: name,
			message: `column "${name}" holds text, not numbers (${examples.join(', ')}, …); remove the column or put numbers in it`
		});
	} else {
		errors.push(...problems);
		const unlisted = bad - problems.length;
		if (unlisted > 0) {
			const group = problemGroup({ code: 'cell', column: name });
			uncollected.set(group, (uncollected.get(group) ?? 0) + unlisted);
		}
	}
	return false;
}

interface ShapeResult {
	shape: Shape | null;
	shapeReason: string;
}

/** Constant inputs, repeated input points, row order and the shape, from numeric input columns. */
function analyseInputs(
	cols: Float64Array[],
	names: string[],
	rowNumbers: number[],
	errors: ValidationIssue[],
	warnings: string[],
	notes: string[],
	asScatter = false
): ShapeResult {
	const n = cols[0].length;
	const k = cols.length;
	const quoted = names.map((s) => `"${s}"`);

	if (n < 2) {
		errors.push({ code: 'too-few-rows', message: `the table has ${n} data row${n === 1 ? '' : 's'}; a dataset needs at least 2` });
		return { shape: k === 1 ? 'curve' : null, shapeReason: 'one row is not enough to tell a shape' };
	}

	// Distinct values per input, sorted, and each cell's rank among them:
	// a typed-array sort and binary search, with no hashing of doubles.
	const axes = cols.map(distinctSorted);
	const positions = cols.map((col, a) => ranks(col, axes[a]));

	cols.forEach((col, a) => {
		if (axes[a].length === 1) {
			errors.push({
				code: 'constant-input',
				column: names[a],
				value: String(col[0]),
				message: `input column "${names[a]}" has the same value (${col[0]}) in every row; an input must vary`
			});
		}
	});

	// A point's key is its mixed-radix index in the tensor product of the axes,
	// exact while that product stays below 2^53; past it, a string key. A
	// product not much larger than the row count gets a dense lookup table.
	let product = 1;
	for (const axis of axes) product *= axis.length;
	const dense = product <= Math.max(4 * n, 1 << 16) ? new Int32Array(product).fill(-1) : null;
	const sparse = dense ? null : new Map<number | string, number>();
	const numericKeys = product <= Number.MAX_SAFE_INTEGER;
	const repeats = new Map<number, number[]>();
	let distinct = 0;
	for (let i = 0; i < n; i++) {
		let key: number | string = 0;
		if (numericKeys) for (let a = 0; a < k; a++) key = key * axes[a].length + positions[a][i];
		else key = positions.map((p) => p[i]).join(',');
		let first: number | undefined;
		if (dense) {
			first = dense[key as number];
			if (first === -1) dense[key as number] = i;
		} else {
			first = sparse!.get(key);
			if (first === undefined) sparse!.set(key, i);
		}
		if (first === -1 || first === undefined) {
			distinct++;
			continue;
		}
		const group = repeats.get(first);
		if (group) group.push(i);
		else repeats.set(first, [first, i]);
	}
	let listed = 0;
	for (const group of repeats.values()) {
		if (listed === MAX_DUPLICATE_GROUPS) {
			errors.push({
				code: 'duplicate-inputs',
				message: `${repeats.size - listed} more groups of rows repeat an input point (not listed)`
			});
			break;
		}
		const rows = group.map((i) => rowNumbers[i]);
		errors.push({
			code: 'duplicate-inputs',
			row: rows[1],
			message: `${rowList(rows)} have the same inputs (${pointText(names, cols, group[0])}); each input point may appear only once`
		});
		listed++;
	}

	// Grids are often listed with the last input varying slowest, so either order counts as sorted.
	const identity = cols.map((_, a) => a);
	const sorted = isSortedBy(cols, identity) || (k > 1 && isSortedBy(cols, identity.reverse()));
	if (!sorted) {
		notes.push(`rows are not sorted by ${k === 1 ? quoted[0] : `(${quoted.join(', ')})`}; that is fine, row order does not matter`);
	}

	if (k === 1) {
		return { shape: 'curve', shapeReason: `one input column (${quoted[0]}), so the data are a curve` };
	}

	const dims = axes.map((a) => a.length).join(' × ');
	const counts = axes.map((a, i) => `${quoted[i]} (${a.length} values)`).join(', ');
	if (distinct === product && !asScatter) {
		if (k > MAX_GRID_INPUTS) warnings.push(`no grid fit takes more than ${MAX_GRID_INPUTS} inputs; this grid has ${k}`);
		return {
			shape: 'grid',
			shapeReason: `every combination of the input values ${counts} appears: a full ${dims} grid of ${formatCount(product)} points`
		};
	}
	if (distinct === product) {
		notes.push(`the inputs form a full ${dims} grid; taken as scattered points, as asked (shape "scatter")`);
	} else if (distinct >= GRID_MIN_FILL * product && axes.every((a) => a.length >= 2)) {
		// product ≤ n / GRID_MIN_FILL here, so the dense table exists
		const missing: string[] = [];
		for (let key = 0; key < product && missing.length < MAX_MISSING_LISTED; key++) {
			if (dense![key] !== -1) continue;
			const parts: string[] = [];
			for (let a = k - 1, rest = key; a >= 0; a--) {
				parts.unshift(`${names[a]} = ${axes[a][rest % axes[a].length]}`);
				rest = Math.floor(rest / axes[a].length);
			}
			missing.push(`(${parts.join(', ')})`);
		}
		const gap = product - distinct;
		const listedMissing = `${missing.join(', ')}${gap > missing.length ? ', …' : ''}`;
		if (asScatter) {
			notes.push(`the inputs nearly fill a ${dims} grid (${gap} of ${formatCount(product)} points missing: ${listedMissing}); taken as scattered points, as asked (shape "scatter")`);
		} else {
			errors.push({
				code: 'grid-missing-points',
				message: `the inputs look like a ${dims} grid, but ${gap} of its ${formatCount(product)} points ${gap === 1 ? 'is' : 'are'} missing: ${listedMissing}; add the missing rows, or treat the table as scattered points (shape "scatter")`
			});
		}
	}
	if (distinct >= GRID_MIN_FILL * product && axes.every((a) => a.length >= 2) && !asScatter) {
		return {
			shape: 'grid',
			shapeReason: `the input values ${counts} nearly fill a ${dims} grid (${formatCount(distinct)} of ${formatCount(product)} points)`
		};
	}

	if (n < k + 2) {
		errors.push({
			code: 'too-few-rows',
			message: `scattered data with ${k} inputs need at least ${k + 2} rows; the table has ${n}`
		});
	}
	if (k > MAX_SCATTER_INPUTS) warnings.push(`no scatter fit takes more than ${MAX_SCATTER_INPUTS} inputs; this table has ${k}`);
	const gridLike = distinct === product || (distinct >= GRID_MIN_FILL * product && axes.every((a) => a.length >= 2));
	return {
		shape: 'scatter',
		shapeReason: gridLike
			? `taken as scattered points, as asked: the values ${counts} ${distinct === product ? 'form a full' : 'nearly fill a'} ${dims} grid (${formatCount(distinct)} of ${formatCount(product)} points)`
			: `the ${formatCount(distinct)} input points do not form a grid: the values ${counts} would make ${formatCount(product)} combinations`
	};
}

function pointText(names: string[], cols: Float64Array[], i: number): string {
	return names.map((name, a) => `${name} = ${cols[a][i]}`).join(', ');
}

/** Whether rows ascend lexicographically, comparing the columns in `order`. */
function isSortedBy(cols: Float64Array[], order: number[]): boolean {
	const n = cols[0].length;
	for (let i = 1; i < n; i++) {
		for (const a of order) {
			const d = cols[a][i] - cols[a][i - 1];
			if (d > 0) break;
			if (d < 0) return false;
		}
	}
	return true;
}

/** The distinct values of a column, ascending. */
function distinctSorted(col: Float64Array): Float64Array {
	const sorted = col.slice().sort();
	let m = 0;
	for (let i = 0; i < sorted.length; i++) {
		if (i === 0 || sorted[i] !== sorted[m - 1]) sorted[m++] = sorted[i];
	}
	return sorted.slice(0, m);
}

/** Each value's index in `axis` (sorted, holding every value). */
function ranks(col: Float64Array, axis: Float64Array): Uint32Array {
	const out = new Uint32Array(col.length);
	for (let i = 0; i < col.length; i++) {
		const v = col[i];
		let lo = 0;
		let hi = axis.length - 1;
		while (lo < hi) {
			const mid = (lo + hi) >>> 1;
			if (axis[mid] < v) lo = mid + 1;
			else hi = mid;
		}
		out[i] = lo;
	}
	return out;
}
