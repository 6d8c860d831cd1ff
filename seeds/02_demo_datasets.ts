import type { Knex } from 'knex';
import { mulberry32 } from '../src/lib/numerics/math';
import { parseTable } from '../src/lib/server/datasets/parseTable';
import { sha256 } from '../src/lib/server/tokens';
import type { Role } from '../src/lib/server/datasets/types';
import { validateTable } from '../src/lib/server/datasets/validateTable';
import { create } from '../src/lib/server/datasets/store';
import { DEMO_EMAIL, DEMO_WORKSPACE } from './01_demo_accounts';

// Demo tables for the invented "Larkmoor Aero" electric-aircraft maker. Every
// number is made up: plausible shapes from simple physical models plus a little
// seeded noise where a test stand would add some. The same seed gives the same
// bytes on every run; a table already present under its name is left alone.

interface DemoTable {
	name: string;
	description: string;
	filename: string;
	header: string[];
	rows: string[][];
	roles?: Record<string, Role>;
}

/** Normal deviates from a fixed seed (Box–Muller on Mulberry32). */
function noise(seed: number): (sd: number) => number {
	const u = mulberry32(seed);
	return (sd) => sd * Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
}

const range = (from: number, to: number, step: number) => Array.from({ length: Math.round((to - from) / step) + 1 }, (_, i) => from + i * step);

function propeller(): DemoTable {
	const n = noise(1801);
	// η = J·C_T/C_P. η rises with J to a peak near J ≈ 0.75 and falls to zero
	// thrust near J ≈ 1.12; sampled every 0.1, so a linear lookup has a corner at
	// the peak where a gradient-based optimizer stops.
	const rows = range(0.1, 1.1, 0.1).map((J) => {
		const eta = 1.8 * J * Math.sqrt(1.12 - J) + n(0.004);
		const cp = 0.046 - 0.012 * J * J + n(0.0003);
		const ct = (eta * cp) / J;
		return [J.toFixed(2), eta.toFixed(4), ct.toFixed(5), cp.toFixed(5)];
	});
	return {
		name: 'Propeller efficiency vs advance ratio',
		description:
			'Invented demo data (Larkmoor Aero is a made-up company): a 1.6 m two-blade propeller swept in advance ratio at 2,400 rpm. Deliberately coarse (steps of 0.1), so the piecewise-linear fit has a kink right at the efficiency peak.',
		filename: 'larkmoor-prop-sweep.csv',
		header: ['J [-]', 'eta [-]', 'CT [-]', 'CP [-]'],
		rows
	};
}

function motorMap(): DemoTable {
	const n = noise(2207);
	// Efficiency = P_out / (P_out + copper + iron + friction + fixed losses).
	const rows: string[][] = [];
	for (const speed of range(500, 4000, 500)) {
		for (const torque of [5, 10, 20, 30, 40, 55, 70, 85]) {
			const w = (speed * 2 * Math.PI) / 60;
			const out = torque * w;
			const losses = 0.35 * torque * torque + 0.004 * w ** 1.8 + 0.05 * w + 35;
			const eta = out / (out + losses) + n(0.0015);
			rows.push([String(torque), String(speed), eta.toFixed(4)]);
		}
	}
	return {
		name: 'Motor efficiency map',
		description:
			'Invented demo data (Larkmoor Aero is a made-up company): efficiency of the LM-40 propulsion motor on a full torque × speed grid, 8 × 8 points, from a simple loss model with test-stand scatter.',
		filename: 'larkmoor-motor-map.csv',
		header: ['torque [N·m]', 'speed [rpm]', 'efficiency [-]'],
		rows,
		roles: { torque: 'input', speed: 'input', efficiency: 'output' }
	};
}

function battery(): DemoTable {
	const n = noise(3119);
	// 96 cells in series; open-circuit voltage with the knee at low charge and a flat middle.
	const rows = range(0, 100, 5).map((soc) => {
		const s = soc / 100;
		const cell = 3.42 + 0.62 * s + 0.12 * Math.tanh((s - 0.75) * 6) * 0.5 - 0.42 * Math.exp(-s * 14) + n(0.002);
		return [String(soc), (96 * cell).toFixed(2)];
	});
	return {
		name: 'Battery pack voltage vs state of charge',
		description:
			'Invented demo data (Larkmoor Aero is a made-up company): resting voltage of the 96-cell pack against state of charge. Solve for the charge at the 300 V cut-off.',
		filename: 'larkmoor-pack-ocv.csv',
		header: ['state of charge [%]', 'pack voltage [V]'],
		rows
	};
}

function dragPolar(): DemoTable {
	const n = noise(4423);
	// Parabolic polar around the minimum-drag lift, with drag rising steeply towards stall.
	const rows = range(-0.2, 1.4, 0.1).map((cl) => {
		const cd = 0.0215 + 0.041 * (cl - 0.18) ** 2 + 0.09 * Math.max(0, cl - 1.1) ** 2 * 6 + n(0.0002);
		return [cl.toFixed(2), cd.toFixed(5)];
	});
	return {
		name: 'Wing drag coefficient vs lift coefficient',
		description:
			'Invented demo data (Larkmoor Aero is a made-up company): wind-tunnel style drag polar of the LA-2 wing at cruise Reynolds number. Minimise drag, or maximise L/D, subject to a lift constraint.',
		filename: 'larkmoor-wing-polar.csv',
		header: ['CL [-]', 'CD [-]'],
		rows
	};
}

function fan(): DemoTable {
	// Monotone falling fan curve; no noise, so the data stay strictly decreasing.
	const rows = range(0, 0.5, 0.05).map((q) => {
		const dp = 410 * (1 - (q / 0.54) ** 2) - 60 * q;
		return [q.toFixed(2), dp.toFixed(1)];
	});
	return {
		name: 'Cooling-fan pressure rise vs flow',
		description:
			'Invented demo data (Larkmoor Aero is a made-up company): pressure rise of the motor cooling fan against volume flow. The curve falls monotonically; a fit that adds a bump would mislead a duct-matching solve.',
		filename: 'larkmoor-cooling-fan.csv',
		header: ['flow [m³/s]', 'pressure rise [Pa]'],
		rows
	};
}

export async function seed(knex: Knex): Promise<void> {
	const ws = await knex('workspaces').where({ slug: DEMO_WORKSPACE }).first('id');
	const user = await knex('users').where({ email: DEMO_EMAIL }).first('id');
	if (!ws) throw new Error(`seed 02: the demo workspace "${DEMO_WORKSPACE}" is missing; run seed 01 first`);

	for (const table of [propeller(), motorMap(), battery(), dragPolar(), fan()]) {
		const present = await knex('datasets').where({ workspace_id: ws.id, name: table.name }).first('id');
		if (present) continue;
		const csv = [table.header, ...table.rows].map((r) => r.join(',')).join('\n') + '\n';
		const bytes = new TextEncoder().encode(csv);
		const parsed = await parseTable({ bytes, filename: table.filename });
		const report = validateTable(parsed, table.roles);
		if (!report.ok || !report.data || !report.shape) {
			throw new Error(`seed 02: demo table "${table.name}" does not validate: ${report.errors.map((e) => e.message).join('; ')}`);
		}
		await create(knex, {
			workspaceId: ws.id,
			name: table.name,
			description: table.description,
			shape: report.shape,
			shapeReason: report.shapeReason,
			columns: report.columns,
			data: report.data,
			rowCount: report.rowCount,
			sourceFormat: parsed.format,
			sourceFilename: table.filename,
			sourceBytes: bytes,
			sourceSha256: sha256(bytes),
			notes: report.notes,
			warnings: report.warnings,
			createdBy: user?.id ?? null
		});
	}
}
