import { requireUser } from '$lib/server/auth';
import { listOwnBuilds } from '$lib/server/builds';
import { getReviewStates } from '$lib/server/reviews';
import type { PageServerLoad } from './$types';

/** The signed-in maker's own builds — drafts, published, archived — with their review state. */
export const load: PageServerLoad = async () => {
	const user = requireUser();
	const rows = await listOwnBuilds(user.id);
	const states = await getReviewStates(rows.map((r) => r.id));
	const builds = rows.map((r) => ({
		slug: r.slug,
		title: r.title,
		status: r.status,
		revision: r.revision,
		locked: r.locked,
		pending: !!r.pendingChangesAt && r.status === 'published',
		derived: !!r.derivedFromId,
		updatedAt: r.updatedAt,
		review: states.get(r.id)!
	}));
	return {
		groups: [
			{ key: 'draft', title: 'Drafts', empty: 'No drafts. Start one with “New build”, or start from someone else’s build.', builds: builds.filter((b) => b.status === 'draft') },
			{ key: 'published', title: 'Published', empty: 'Nothing published yet.', builds: builds.filter((b) => b.status === 'published') },
			{ key: 'archived', title: 'Archived', empty: 'Nothing archived.', builds: builds.filter((b) => b.status === 'archived') }
		]
	};
};
