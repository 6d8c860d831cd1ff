/**
 * Workbook reading benchmark (part of `npm run bench:fits`). Not a test: it
 * prints a table and exits 0.
 *
 * One invented 4-column sweep of BENCH_UPLOAD_ROWS rows (default 200,000) is
 * written as XLSX and as CSV, then each reader runs in a fresh child process so
 * that its peak memory is its own:
 * - ours: parseWorkbook, exceljs's streaming reader stopping at the limits;
 * - reference: exceljs loading the whole workbook (`workbook.xlsx.load`), the
 *   way the upload path read workbooks before, measured in the same run;
 * - for scale: our CSV reader on the same table.
 * Then the same two readers on a workbook over the row limit (1,100,000 rows of
 * two numbers, its ZIP directory rewritten to declare 1 KB per part, as a
 * decompression bomb would): ours stops at row 1,000,003 with the limit named;
 * the reference (which refuses the lying directory outright) reads an honest
 * copy of the same workbook all the way through.
 * Printed: wall time and the rise in resident memory (peak RSS sampled every
 * 10 ms, less the RSS before reading), and ours / reference ratios.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import ExcelJS from 'exceljs';
import JSZip from 'jszip';
import { DatasetError } from '../../src/lib/server/datasets/datasetError';
import { parseWorkbook } from '../../src/lib/server/datasets/parseWorkbook';
import { parseDelimited } from '../../src/lib/server/datasets/parseDelimited';

type Measure = { ms: number; rssMb: number; rows: number };

async function measure(kind: string, file: string): Promise<Measure> {
	const bytes = new Uint8Array(readFileSync(file));
	const before = process.memoryUsage().rss;
	let peak = before;
	const sampler = setInterval(() => (peak = Math.max(peak, process.memoryUsage().rss)), 10);
	const t0 = performance.now();
	let rows = 0;
	if (kind === 'stream') {
		try {
			rows = (await parseWorkbook(bytes)).rows.length;
		} catch (e) {
			if (!(e instanceof DatasetError) || e.code !== 'too-many-rows') throw e;
			rows = -1; // stopped at the row limit
		}
	}
	else if (kind === 'whole') {
		const wb = new ExcelJS.Workbook();
		await wb.xlsx.load(Buffer.from(bytes) as never);
		const ws = wb.worksheets[0];
		ws.eachRow((row) => {
			row.eachCell(() => undefined);
			rows++;
		});
		rows -= 1; // the header
	} else rows = parseDelimited(new TextDecoder().decode(bytes)).rows.length;
	const ms = performance.now() - t0;
	peak = Math.max(peak, process.memoryUsage().rss);
	clearInterval(sampler);
	return { ms, rssMb: (peak - before) / 1024 / 1024, rows };
}

/** A header row and `rows` rows of two numbers written by hand, every declared size in the ZIP directory rewritten to 1 KB. */
async function lyingWorkbook(rows: number, lie = true): Promise<Uint8Array> {
	const wb = new ExcelJS.Workbook();
	wb.addWorksheet('Sweep').addRow(['x', 'y']);
	const zip = await JSZip.loadAsync(await wb.xlsx.writeBuffer());
	const body: string[] = ['<?xml version="1.0" encoding="UTF-8" standalone="yes"?><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>'];
	body.push('<row r="1"><c r="A1" t="inlineStr"><is><t>x</t></is></c><c r="B1" t="inlineStr"><is><t>y</t></is></c></row>');
	for (let i = 2; i <= rows + 1; i++) body.push(`<row r="${i}"><c r="A${i}"><v>${i}</v></c><c r="B${i}"><v>2.5</v></c></row>`);
	body.push('</sheetData></worksheet>');
	zip.file('xl/worksheets/sheet1.xml', body.join(''));
	const bytes = await zip.generateAsync({ type: 'uint8array', compression: 'DEFLATE', compressionOptions: { level: 9 } });
	const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
	if (lie) for (let i = 0; i + 46 < bytes.byteLength; i++) if (view.getUint32(i, true) === 0x02014b50) view.setUint32(i + 24, 1024, true);
	return bytes;
}

async function main() {
	const [, , role, kind, file] = process.argv;
	if (role === '--child') {
		process.stdout.write(JSON.stringify(await measure(kind, file)));
		return;
	}
	const n = Number(process.env.BENCH_UPLOAD_ROWS ?? 200_000);
	const dir = mkdtempSync(path.join(os.tmpdir(), 'kinkless-bench-'));
	try {
		const wb = new ExcelJS.Workbook();
		const ws = wb.addWorksheet('Sweep');
		ws.addRow(['speed [rpm]', 'torque [N m]', 'current [A]', 'efficiency [-]']);
		const csv = ['speed [rpm],torque [N m],current [A],efficiency [-]'];
		for (let i = 0; i < n; i++) {
			const s = 1000 + (9000 * i) / n;
			const row = [s, 40 * Math.sin(s / 3000), 2 + s / 500, 0.7 + 0.2 * Math.cos(s / 4000)];
			ws.addRow(row);
			csv.push(row.join(','));
		}
		const xlsx = path.join(dir, 'sweep.xlsx');
		const text = path.join(dir, 'sweep.csv');
		await wb.xlsx.writeFile(xlsx);
		writeFileSync(text, csv.join('\n') + '\n');
		const run = (kind: string, file = kind === 'csv' ? text : xlsx): Measure => {
			const r = spawnSync(process.execPath, [...process.execArgv, process.argv[1], '--child', kind, file], { encoding: 'utf8', maxBuffer: 1 << 20 });
			if (r.status !== 0) throw new Error(`${kind} reader failed: ${r.stderr}`);
			return JSON.parse(r.stdout) as Measure;
		};
		const ours = run('stream');
		const reference = run('whole');
		const csvRead = run('csv');
		if (ours.rows !== n || reference.rows !== n || csvRead.rows !== n) throw new Error(`row counts differ: ${ours.rows}, ${reference.rows}, ${csvRead.rows} (expected ${n})`);
		const line = (name: string, m: Measure) => `${name.padEnd(44)} ${m.ms.toFixed(0).padStart(7)} ms ${m.rssMb.toFixed(0).padStart(7)} MB`;
		console.log(`\nworkbook reading: ${n.toLocaleString('en-US')} rows × 4 columns (XLSX ${(readFileSync(xlsx).byteLength / 1024 / 1024).toFixed(1)} MB)`);
		console.log(line('ours: streaming, stopping at limits', ours));
		console.log(line('reference: exceljs whole-workbook load', reference));
		console.log(line('for scale: our CSV reader, same table', csvRead));
		console.log(`ours / reference: time ${(ours.ms / reference.ms).toFixed(2)}, memory rise ${(ours.rssMb / Math.max(1, reference.rssMb)).toFixed(2)}`);

		const bomb = path.join(dir, 'liar.xlsx');
		const honest = path.join(dir, 'honest.xlsx');
		writeFileSync(bomb, await lyingWorkbook(1_100_000));
		writeFileSync(honest, await lyingWorkbook(1_100_000, false));
		const stopped = run('stream', bomb);
		// the whole-workbook reader checks declared sizes as it inflates, so it reads the honest copy
		const readAll = run('whole', honest);
		if (stopped.rows !== -1 || readAll.rows !== 1_100_000) throw new Error(`bomb: ours read ${stopped.rows} rows (expected a stop), reference ${readAll.rows}`);
		console.log(`\nover the row limit: 1,100,000 rows, directory declaring 1 KB per part (XLSX ${(readFileSync(bomb).byteLength / 1024 / 1024).toFixed(1)} MB)`);
		console.log(line('ours: stopped at the row limit', stopped));
		console.log(line('reference: exceljs whole-workbook load', readAll));
		console.log(`ours / reference: time ${(stopped.ms / readAll.ms).toFixed(2)}, memory rise ${(stopped.rssMb / Math.max(1, readAll.rssMb)).toFixed(2)}`);
	} finally {
		rmSync(dir, { recursive: true, force: true });
	}
}

await main();
