import { listRevisions, requireVisibleBuild } from '$lib/server/builds';
import type { PageServerLoad } from './$types';
import { actorOf } from '$lib/server/actor';

export const load: PageServerLoad = async ({ params, locals }) => {
	const b = await requireVisibleBuild(params.slug, actorOf(locals.user));
	return {
		build: { slug: b.slug, title: b.title, status: b.status, revision: b.revision },
		revisions: await listRevisions(b.id)
	};
};
