import { redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth';
import { isOwner, requireVisibleBuild } from '$lib/server/builds';
import { getReviewState, requestReview } from '$lib/server/reviews';
import type { Actions, PageServerLoad } from './$types';
import { actorOf } from '$lib/server/actor';
import { attempt } from '$lib/server/http';

/** The maker's confirmation page for asking for review (also where the button lands without JavaScript). */
export const load: PageServerLoad = async ({ params }) => {
	const user = actorOf(requireUser());
	const b = await requireVisibleBuild(params.slug, user);
	const state = await getReviewState(b.id);
	return {
		build: { slug: b.slug, title: b.title, status: b.status, revision: b.revision, locked: b.locked },
		own: isOwner(user, b),
		state
	};
};

export const actions: Actions = {
	default: async ({ params }) => {
		const user = actorOf(requireUser());
		const b = await requireVisibleBuild(params.slug, user);
		const r = await attempt(() => requestReview(user, b.id));
		if (!r.ok) return r.failure;
		redirect(303, `/builds/${b.slug}#review-state`);
	}
};
