// `npm start`: PostgreSQL on loopback (installed from Debian when missing), migrations, the demo
// scenario when the database is empty, the local fakes, then build and serve the app.
// Ctrl-C, SIGINT or SIGTERM (from any parent: a terminal, nohup, a process manager), or the death of
// the parent process (npm's shell does not pass signals on) stop everything this script started.
import { spawn, spawnSync } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { startStack } from './lib/stack.js';

const here = path.dirname(fileURLToPath(import.meta.url));
const root = path.join(here, '..');
const num = (v, d) => Number(process.env[v] ?? d);

const o = {
	root: process.env.STARGROUND_DATA_DIR ? path.resolve(process.env.STARGROUND_DATA_DIR) : path.join(root, '.data', 'dev'),
	pgPort: num('STARGROUND_PG_PORT', 54329),
	s3Port: num('STARGROUND_S3_PORT', 4569),
	smtpPort: num('STARGROUND_SMTP_PORT', 2525),
	mailViewerPort: num('STARGROUND_MAIL_VIEWER_PORT', 2580),
	appPort: num('PORT', 3000),
	database: 'starground'
};

let stack;
/** What startStack has started so far (stopped on a signal that arrives before it returns). */
const startingStops = [];
let app;
let stopping = false;
async function shutdown(code = 0) {
	if (stopping) return;
	stopping = true;
	if (app && app.exitCode === null) {
		app.kill('SIGTERM');
		await new Promise((r) => {
			const t = setTimeout(() => {
				app.kill('SIGKILL');
				r();
			}, 8000);
			app.once('exit', () => {
				clearTimeout(t);
				r();
			});
		});
	}
	if (stack) await stack.stop();
	else for (const stop of startingStops.reverse()) await Promise.resolve(stop()).catch(() => undefined);
	process.exit(code);
}
for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, () => shutdown(0));
// `npm start` runs this script through `sh -c`, which dies on SIGTERM without passing it on: when our
// parent goes away (we are re-parented), stop as if signalled. Checked every second.
const parentAtStart = process.ppid;
setInterval(() => {
	if (process.ppid !== parentAtStart) shutdown(0);
}, 1000).unref();

try {
	console.log('• starting PostgreSQL, fakes and migrations…');
	stack = await startStack({ ...o, stops: startingStops });
	if (process.env.SKIP_BUILD !== '1') {
		console.log('• building the app…');
		const b = spawnSync('npx', ['vite', 'build'], { cwd: root, stdio: 'inherit', env: { ...process.env, ...stack.env } });
		if (b.status !== 0) throw new Error('build failed');
	}
	// The app exits on its own if this script is killed outright (SIGKILL): see scripts/lib/parent-watch.js.
	// server.js: adapter-node's server from build/ plus a sentence for requests Node cannot read (scripts/lib/client-error.js).
	app = spawn(process.execPath, ['--import', path.join(here, 'lib', 'parent-watch.js'), 'server.js'], {
		cwd: root,
		stdio: ['ignore', 'inherit', 'inherit'],
		env: { ...process.env, ...stack.env, SEED_DEMO: 'true', NODE_ENV: 'production' }
	});
	app.once('exit', (code) => {
		if (!stopping) {
			console.error(`app exited (${code})`);
			shutdown(code ?? 1);
		}
	});
	const { DEMO_ACCOUNTS } = await import('./lib/demo-accounts.js');
	await waitFor(`${stack.env.ORIGIN}/`, 240_000);
	console.log(`
Starground is running at ${stack.env.ORIGIN}/
Local inbox (fake SMTP):  ${stack.env.MAIL_VIEWER_URL}/
Demo accounts (local use only), password "${DEMO_ACCOUNTS.password}":
${DEMO_ACCOUNTS.members.map((m) => `  ${m.role.padEnd(10)} ${m.email}`).join('\n')}
Ctrl-C stops the app, the fakes and PostgreSQL.`);
} catch (err) {
	console.error('npm start failed:', err.message);
	await shutdown(1);
}

async function waitFor(url, ms) {
	const until = Date.now() + ms;
	while (Date.now() < until) {
		try {
			const r = await fetch(url);
			if (r.status < 500) return;
		} catch {
			/* not up yet */
		}
		await new Promise((r) => setTimeout(r, 300));
	}
	throw new Error(`${url} did not answer within ${ms / 1000} s`);
}
