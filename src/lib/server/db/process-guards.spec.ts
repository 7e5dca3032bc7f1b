import { EventEmitter } from 'node:events';
import net from 'node:net';
import { randomUUID } from 'node:crypto';
import { afterEach, describe, expect, it, vi } from 'vitest';
import PgBoss from 'pg-boss';
import { installProcessGuards, isQueueConnectionError } from './process-guards';

/** A stand-in for `process`: the same events, and an exit that only records its code. */
function fakeProcess() {
	const proc = new EventEmitter() as EventEmitter & { exit: ReturnType<typeof vi.fn> };
	proc.exit = vi.fn();
	installProcessGuards(proc as unknown as NodeJS.Process);
	return proc;
}

/** A port nothing listens on (bound, read, closed). */
async function closedPort(): Promise<number> {
	const server = net.createServer();
	await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
	const { port } = server.address() as net.AddressInfo;
	await new Promise((r) => server.close(r));
	return port;
}

/**
 * The rejection pg-boss 10.4.2's worker leaves unhandled: after a job it calls `this.complete(…)` without
 * awaiting it (node_modules/pg-boss/src/manager.js, `watch` → `onFetch`). Here the same Manager.complete runs
 * against a PostgreSQL that refuses connections, as during a restart.
 */
async function pgBossCompleteRejection(): Promise<unknown> {
	const port = await closedPort();
	const boss = new PgBoss({ connectionString: `postgres://nobody@127.0.0.1:${port}/none`, schema: 'pgboss' });
	const db = boss.getDb() as unknown as { open(): Promise<void>; close(): Promise<void> };
	await db.open();
	try {
		await boss.complete('mail', randomUUID());
	} catch (err) {
		return err;
	} finally {
		await db.close();
	}
	throw new Error('complete did not fail against a closed port');
}

afterEach(() => vi.restoreAllMocks());

describe('process guards', () => {
	it("logs pg-boss's unhandled complete rejection (ECONNREFUSED) and keeps the process running", async () => {
		const reason = await pgBossCompleteRejection();
		expect((reason as { code?: string }).code).toBe('ECONNREFUSED');
		expect(isQueueConnectionError(reason)).toBe(true);

		const log = vi.spyOn(console, 'error').mockImplementation(() => {});
		const proc = fakeProcess();
		proc.emit('unhandledRejection', reason, Promise.resolve());
		expect(proc.exit).not.toHaveBeenCalled();
		expect(log).toHaveBeenCalledTimes(1);
		expect(String(log.mock.calls[0][0])).toMatch(/^\[queue\] PostgreSQL unreachable .*ECONNREFUSED/);
	});

	it('ends the process on a connection error from anywhere else (not pg-boss)', async () => {
		const port = await closedPort();
		const reason = await new Promise<Error>((resolve) => net.connect(port, '127.0.0.1').on('error', resolve));
		expect((reason as Error & { code?: string }).code).toBe('ECONNREFUSED');
		expect(isQueueConnectionError(reason)).toBe(false);

		vi.spyOn(console, 'error').mockImplementation(() => {});
		const proc = fakeProcess();
		proc.emit('unhandledRejection', reason, Promise.resolve());
		expect(proc.exit).toHaveBeenCalledWith(1);
	});

	it('ends the process on any other unhandled rejection or uncaught exception, as Node would', () => {
		const log = vi.spyOn(console, 'error').mockImplementation(() => {});
		const proc = fakeProcess();
		const bug = new Error('a bug in our code');
		proc.emit('unhandledRejection', bug, Promise.resolve());
		expect(proc.exit).toHaveBeenCalledWith(1);
		expect(log).toHaveBeenCalledWith(bug);
		proc.emit('unhandledRejection', 'not even an Error', Promise.resolve());
		expect(proc.exit).toHaveBeenCalledTimes(2);
		proc.emit('uncaughtException', new TypeError("Cannot read properties of null (reading 'write')"));
		expect(proc.exit).toHaveBeenCalledTimes(3);
	});

	it("still spares postgres.js's write race (uncaught TypeError from its connection.js)", () => {
		const log = vi.spyOn(console, 'error').mockImplementation(() => {});
		const proc = fakeProcess();
		const race = new TypeError("Cannot read properties of null (reading 'write')");
		race.stack = `${race.message}\n    at Timeout.nextWrite (/app/node_modules/postgres/src/connection.js:250:12)`;
		proc.emit('uncaughtException', race);
		expect(proc.exit).not.toHaveBeenCalled();
		expect(String(log.mock.calls[0][0])).toMatch(/^\[db\]/);
	});
});
