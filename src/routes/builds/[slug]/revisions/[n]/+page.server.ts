import { error } from '@sveltejs/kit';
import { actorOf } from '$lib/server/actor';
import { getRevisionView, requireVisibleBuild } from '$lib/server/builds';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, locals }) => {
	const b = await requireVisibleBuild(params.slug, actorOf(locals.user));
	const n = /^[1-9]\d{0,6}$/.test(params.n) ? Number(params.n) : NaN;
	if (!Number.isInteger(n)) error(404, 'Not found');
	const view = await getRevisionView(b.id, n);
	if (!view) error(404, 'Not found');
	return { build: { slug: b.slug, title: b.title, revision: b.revision }, ...view };
};
