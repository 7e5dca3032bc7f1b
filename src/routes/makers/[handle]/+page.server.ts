import { listPublishedBuilds } from '$lib/server/builds';
import { toCards } from '$lib/server/discover';
import { getMakerProfile, reviewsGivenBy } from '$lib/server/members';
import { roleAtLeast } from '$lib/roles';
import type { PageServerLoad } from './$types';

const BUILDS_SHOWN = 12;

export const load: PageServerLoad = async ({ params }) => {
	const maker = await getMakerProfile(params.handle);
	const isReviewer = roleAtLeast(maker.role, 'reviewer');
	const [list, reviews] = await Promise.all([
		listPublishedBuilds({ limit: BUILDS_SHOWN, filters: { ownerId: maker.id } }),
		isReviewer || maker.reviewCount > 0 ? reviewsGivenBy(maker.id) : Promise.resolve([])
	]);
	return {
		maker: {
			name: maker.name,
			handle: maker.handle,
			bio: maker.bio,
			role: maker.role,
			avatarUrl: maker.avatarUrl,
			initials: maker.initials,
			memberSince: maker.createdAt.toISOString(),
			publishedCount: maker.publishedCount,
			reviewCount: maker.reviewCount
		},
		isReviewer,
		builds: await toCards(list.rows),
		moreBuilds: list.next ? `/builds?maker=${maker.handle}` : null,
		reviews: reviews.map((r) => ({ ...r, createdAt: r.createdAt.toISOString() }))
	};
};
