// `npm test`: its own PostgreSQL (separate data folder and port from `npm start`) and fakes,
// Vitest (unit + integration), a production build served on loopback, Playwright in Debian's
// Chromium; everything it started is stopped again, also when tests fail and when it is stopped by
// SIGINT/SIGTERM at any point (exit 130/143). Each child runs in a process group of its own and is stopped
// by that id; the process ids are written to <data folder>/pids.json (tests/integration/test-signals.spec.ts).
import { spawn, execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { startStack } from './lib/stack.js';
import { findPgBin } from './lib/postgres.js';
import { runMigrations } from './migrate.js';

const here = path.dirname(fileURLToPath(import.meta.url));
const root = path.join(here, '..');
const num = (v, d) => Number(process.env[v] ?? d);
// STARGROUND_TEST_DATA: the data folder (wiped at the start); default .data/test. A second run needs its own.
const dataRoot = process.env.STARGROUND_TEST_DATA ? path.resolve(process.env.STARGROUND_TEST_DATA) : path.join(root, '.data', 'test');

const o = {
	root: dataRoot,
	pgPort: num('STARGROUND_TEST_PG_PORT', 54339),
	s3Port: num('STARGROUND_TEST_S3_PORT', 4579),
	smtpPort: num('STARGROUND_TEST_SMTP_PORT', 2535),
	mailViewerPort: num('STARGROUND_TEST_MAIL_VIEWER_PORT', 2590),
	appPort: num('STARGROUND_TEST_APP_PORT', 3100),
	database: 'starground_test',
	fast: true,
	// The fault suite stops and starts the fakes through the inbox viewer (POST /control/…).
	controls: true
};

// optional: "unit" or "e2e", then filters passed on to Vitest or Playwright after `--`
// (`node scripts/test.js unit -- src/lib/specs`, `node scripts/test.js e2e -- tests/review.e2e.ts`).
const only = process.argv[2] === '--' ? undefined : process.argv[2];
const filters = process.argv.includes('--') ? process.argv.slice(process.argv.indexOf('--') + 1) : [];
let stack;
/** What startStack has started so far (stopped on a signal that arrives before it returns). */
const startingStops = [];
let app;
const children = new Set();
/** Set by SIGINT/SIGTERM: nothing new is started after it. */
let stopping = null;

/** Process ids of what this run started, for anyone who has to check they are gone (pids.json in the data folder). */
const pids = { 'npm test': process.pid };
function recordPid(what, pid) {
	if (!pid) return;
	pids[what] = pid;
	try {
		fs.mkdirSync(dataRoot, { recursive: true });
		fs.writeFileSync(path.join(dataRoot, 'pids.json'), JSON.stringify(pids, null, 1));
	} catch {
		/* the record is a help, not a need */
	}
}

/** Signal a child's whole process group (it was started detached, so it leads one). */
function signalGroup(child, sig) {
	try {
		process.kill(-child.pid, sig);
	} catch {
		/* already gone */
	}
}

/** Stop a child and everything in its process group: SIGTERM, then SIGKILL after `graceMs`. */
async function stopChild(child, graceMs) {
	if (child.exitCode === null && child.signalCode === null) {
		signalGroup(child, 'SIGTERM');
		await new Promise((r) => {
			const t = setTimeout(r, graceMs);
			child.once('exit', () => (clearTimeout(t), r()));
		});
	}
	// Whatever the leader left behind in its group (workers, browsers) goes too.
	signalGroup(child, 'SIGKILL');
}

let cleaning;
/** Stop everything this run started (once; later calls wait for the same). */
function cleanup() {
	cleaning ??= (async () => {
		await Promise.all([...children].map((c) => stopChild(c, 5000)));
		if (app) await stopChild(app, 8000);
		if (stack) await stack.stop();
		else for (const stop of startingStops.reverse()) await Promise.resolve(stop()).catch(() => undefined);
	})();
	return cleaning;
}
const signalExit = { SIGINT: 130, SIGTERM: 143 };
for (const sig of ['SIGINT', 'SIGTERM']) {
	process.on(sig, async () => {
		if (stopping) return;
		stopping = sig;
		console.log(`\n• ${sig}: stopping what this run started…`);
		await cleanup();
		process.exit(signalExit[sig]);
	});
}

/**
 * Run a command in a process group of its own (no terminal input: a background group reading it would stop);
 * resolves with its exit code (1 when stopped by a signal).
 */
function run(what, cmd, args, env, stdio = ['ignore', 'inherit', 'inherit']) {
	if (stopping) return Promise.resolve(1);
	return new Promise((resolve) => {
		const child = spawn(cmd, args, { cwd: root, stdio, env: { ...process.env, ...env }, detached: true });
		children.add(child);
		recordPid(what, child.pid);
		child.once('exit', (code) => {
			children.delete(child);
			resolve(code ?? 1);
		});
	});
}

function ensureChromium() {
	const exe = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
	if (fs.existsSync(exe)) return;
	if (process.getuid?.() !== 0) throw new Error(`${exe} is missing: install Debian's chromium package`);
	console.log('• installing Debian Chromium (apt-get)…');
	execFileSync('apt-get', ['update'], { stdio: 'inherit' });
	execFileSync('apt-get', ['install', '-y', 'chromium'], { stdio: 'inherit', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } });
}

/** Drop and create `name` on the server of `url`, run the migrations on it and return its URL. */
async function freshDatabase(url, name) {
	const admin = new URL(url);
	admin.pathname = '/postgres';
	const { default: postgres } = await import('postgres');
	const sql = postgres(admin.href, { max: 1, onnotice: () => {} });
	try {
		await sql.unsafe(`drop database if exists "${name}" with (force)`);
		await sql.unsafe(`create database "${name}"`);
	} finally {
		await sql.end({ timeout: 5 });
	}
	const fresh = new URL(url);
	fresh.pathname = `/${name}`;
	await runMigrations(fresh.href);
	return fresh.href;
}

async function waitFor(url, ms) {
	const until = Date.now() + ms;
	while (Date.now() < until) {
		try {
			if ((await fetch(url)).status < 500) return;
		} catch {
			/* not yet */
		}
		await new Promise((r) => setTimeout(r, 300));
	}
	throw new Error(`${url} did not answer within ${ms / 1000} s`);
}

let failed = 0;
const t0 = Date.now();
try {
	fs.rmSync(dataRoot, { recursive: true, force: true });
	if (only !== 'unit') ensureChromium();
	console.log('• starting test PostgreSQL and fakes…');
	stack = await startStack({ ...o, stops: startingStops, onStarted: recordPid });
	const testEnv = {
		...stack.env,
		NODE_ENV: 'test',
		MAIL_POLL_S: '0.5',
		MAIL_RETRY_DELAY_S: '1',
		TEST_SMTP_PORT: String(o.smtpPort),
		TEST_PG_PORT: String(o.pgPort),
		// The fault suite stops and starts this PostgreSQL with pg_ctl.
		TEST_PG_DATA: path.join(dataRoot, 'postgres', 'pgdata'),
		TEST_PG_BIN: findPgBin()
	};
	if (only !== 'e2e') {
		console.log('• Vitest: unit and integration tests');
		const code = await run('vitest', 'npx', ['vitest', 'run', ...filters], { ...testEnv, MAIL_WORKER: 'off' });
		if (code !== 0) failed++;
	}
	if (only !== 'unit') {
		console.log('• building the app for end-to-end tests…');
		if ((await run('vite build', 'npx', ['vite', 'build'], testEnv, ['ignore', 'ignore', 'inherit'])) !== 0) throw new Error('vite build failed');
		// The end-to-end tests get a database of their own, migrated afresh: whatever the unit run left behind
		// (members of a failed test, bulk rows) must not keep the demo scenario from being seeded.
		testEnv.DATABASE_URL = await freshDatabase(testEnv.DATABASE_URL, 'starground_e2e');
		// Many tests share one client address and a few demo members: lift the budgets that would
		// otherwise run out (each limit has its own test against the defaults).
		const appEnv = {
			NODE_ENV: 'production',
			SEED_DEMO: 'true',
			AUTH_SIGNIN_MAX: '1000',
			AUTH_SIGNUP_PER_HOUR: '1000',
			AUTH_RESET_PER_HOUR: '1000',
			API_WRITE_LIMIT: '5000',
			COMMENT_RATE_PER_MIN: '1000',
			COMMENT_RATE_PER_HOUR: '100000',
			// Keep idle connections open longer than the test clients do, so a client never reuses a
			// socket the server is just closing (ECONNRESET under load); adapter-node's default is 5 s.
			KEEP_ALIVE_TIMEOUT: '65'
		};
		// The fault suite starts a second instance of the app the same way (two instances on one database).
		testEnv.STARGROUND_TEST_APP_ENV = JSON.stringify(appEnv);
		if (stopping) throw new Error(`stopped by ${stopping}`);
		// parent-watch: the app also stops if this script is killed outright (SIGKILL), as under `npm start`.
		// server.js: adapter-node's server from build/ plus a sentence for requests Node cannot read (scripts/lib/client-error.js).
		app = spawn(process.execPath, ['--import', path.join(here, 'lib', 'parent-watch.js'), 'server.js'], {
			cwd: root,
			stdio: ['ignore', fs.openSync(path.join(dataRoot, 'app.log'), 'a'), fs.openSync(path.join(dataRoot, 'app.log'), 'a')],
			env: { ...process.env, ...testEnv, ...appEnv },
			detached: true
		});
		recordPid('app', app.pid);
		await waitFor(`${testEnv.ORIGIN}/`, 240_000);
		console.log('• Playwright: end-to-end tests in Debian Chromium');
		const faultFilters = filters.filter((f) => f.includes('fault'));
		const e2eFilters = filters.filter((f) => !f.includes('fault'));
		let code = 0;
		if (filters.length === 0 || e2eFilters.length > 0) {
			code = await run('playwright', 'npx', ['playwright', 'test', '--project=chromium', ...e2eFilters], testEnv);
		}
		// The fault suite stops the services everything else uses: it runs last, alone.
		if (filters.length === 0 || faultFilters.length > 0) {
			console.log('• Playwright: the fault suite (PostgreSQL, SMTP and S3 stopped under the running app)');
			const faults = await run('fault suite', 'npx', ['playwright', 'test', '--project=faults', ...faultFilters], testEnv);
			if (faults !== 0) code = faults;
		}
		if (code !== 0) {
			failed++;
			console.log('--- last lines of the app log ---');
			console.log(fs.readFileSync(path.join(dataRoot, 'app.log'), 'utf8').split('\n').slice(-40).join('\n'));
		}
	}
} catch (err) {
	console.error('npm test could not run:', err.message);
	failed++;
} finally {
	await cleanup();
}
// A signal's handler exits on its own once everything is stopped; never report green meanwhile.
if (stopping) {
	await cleanup();
	process.exit(signalExit[stopping]);
}
console.log(`\nnpm test finished in ${Math.round((Date.now() - t0) / 1000)} s: ${failed ? 'FAILED' : 'all green'}`);
process.exit(failed ? 1 : 0);
