import { error, redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth';
import { getBuildBySlug, canView } from '$lib/server/builds';
import { isWatching, unwatchBuild, watchBuild } from '$lib/server/watching';
import { actorOf } from '$lib/server/actor';
import { attempt } from '$lib/server/http';
import { withOutcome } from '$lib/outcomes';
import type { Actions, PageServerLoad } from './$types';

/**
 * Watch or stop watching a build (server/watching). The build page's button posts here (a plain form, no
 * JavaScript needed) and comes back with `?done=watching|unwatched`; opened directly (e.g. after signing
 * in from the build page's prompt), the page asks first.
 */
export const load: PageServerLoad = async ({ params }) => {
	const actor = actorOf(requireUser());
	const b = await getBuildBySlug(params.slug);
	if (!b || !canView(actor, b)) error(404, 'Not found');
	return {
		build: { slug: b.slug, title: b.title, status: b.status, own: b.ownerId === actor.id },
		watching: await isWatching(actor.id, b.id)
	};
};

export const actions: Actions = {
	watch: async ({ params }) => {
		const actor = actorOf(requireUser());
		const r = await attempt(() => watchBuild(actor, params.slug));
		if (!r.ok) return r.failure;
		redirect(303, withOutcome(`/builds/${params.slug}`, 'watching'));
	},
	unwatch: async ({ params }) => {
		const actor = actorOf(requireUser());
		const r = await attempt(() => unwatchBuild(actor, params.slug));
		if (!r.ok) return r.failure;
		redirect(303, withOutcome(`/builds/${params.slug}`, 'unwatched'));
	}
};
