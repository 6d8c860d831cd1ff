/** "row 4", "rows 3 and 5", "rows 3, 5 and 8", "rows 3, 5, 8, … (14 rows)". */
export function rowList(rows: number[], max = 10): string {
	if (rows.length === 1) return `row ${rows[0]}`;
	if (rows.length <= max) return `rows ${rows.slice(0, -1).join(', ')} and ${rows[rows.length - 1]}`;
	return `rows ${rows.slice(0, max).join(', ')}, … (${rows.length} rows)`;
}
