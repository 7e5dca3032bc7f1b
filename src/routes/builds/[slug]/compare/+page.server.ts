import { actorOf } from '$lib/server/actor';
import { compareWithOrigin } from '$lib/server/parts';
import type { PageServerLoad } from './$types';

/** A derived build's parts list beside its origin's. 404 when the build was not derived, or its origin is not visible. */
export const load: PageServerLoad = async ({ params, locals }) => {
	const { build: b, origin, originMaker, mine, theirs } = await compareWithOrigin(params.slug, actorOf(locals.user));
	return {
		build: { slug: b.slug, title: b.title },
		origin: { slug: origin.slug, title: origin.title, makerName: originMaker.name },
		mine,
		theirs
	};
};
