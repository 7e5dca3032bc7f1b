import { env } from '$env/dynamic/private';
import { startMailWorker, stopMail } from './mail';
import { startDeletionWorker } from './photos/object-deletion';
import { seedDemoIfEmpty } from './seed';
import { recheckStoredBuilds } from './specs-recheck';
import { startDigestWorker } from './reviews/digest';

/** Work a server process does once at start: the mail worker, the stored spec checks brought up to date and, when asked, the demo scenario. */
export async function startBackground(): Promise<void> {
	if (env.SEED_DEMO === 'true') await seedDemoIfEmpty();
	// Stored check results follow the rules in force: recompute them in the background (RECHECK_ON_START=off skips).
	if (env.RECHECK_ON_START !== 'off')
		void recheckStoredBuilds().then(
			(r) => console.log(`spec checks: ${r.builds} builds rechecked under the current rules`),
			(e) => console.error('spec checks: recheck at start failed', e)
		);
	if (env.MAIL_WORKER !== 'off') {
		await startMailWorker();
		await startDeletionWorker();
		await startDigestWorker();
	}
	// Let the process exit on SIGTERM: the queue holds its own connections.
	process.once('sveltekit:shutdown', () => void stopMail());
}
