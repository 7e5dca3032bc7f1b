import { error, fail, redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth';
import { requireVisibleBuild } from '$lib/server/builds';
import type { Actor } from '$lib/server/actor';
import { addressFlag, getFlag, getReviewPanel, setFlagState } from '$lib/server/reviews';
import { addressFlagSchema } from '$lib/schemas/review';
import type { Action, Actions, PageServerLoad } from './$types';
import { actorOf } from '$lib/server/actor';
import { attempt } from '$lib/server/http';

/** One hazard tag on its own page (mail links, and where its forms land without JavaScript). */
export const load: PageServerLoad = async ({ params, locals }) => {
	const viewer = actorOf(locals.user);
	const b = await requireVisibleBuild(params.slug, viewer);
	const flag = await getFlag(params.id);
	if (flag.buildId !== b.id) error(404, 'Not found');
	const panel = await getReviewPanel(b.id, viewer);
	const view = panel.flags.find((f) => f.id === flag.id);
	if (!view) error(404, 'Not found');
	return { build: { slug: b.slug, title: b.title, revision: b.revision }, flag: view, can: panel.can };
};

const back = (slug: string, id: string, to: FormDataEntryValue | null) =>
	to === 'review' ? `/builds/${slug}/review#hazard-${id}` : to === 'flag' ? `/builds/${slug}/hazards/${id}` : `/builds/${slug}#hazard-${id}`;

/** The flag, checked to belong to the build in the URL. */
async function flagOfBuild(slug: string, id: string, user: Actor) {
	const b = await requireVisibleBuild(slug, user);
	const flag = await getFlag(id);
	if (flag.buildId !== b.id) error(404, 'Not found');
	return { b, flag };
}

/** Clear (resolve) or re-tag (reopen) the hazard tag: one action, told the state it moves to. */
const moveFlag =
	(to: 'resolve' | 'reopen'): Action =>
	async ({ params, request }) => {
		const user = actorOf(requireUser());
		const { b, flag } = await flagOfBuild(params.slug, params.id, user);
		const form = await request.formData();
		const r = await attempt(() => setFlagState(user, flag.id, to));
		if (!r.ok) return r.failure;
		redirect(303, back(b.slug, flag.id, form.get('return')));
	};

export const actions: Actions = {
	address: async ({ params, request }) => {
		const user = actorOf(requireUser());
		const { b, flag } = await flagOfBuild(params.slug, params.id, user);
		const form = await request.formData();
		const parsed = addressFlagSchema.safeParse({ note: form.get('note') ?? '' });
		if (!parsed.success) return fail(400, { error: parsed.error.issues[0].message, note: String(form.get('note') ?? '') });
		const r = await attempt(() => addressFlag(user, flag.id, parsed.data.note));
		if (!r.ok) return r.failure;
		redirect(303, back(b.slug, flag.id, form.get('return')));
	},
	resolve: moveFlag('resolve'),
	reopen: moveFlag('reopen')
};
