/**
 * The site-wide reader version (table `reader_version`, moved by triggers in the transaction that changes
 * a non-draft build; migration 0012). The list caches key on it, and the build-page cache uses it to skip
 * its per-build check while nothing readers see has changed.
 *
 * Every request needs a version read that STARTED AFTER the request arrived (else a write committed just
 * before could be missed), but one read can serve every request that arrived before it started: a request
 * joins the read queued to start when the one in flight ends, never the one in flight. Under load that is
 * one small query per database round trip for the whole process, however many requests come in.
 */
import { eq } from 'drizzle-orm';
import { db } from '../db';
import { readerVersion as table } from '../db/schema';

export interface ReaderVersion {
	version: number;
	changedAt: Date;
}

async function readOnce(): Promise<ReaderVersion> {
	const [row] = await db.select({ version: table.version, changedAt: table.changedAt }).from(table).where(eq(table.id, 1));
	// The row is made by the migration; a database without it is treated as "never changed".
	return row ?? { version: 0, changedAt: new Date(0) };
}

let running: Promise<ReaderVersion> | null = null;
let queued: Promise<ReaderVersion> | null = null;

function start(): Promise<ReaderVersion> {
	const p: Promise<ReaderVersion> = readOnce().finally(() => {
		if (running === p) running = null;
	});
	running = p;
	return p;
}

/** The reader version as of a read that started after this call (shared with concurrent callers). */
export function currentReaderVersion(): Promise<ReaderVersion> {
	if (!running) return start();
	queued ??= running
		.then(
			() => undefined,
			() => undefined
		)
		.then(() => {
			queued = null;
			return start();
		});
	return queued;
}
