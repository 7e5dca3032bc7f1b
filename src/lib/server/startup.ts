import { env } from '$env/dynamic/private';
import { startMailWorker, stopMail } from './mail';
import { startDeletionWorker } from './photos/object-deletion';
import { seedDemoIfEmpty } from './seed';
import { startDigestWorker } from './reviews/digest';

/** Work a server process does once at start: the mail worker and, when asked, the demo scenario. */
export async function startBackground(): Promise<void> {
	if (env.SEED_DEMO === 'true') await seedDemoIfEmpty();
	if (env.MAIL_WORKER !== 'off') {
		await startMailWorker();
		await startDeletionWorker();
		await startDigestWorker();
	}
	// Let the process exit on SIGTERM: the queue holds its own connections.
	process.once('sveltekit:shutdown', () => void stopMail());
}
