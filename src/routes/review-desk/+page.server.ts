import { requireRole } from '$lib/server/auth';
import { listRecentlyReviewed, listWaiting } from '$lib/server/reviews';
import type { PageServerLoad } from './$types';

/** The review desk: builds waiting for review (oldest request first) and the latest verdicts. Reviewers and up. */
export const load: PageServerLoad = async () => {
	const user = requireRole('reviewer');
	const [waiting, recent] = await Promise.all([listWaiting(), listRecentlyReviewed()]);
	return { waiting: waiting.map((w) => ({ ...w, own: w.maker.id === user.id })), recent };
};
