// The study record for the design review: one self-contained HTML page
// (inline styles and charts, a print stylesheet) and a PDF printed from it by
// Debian's Chromium in headless mode.
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Knex } from 'knex';
import { CAUTION } from '../../caution';
import { fitFromJSON, isSurfaceFitFile, surfaceFromJSON } from '../../numerics/fits';
import { fail4xx } from '../api';
import { scorecard } from './scorecard';
import * as store from './store';
import { version as KINKLESS_VERSION } from '../../../../package.json';

const CHROMIUM = process.env.KINKLESS_CHROMIUM ?? '/usr/bin/chromium';
const PDF_TIMEOUT_MS = 60_000;
const CHART_W = 520;
const CHART_H = 220;
const CHART_SAMPLES = 300;

const esc = (v: unknown) =>
	String(v ?? '').replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
const fmt = (v: number | null | undefined) => {
	if (v === null || v === undefined || !Number.isFinite(v)) return '—';
	const a = Math.abs(v);
	return a !== 0 && (a >= 1e5 || a < 1e-3) ? v.toExponential(3) : String(Number(v.toPrecision(5)));
};
const when = (d: Date | string | null) => (d ? new Date(d).toISOString().replace('T', ' ').slice(0, 16) + ' UTC' : '—');
const label = (c: { name: string; unit: string | null }) => (c.unit ? `${c.name} [${c.unit}]` : c.name);

/** A small line chart (curve plus optional points and a marked x) as inline SVG, with title and axis labels. */
function lineChart(o: { title: string; xLabel: string; yLabel: string; x: number[]; y: number[]; points?: { x: number[]; y: number[] }; mark?: number | null }): string {
	const m = { l: 58, r: 12, t: 26, b: 40 };
	const xs = [...o.x, ...(o.points?.x ?? [])];
	const ys = [...o.y, ...(o.points?.y ?? [])].filter(Number.isFinite);
	const [x0, x1] = [Math.min(...xs), Math.max(...xs)];
	let [y0, y1] = [Math.min(...ys), Math.max(...ys)];
	if (y1 - y0 < 1e-12 * Math.max(1, Math.abs(y1))) [y0, y1] = [y0 - 1, y1 + 1];
	const px = (x: number) => m.l + ((x - x0) / (x1 - x0 || 1)) * (CHART_W - m.l - m.r);
	const py = (y: number) => CHART_H - m.b - ((y - y0) / (y1 - y0)) * (CHART_H - m.t - m.b);
	const path = o.x.map((x, i) => `${i ? 'L' : 'M'}${px(x).toFixed(1)},${py(o.y[i]).toFixed(1)}`).join('');
	const ticks = (a: number, b: number) => [0, 0.25, 0.5, 0.75, 1].map((t) => a + t * (b - a));
	const tick = (v: number) => (Math.abs(v) < 1e-12 * Math.max(Math.abs(y0), Math.abs(y1), 1) ? '0' : String(Number(v.toPrecision(3))));
	const dots = (o.points?.x ?? []).map((x, i) => `<circle cx="${px(x).toFixed(1)}" cy="${py(o.points!.y[i]).toFixed(1)}" r="2.5" fill="#333"/>`).join('');
	const mark = o.mark != null && Number.isFinite(o.mark) ? `<line x1="${px(o.mark)}" x2="${px(o.mark)}" y1="${m.t}" y2="${CHART_H - m.b}" stroke="#c2410c" stroke-dasharray="4 3"/>` : '';
	return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${CHART_W} ${CHART_H}" width="${CHART_W}" height="${CHART_H}" role="img" aria-label="${esc(o.title)}" font-family="system-ui, sans-serif" font-size="10">
<title>${esc(o.title)}</title><rect width="100%" height="100%" fill="#fff"/>
<text x="${m.l}" y="15" font-size="12" font-weight="600">${esc(o.title)}</text>
${ticks(x0, x1).map((t) => `<line x1="${px(t)}" x2="${px(t)}" y1="${m.t}" y2="${CHART_H - m.b}" stroke="#eee"/><text x="${px(t)}" y="${CHART_H - m.b + 13}" text-anchor="middle">${tick(t)}</text>`).join('')}
${ticks(y0, y1).map((t) => `<line x1="${m.l}" x2="${CHART_W - m.r}" y1="${py(t)}" y2="${py(t)}" stroke="#eee"/><text x="${m.l - 4}" y="${py(t) + 3}" text-anchor="end">${tick(t)}</text>`).join('')}
<path d="${path}" fill="none" stroke="#0f766e" stroke-width="1.6"/>${dots}${mark}
<text x="${(m.l + CHART_W - m.r) / 2}" y="${CHART_H - 8}" text-anchor="middle">${esc(o.xLabel)}</text>
<text transform="translate(12 ${(m.t + CHART_H - m.b) / 2}) rotate(-90)" text-anchor="middle">${esc(o.yLabel)}</text>
</svg>`;
}

interface RecordOptions {
	/** a note printed under the title (e.g. "shared read-only") */
	note?: string;
}

/** The record as one HTML document. */
async function studyRecordHtml(db: Knex, study: store.Study, opts: RecordOptions = {}): Promise<string> {
	if (store.isActive(study.status)) fail4xx(409, 'the study is still running; its record is ready when it finishes', 'study-running');
	if (study.status === 'failed') fail4xx(409, `this study failed${study.error ? ` (${study.error})` : ''}; there is no record to review`, 'study-failed');
	const spec = study.spec;
	const fits = await store.fits(db, study.id);
	const card = await scorecard(db, study, fits);
	const rows = await db('study_fits').where({ study_id: study.id }).orderBy('position').select('id', 'fit');
	const ds = await db('datasets').where({ id: study.datasetId }).first('source_sha256');
	const xLabel = label(spec.dataset.input);
	const yLabel = label(spec.dataset.output);
	const picked = study.pick ? fits.find((f) => f.id === study.pick!.fitId) : null;
	const pickedRow = study.pick ? rows.find((r) => r.id === study.pick!.fitId) : null;
	const bestOf = (fitId: string) => card.filter((c) => c.fitId === fitId).sort((a, b) => a.rank - b.rank)[0];

	const charts: string[] = [];
	const chartFits = pickedRow ? [pickedRow, ...rows.filter((r) => r.id !== pickedRow.id)] : rows;
	const inputs = spec.dataset.inputs?.length ? spec.dataset.inputs : [spec.dataset.input];
	for (const r of chartFits.slice(0, 4)) {
		if (isSurfaceFitFile(typeof r.fit === 'string' ? JSON.parse(r.fit) : r.fit)) {
			// several inputs: slices of the fit through its best end point (or the bounds' centre), along each input for the pick, the first for the others
			const fit = surfaceFromJSON(r.fit);
			const isPick = r.id === pickedRow?.id;
			const through = bestOf(r.id)?.best?.x ?? spec.problem.bounds.map(([lo, hi]) => (lo + hi) / 2);
			for (let k = 0; k < (isPick ? fit.dimension : 1); k++) {
				const [lo, hi] = spec.problem.bounds[k];
				const x = Array.from({ length: CHART_SAMPLES + 1 }, (_, i) => (i === CHART_SAMPLES ? hi : lo + ((hi - lo) * i) / CHART_SAMPLES));
				const y = x.map((v) => {
					const p = through.slice();
					p[k] = v;
					try {
						return fit.value(p);
					} catch {
						return Number.NaN; // outside the data under the refuse rule
					}
				});
				const others = inputs.flatMap((c, j) => (j === k ? [] : [`${c.name} = ${fmt(through[j])}`])).join(', ');
				charts.push(lineChart({ title: `${fit.method}${isPick ? ' (picked)' : ''}: ${spec.dataset.output.name} against ${inputs[k].name} at ${others}`, xLabel: label(inputs[k]), yLabel, x, y, mark: through[k] }));
			}
			continue;
		}
		const fit = fitFromJSON(r.fit);
		const [lo, hi] = fit.domain;
		const x = Array.from({ length: CHART_SAMPLES + 1 }, (_, i) => (i === CHART_SAMPLES ? hi : lo + ((hi - lo) * i) / CHART_SAMPLES));
		const s = fit.evaluateMany(x);
		const best = bestOf(r.id)?.best?.x?.[0] ?? null;
		const isPick = r.id === pickedRow?.id;
		charts.push(lineChart({ title: `${fit.method}${isPick ? ' (picked)' : ''}: ${spec.dataset.output.name} against ${spec.dataset.input.name}`, xLabel, yLabel, x, y: Array.from(s.f), mark: best }));
		if (isPick) {
			charts.push(lineChart({ title: `${fit.method} (picked): slope f′`, xLabel, yLabel: `d${spec.dataset.output.name}/d${spec.dataset.input.name}`, x, y: Array.from(s.df), mark: best }));
		}
	}

	const problem = spec.problem;
	const question = `${problem.kind} ${spec.dataset.output.name}${problem.target !== undefined ? ` = ${problem.target}` : ''} over ${inputs.map((c, k) => `${c.name} in [${(problem.bounds[k] ?? []).map(fmt).join(', ')}]`).join(', ')}${
		problem.constraints.length ? `, subject to ${problem.constraints.map((c) => `${c.output} ${c.op} ${c.value}`).join(', ')}` : ''
	}`;
	const css = `
body { font: 13px/1.45 system-ui, sans-serif; color: #1f2328; margin: 24px auto; max-width: 1000px; padding: 0 16px; }
h1 { font-size: 22px; margin: 0 0 4px; } h2 { font-size: 15px; margin: 22px 0 6px; border-bottom: 1px solid #ddd; padding-bottom: 3px; }
table { border-collapse: collapse; width: 100%; font-size: 11.5px; } th, td { border: 1px solid #ddd; padding: 3px 6px; text-align: left; vertical-align: top; }
th { background: #f4f2ec; } td.n { text-align: right; font-variant-numeric: tabular-nums; } tr.pick { background: #e6f4f1; }
dl { display: grid; grid-template-columns: 11rem 1fr; gap: 2px 12px; margin: 0; } dt { color: #555; } dd { margin: 0; overflow-wrap: anywhere; }
.scroll { overflow-x: auto; }
@media (max-width: 640px) { dl { grid-template-columns: 1fr; } dt { margin-top: 4px; } }
.caution { border: 2px solid #c2410c; background: #fff7ed; padding: 8px 10px; margin: 14px 0; font-weight: 500; }
.charts { display: flex; flex-wrap: wrap; gap: 12px; } .charts svg { max-width: 100%; height: auto; border: 1px solid #eee; }
.note { color: #555; } .actions { margin: 8px 0 16px; } .actions a { margin-right: 12px; }
@page { size: A4; margin: 14mm; }
@media print { body { margin: 0; max-width: none; padding: 0; font-size: 11px; } .actions { display: none; } h2 { break-after: avoid; } table, .charts svg, .caution, dl { break-inside: avoid; } a { color: inherit; text-decoration: none; } }
`;
	return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>Study record — ${esc(study.name)}</title><style>${css}</style></head>
<body>
<h1>Study record: ${esc(study.name)}</h1>
<p class="note">For the design review. Written by Kinkless ${esc(KINKLESS_VERSION)} on ${esc(when(new Date()))}.${opts.note ? ` ${esc(opts.note)}` : ''}</p>
<p class="actions"><a href="?format=pdf" data-testid="record-pdf">Download as PDF</a><span class="note">or print this page (print layout included)</span></p>
<p class="caution" data-testid="caution">${esc(CAUTION)}</p>
<h2>Question</h2><p>${esc(question)}</p>
<h2>Dataset</h2>
<dl><dt>name</dt><dd>${esc(spec.dataset.name)}, version ${esc(spec.dataset.version)}</dd>
<dt>SHA-256 of the upload</dt><dd>${esc(ds?.source_sha256 ?? '—')}</dd>
<dt>input</dt><dd>${esc(xLabel)}</dd><dt>output</dt><dd>${esc(yLabel)}</dd></dl>
<h2>Fits and optimizers</h2>
<dl><dt>fits</dt><dd>${fits.map((f) => `${esc(f.method)} (${esc(f.continuity)}${f.smoothness?.measured ? `, measured ${esc(f.smoothness.measured)}` : ''})`).join('; ')}</dd>
<dt>optimizers</dt><dd>${spec.optimizers.map((o) => esc(o.method)).join(', ')}</dd>
<dt>starts</dt><dd>${esc(JSON.stringify(spec.starts))}</dd>
<dt>budgets per run</dt><dd>${esc(`${spec.budgets.maxIterations} iterations, ${spec.budgets.maxEvaluations} evaluations, ${spec.budgets.maxMilliseconds} ms`)}</dd>
<dt>run by</dt><dd>${esc(study.createdBy?.name ?? '—')}, started ${esc(when(study.startedAt ?? study.createdAt))}, finished ${esc(when(study.finishedAt))}</dd></dl>
<h2>Scorecard</h2>
<div class="scroll"><table><thead><tr><th>#</th><th>fit</th><th>optimizer</th><th>verdict</th><th>continuity</th><th class="n">success</th><th class="n">median iterations</th><th class="n">best f*</th><th class="n">at x*</th><th class="n">LOO RMSE</th></tr></thead><tbody>
${card
	.map(
		(r) =>
			`<tr${r.fitId === study.pick?.fitId ? ' class="pick"' : ''}><td class="n">${r.rank}</td><td>${esc(r.method)}${r.fitId === study.pick?.fitId ? ' (picked)' : ''}</td><td>${esc(r.optimizer)}</td><td>${esc(r.verdict.label)}</td><td>${esc(r.continuity.declared)} / ${esc(r.continuity.measured ?? '—')}</td><td class="n">${fmt(100 * r.successRate)} %</td><td class="n">${fmt(r.medianIterations)}</td><td class="n">${fmt(r.best?.f)}</td><td class="n">${r.best ? r.best.x.map(fmt).join(', ') : '—'}</td><td class="n">${fmt(r.fidelity?.looRmse)}</td></tr>`
	)
	.join('\n')}
</tbody></table></div>
<h2>The pick</h2>
${
	study.pick && picked
		? `<dl data-testid="record-pick"><dt>fit</dt><dd>${esc(picked.method)} (${esc(picked.continuity)})</dd><dt>rationale</dt><dd>${esc(study.pick.rationale)}</dd><dt>picked by</dt><dd>${esc(study.pick.by ?? '—')}, ${esc(when(study.pick.at))}</dd>${
				bestOf(picked.id)?.best ? `<dt>optimum on this fit</dt><dd>${inputs.map((c, k) => `${esc(c.name)} = ${fmt(bestOf(picked.id)!.best!.x[k])}`).join(', ')}, ${esc(spec.dataset.output.name)} = ${fmt(bestOf(picked.id)!.best!.f)}</dd>` : ''
			}</dl>`
		: '<p>No fit has been picked yet.</p>'
}
<h2>Key charts</h2>
<div class="charts">${charts.join('\n')}</div>
<p class="note">Dashed line: where the best run on that fit ended.</p>
<p class="caution">${esc(CAUTION)}</p>
</body></html>
`;
}

/** The record printed to PDF by headless Chromium. */
async function studyRecordPdf(html: string): Promise<Buffer> {
	if (!existsSync(CHROMIUM)) fail4xx(503, 'PDF export needs Chromium on the server (apt-get install chromium); print the record page from the browser instead', 'pdf-unavailable');
	const dir = await mkdtemp(join(tmpdir(), 'kinkless-record-'));
	try {
		const page = join(dir, 'record.html');
		const out = join(dir, 'record.pdf');
		await writeFile(page, html);
		await new Promise<void>((resolve, reject) => {
			const child = spawn(
				CHROMIUM,
				['--headless', '--no-sandbox', '--disable-gpu', '--disable-dev-shm-usage', '--no-pdf-header-footer', `--user-data-dir=${join(dir, 'profile')}`, `--print-to-pdf=${out}`, pathToFileURL(page).href],
				{ stdio: 'ignore' }
			);
			const timer = setTimeout(() => {
				child.kill('SIGKILL');
				reject(new Error('Chromium timed out printing the record'));
			}, PDF_TIMEOUT_MS);
			child.on('error', reject);
			child.on('exit', (code) => {
				clearTimeout(timer);
				if (code === 0 && existsSync(out)) resolve();
				else reject(new Error(`Chromium exited with ${code} printing the record`));
			});
		});
		return await readFile(out);
	} finally {
		await rm(dir, { recursive: true, force: true });
	}
}

/** The record as a response: HTML, or PDF with `?format=pdf`. */
export async function studyRecordResponse(db: Knex, study: store.Study, url: URL, opts: RecordOptions = {}): Promise<Response> {
	const format = url.searchParams.get('format') ?? 'html';
	if (format !== 'html' && format !== 'pdf') fail4xx(400, 'format must be html or pdf', 'invalid', [{ field: 'format', problem: 'must be html or pdf' }]);
	const html = await studyRecordHtml(db, study, opts);
	const stem = `study-record-${study.name}`.normalize('NFKD').replace(/[^A-Za-z0-9._-]+/g, '-').replace(/-+/g, '-').replace(/^-|-$/g, '').slice(0, 100);
	if (format === 'html') return new Response(html, { headers: { 'content-type': 'text/html; charset=utf-8', 'cache-control': 'private, no-store' } });
	const pdf = await studyRecordPdf(html);
	return new Response(new Uint8Array(pdf), {
		headers: { 'content-type': 'application/pdf', 'content-disposition': `attachment; filename="${stem}.pdf"`, 'cache-control': 'private, no-store' }
	});
}
