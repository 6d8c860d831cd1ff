// A project-local PostgreSQL cluster on loopback, made with Debian's initdb/pg_ctl.
// Trust authentication is used only because the cluster listens on 127.0.0.1 and
// belongs to this checkout; with DATABASE_URL set, none of this runs.
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, chmodSync, statSync } from 'node:fs';
import path from 'node:path';

const PG_VERSIONS = ['17', '16', '15'];

export function findPgBin() {
	if (process.env.PGBIN && existsSync(path.join(process.env.PGBIN, 'initdb'))) return process.env.PGBIN;
	for (const v of PG_VERSIONS) {
		const dir = `/usr/lib/postgresql/${v}/bin`;
		if (existsSync(path.join(dir, 'initdb'))) return dir;
	}
	return null;
}

const isRoot = () => typeof process.getuid === 'function' && process.getuid() === 0;

/** Find the server binaries, installing Debian's `postgresql` package when we are root and nobody is watching. */
export function ensurePgBin(log = console.log) {
	let bin = findPgBin();
	if (bin) return bin;
	const cmd = 'apt-get update && apt-get install -y postgresql';
	if (isRoot() && (!process.stdin.isTTY || process.env.CI)) {
		log(`PostgreSQL server binaries not found; installing Debian's postgresql package (${cmd})`);
		execFileSync('sh', ['-c', `DEBIAN_FRONTEND=noninteractive ${cmd}`], { stdio: 'inherit' });
		bin = findPgBin();
		if (bin) return bin;
	}
	throw new Error(`PostgreSQL server binaries not found under /usr/lib/postgresql/*/bin. Install Debian's package: sudo ${cmd}`);
}

function asPostgres(bin, args, opts = {}) {
	const full = isRoot() ? ['runuser', ['-u', 'postgres', '--', bin, ...args]] : [bin, args];
	const r = spawnSync(full[0], full[1], { encoding: 'utf8', ...opts });
	if (r.status !== 0) throw new Error(`${path.basename(bin)} failed (${r.status}): ${r.stderr || r.stdout}`);
	return r.stdout;
}

/** Every parent directory must be searchable by the postgres user. */
function makeReachable(dir) {
	if (!isRoot()) return;
	let d = path.resolve(dir);
	const parents = [];
	while (d !== path.dirname(d)) {
		d = path.dirname(d);
		parents.push(d);
	}
	for (const p of parents) {
		const mode = statSync(p).mode;
		if ((mode & 0o001) === 0) chmodSync(p, mode | 0o001);
	}
}

/**
 * Start (initialising on first use) a cluster in `dataDir` on 127.0.0.1:`port`.
 * Returns { url(db), createDatabase(db), stop() }.
 */
export function startCluster({ dataDir, port, log = console.log }) {
	const bin = ensurePgBin(log);
	const initdb = path.join(bin, 'initdb');
	const pgctl = path.join(bin, 'pg_ctl');
	const psql = path.join(bin, 'psql');
	makeReachable(dataDir);
	if (!existsSync(path.join(dataDir, 'PG_VERSION'))) {
		mkdirSync(dataDir, { recursive: true, mode: 0o700 });
		if (isRoot()) execFileSync('chown', ['postgres:postgres', dataDir]);
		chmodSync(dataDir, 0o700);
		log(`initialising PostgreSQL cluster in ${dataDir}`);
		asPostgres(initdb, ['-D', dataDir, '-U', 'app', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8']);
	}
	const status = spawnSync(isRoot() ? 'runuser' : pgctl, isRoot() ? ['-u', 'postgres', '--', pgctl, '-D', dataDir, 'status'] : ['-D', dataDir, 'status'], { encoding: 'utf8' });
	if (status.status !== 0) {
		asPostgres(pgctl, [
			'-D', dataDir, '-l', path.join(dataDir, 'server.log'), '-w', '-t', '60',
			'-o', `-c listen_addresses=127.0.0.1 -p ${port} -c unix_socket_directories=${dataDir} -c fsync=off`,
			'start'
		]);
	}
	const url = (db) => `postgres://app@127.0.0.1:${port}/${db}`;
	let stopped = false;
	return {
		url,
		createDatabase(db) {
			const exists = spawnSync(psql, ['-h', '127.0.0.1', '-p', String(port), '-U', 'app', '-d', 'postgres', '-tAc', `SELECT 1 FROM pg_database WHERE datname = '${db}'`], { encoding: 'utf8' });
			if (exists.status !== 0) throw new Error(`psql failed: ${exists.stderr}`);
			if (exists.stdout.trim() !== '1') {
				const r = spawnSync(psql, ['-h', '127.0.0.1', '-p', String(port), '-U', 'app', '-d', 'postgres', '-c', `CREATE DATABASE "${db}"`], { encoding: 'utf8' });
				if (r.status !== 0) throw new Error(`could not create database ${db}: ${r.stderr}`);
			}
			return url(db);
		},
		stop() {
			if (stopped) return;
			stopped = true;
			try {
				asPostgres(pgctl, ['-D', dataDir, '-m', 'fast', '-w', 'stop']);
			} catch (e) {
				log(`warning: could not stop PostgreSQL cleanly: ${e.message}`);
			}
		}
	};
}
