import { error, redirect } from '@sveltejs/kit';
import { actorOf } from '$lib/server/actor';
import { compareBuilds, slugFromInput } from '$lib/server/builds/compare';
import { listBench } from '$lib/server/bench';
import type { PageServerLoad } from './$types';

/**
 * Two builds side by side: this one against `?with=<slug or link>`, else against the build it is based on.
 * Without either, the page asks which build to compare with (offering the reader's bench). Each build is
 * checked against the viewer (drafts only for those who may see them: 404 otherwise).
 */
export const load: PageServerLoad = async ({ params, locals, url }) => {
	const viewer = actorOf(locals.user);
	const typed = url.searchParams.get('with');
	const withSlug = typed === null || typed.trim() === '' ? null : slugFromInput(typed);
	if (typed && typed.trim() !== '' && !withSlug) error(400, 'Name the other build by its address (…/builds/its-name) or its short name.');
	if (withSlug && withSlug !== typed) redirect(303, `/builds/${params.slug}/compare?with=${withSlug}`);
	const { left, right, basedOn } = await compareBuilds(params.slug, withSlug, viewer);
	const bench = !right && viewer ? (await listBench(viewer.id)).filter((b) => b.slug !== params.slug).map((b) => ({ slug: b.slug, title: b.title })) : [];
	return { left, right, basedOn, bench };
};
