import { z } from 'zod';
import { MAX_COLUMNS, MAX_ROWS, formatCount } from './limits';

export const MAX_NAME_LENGTH = 120;
const MAX_UNIT_LENGTH = 40;
// Row-length problems listed before one summary issue stands for the rest.
const MAX_ROW_ISSUES = 100;

const columnSchema = z.object({
	name: z
		.string({ error: 'a column name must be text' })
		.trim()
		.min(1, 'a column name cannot be empty')
		.max(MAX_NAME_LENGTH, `a column name can be at most ${MAX_NAME_LENGTH} characters`),
	unit: z
		.string({ error: 'a unit must be text' })
		.trim()
		.max(MAX_UNIT_LENGTH, `a unit can be at most ${MAX_UNIT_LENGTH} characters`)
		.nullable()
		.optional(),
	role: z.enum(['input', 'output'], { error: 'a column role must be "input" or "output"' })
});

/** The JSON body that creates a dataset: `{ name, columns: [{ name, unit?, role }], rows: number[][] }`. */
export const datasetJsonSchema = z
	.object({
		name: z
			.string({ error: 'name is required and must be text' })
			.trim()
			.min(1, 'name cannot be empty')
			.max(MAX_NAME_LENGTH, `name can be at most ${MAX_NAME_LENGTH} characters`),
		columns: z
			.array(columnSchema, { error: 'columns must be a list of { name, unit?, role }' })
			.min(1, 'a dataset needs at least 1 column')
			.max(MAX_COLUMNS, `a dataset can have at most ${MAX_COLUMNS} columns (the limit)`),
		rows: z
			.array(z.array(z.number({ error: 'each cell must be a finite number' }), { error: 'each row must be a list of numbers' }), {
				error: 'rows must be a list of rows'
			})
			.max(MAX_ROWS, `a dataset can have at most ${formatCount(MAX_ROWS)} rows (the limit)`)
	})
	.superRefine((body, ctx) => {
		const names = new Set<string>();
		body.columns.forEach((column, i) => {
			if (names.has(column.name)) {
				ctx.addIssue({
					code: 'custom',
					path: ['columns', i, 'name'],
					message: `column name "${column.name}" is used twice; column names must be unique`
				});
			}
			names.add(column.name);
		});
		const width = body.columns.length;
		let reported = 0;
		let unreported = 0;
		body.rows.forEach((row, i) => {
			if (row.length === width) return;
			if (reported === MAX_ROW_ISSUES) {
				unreported++;
				return;
			}
			ctx.addIssue({
				code: 'custom',
				path: ['rows', i],
				message: `row ${i + 1} has ${row.length} value${row.length === 1 ? '' : 's'}; there are ${width} columns`
			});
			reported++;
		});
		if (unreported > 0) {
			ctx.addIssue({
				code: 'custom',
				path: ['rows'],
				message: `${formatCount(unreported)} more rows do not have ${width} values (not listed)`
			});
		}
	});

export type DatasetJson = z.infer<typeof datasetJsonSchema>;
