import { env } from '$env/dynamic/private';
import { startMailWorker, stopMail } from './mail';
import { startDeletionWorker } from './photos/object-deletion';
import { seedDemoIfEmpty } from './seed';
import { recheckAtStart } from './specs-recheck';
import { startDigestWorker } from './reviews/digest';

/** Work a server process does once at start: the mail worker, the stored spec checks brought up to date and, when asked, the demo scenario. */
export async function startBackground(): Promise<void> {
	if (env.SEED_DEMO === 'true') await seedDemoIfEmpty();
	// Stored check results follow the rules in force: recompute them in the background when the rules version changed
	// (RECHECK_ON_START=off skips, =always walks every build regardless).
	if (env.RECHECK_ON_START !== 'off')
		void recheckAtStart({ always: env.RECHECK_ON_START === 'always' }).then(
			(r) => console.log(r.skipped ? 'spec checks: stored results already follow the current rules' : `spec checks: ${r.builds} builds rechecked under the current rules`),
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
