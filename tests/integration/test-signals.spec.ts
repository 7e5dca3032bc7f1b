// `npm test` (scripts/test.js) stopped by a signal at each phase must stop everything it started — PostgreSQL,
// the fakes, Vitest and its workers — and exit non-zero (128 + the signal's number, the shell's convention).
// Each case runs the script on free ports of its own with its own data folder (STARGROUND_TEST_DATA), sends the
// signal, and then checks: the exit code, every process id the run wrote to pids.json, every port it was given,
// and that no process at all is left whose environment names that data folder (everything it started inherits it).
import { describe, it, expect, afterAll } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';

const root = path.resolve(__dirname, '..', '..');
const made: string[] = [];
afterAll(() => {
	for (const d of made) fs.rmSync(d, { recursive: true, force: true });
});

/** A port nothing listens on now (the kernel's pick for port 0). */
function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const srv = net.createServer();
		srv.once('error', reject);
		srv.listen(0, '127.0.0.1', () => {
			const { port } = srv.address() as net.AddressInfo;
			srv.close(() => resolve(port));
		});
	});
}

function listening(port: number): Promise<boolean> {
	return new Promise((resolve) => {
		const s = net.connect({ host: '127.0.0.1', port });
		s.once('connect', () => (s.destroy(), resolve(true)));
		s.once('error', () => resolve(false));
	});
}

/** True while `pid` is a live process (a zombie nobody has reaped yet counts as gone). */
function alive(pid: number): boolean {
	try {
		const stat = fs.readFileSync(`/proc/${pid}/stat`, 'utf8');
		return stat.slice(stat.lastIndexOf(')') + 2)[0] !== 'Z';
	} catch {
		return false;
	}
}

/** Live processes whose environment carries `marker` (KEY=value), i.e. started by that run or its children. */
function processesWith(marker: string): number[] {
	const found: number[] = [];
	for (const d of fs.readdirSync('/proc')) {
		const pid = Number(d);
		if (!pid || pid === process.pid) continue;
		try {
			if (fs.readFileSync(`/proc/${pid}/environ`, 'latin1').split('\0').includes(marker) && alive(pid)) found.push(pid);
		} catch {
			/* gone meanwhile, or not ours to read */
		}
	}
	return found;
}

async function until(what: string, ok: () => boolean | Promise<boolean>, ms: number): Promise<void> {
	const end = Date.now() + ms;
	while (Date.now() < end) {
		if (await ok()) return;
		await new Promise((r) => setTimeout(r, 50));
	}
	throw new Error(`timed out waiting for ${what}`);
}

type Run = { child: ChildProcess; out: () => string; data: string; ports: number[]; marker: string; exited: Promise<number | null> };

async function startRun(): Promise<Run> {
	const data = fs.mkdtempSync(path.join(os.tmpdir(), 'sg-test-signal-'));
	made.push(data);
	const ports = [await freePort(), await freePort(), await freePort(), await freePort(), await freePort()];
	const env: NodeJS.ProcessEnv = {};
	// The outer run's own settings (DATABASE_URL, ORIGIN, …) must not leak into the inner one.
	for (const k of ['PATH', 'HOME', 'LANG', 'TMPDIR', 'IBM_TELEMETRY_DISABLED']) if (process.env[k] !== undefined) env[k] = process.env[k];
	Object.assign(env, {
		STARGROUND_TEST_DATA: data,
		STARGROUND_TEST_PG_PORT: String(ports[0]),
		STARGROUND_TEST_S3_PORT: String(ports[1]),
		STARGROUND_TEST_SMTP_PORT: String(ports[2]),
		STARGROUND_TEST_MAIL_VIEWER_PORT: String(ports[3]),
		STARGROUND_TEST_APP_PORT: String(ports[4])
	});
	// Always a filter: an inner Vitest without one would run this file again.
	const child = spawn(process.execPath, ['scripts/test.js', 'unit', '--', 'src/lib/server/builds/builds.spec.ts'], { cwd: root, env, stdio: ['ignore', 'pipe', 'pipe'] });
	let text = '';
	child.stdout!.on('data', (b) => (text += b));
	child.stderr!.on('data', (b) => (text += b));
	const exited = new Promise<number | null>((r) => child.once('exit', (code) => r(code)));
	return { child, out: () => text, data, ports, marker: `STARGROUND_TEST_DATA=${data}`, exited };
}

const pidsOf = (run: Run): Record<string, number> => {
	try {
		return JSON.parse(fs.readFileSync(path.join(run.data, 'pids.json'), 'utf8'));
	} catch {
		return {};
	}
};

/** Signal the run, then check that it exits non-zero and leaves no process and no listening port behind. */
async function stopAndCheck(run: Run, sig: 'SIGTERM' | 'SIGINT', expectRunning: string[]): Promise<void> {
	const before = pidsOf(run);
	for (const what of expectRunning) expect(before[what] && alive(before[what]), `${what} is running before the signal`).toBe(true);
	const left = processesWith(run.marker);
	expect(left.length, 'processes of the run before the signal').toBeGreaterThan(0);
	run.child.kill(sig);
	const code = await Promise.race([run.exited, new Promise<'hung'>((r) => setTimeout(() => r('hung'), 30_000))]);
	expect(code, run.out()).toBe(sig === 'SIGINT' ? 130 : 143);
	// PostgreSQL's backends may take a moment to go after the postmaster has said it stopped.
	await until('the run’s processes to go', () => processesWith(run.marker).length === 0, 5000).catch(() => undefined);
	const after = pidsOf(run);
	for (const [what, pid] of Object.entries(after)) expect(alive(pid), `${what} (pid ${pid}) still runs`).toBe(false);
	expect(processesWith(run.marker), 'processes left with the run’s data folder in their environment').toEqual([]);
	for (const port of run.ports) expect(await listening(port), `port ${port} still listens`).toBe(false);
}

describe('npm test stopped by a signal', () => {
	it('SIGTERM just after "starting test PostgreSQL" (before the server runs)', async () => {
		const run = await startRun();
		await until('the first phase', () => run.out().includes('starting test PostgreSQL'), 20_000);
		await stopAndCheck(run, 'SIGTERM', []);
	});

	it('SIGTERM once PostgreSQL runs but before the stack is up (the server used to be left running)', async () => {
		const run = await startRun();
		await until('PostgreSQL to be started', () => !!pidsOf(run).postgres, 30_000);
		expect(run.out()).not.toContain('Vitest');
		await stopAndCheck(run, 'SIGTERM', ['postgres']);
	});

	it('SIGINT in the middle of the Vitest run stops Vitest, its workers, the fakes and PostgreSQL', async () => {
		const run = await startRun();
		await until('Vitest to start', () => !!pidsOf(run).vitest, 40_000);
		// Let it get going: its workers start and the spec file opens its database connections.
		await new Promise((r) => setTimeout(r, 2500));
		await stopAndCheck(run, 'SIGINT', ['postgres', 'vitest']);
	});
});
