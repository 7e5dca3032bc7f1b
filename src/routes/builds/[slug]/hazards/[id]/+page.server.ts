import { error, fail, redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth';
import { requireVisibleBuild } from '$lib/server/builds';
import type { Actor } from '$lib/server/actor';
import { addressFlag, getFlag, getReviewPanel, postFlagMessage, setFlagState } from '$lib/server/reviews';
import { addressFlagSchema, clearFlagSchema, flagMessageSchema } from '$lib/schemas/review';
import { withOutcome, type Outcome } from '$lib/outcomes';
import type { Action, Actions, PageServerLoad } from './$types';
import { actorOf } from '$lib/server/actor';
import { attempt } from '$lib/server/http';

/** One hazard tag on its own page, with its thread (mail links, and where its forms land without JavaScript). */
export const load: PageServerLoad = async ({ params, locals }) => {
	const viewer = actorOf(locals.user);
	const b = await requireVisibleBuild(params.slug, viewer);
	const flag = await getFlag(params.id);
	if (flag.buildId !== b.id) error(404, 'Not found');
	const panel = await getReviewPanel(b.id, viewer);
	const view = panel.flags.find((f) => f.id === flag.id);
	if (!view) error(404, 'Not found');
	return { build: { slug: b.slug, title: b.title, revision: b.revision, locked: b.locked }, flag: view, can: panel.can };
};

const back = (slug: string, id: string, to: FormDataEntryValue | null, code: Outcome) =>
	withOutcome(
		to === 'review' ? `/builds/${slug}/review#hazard-${id}` : to === 'flag' ? `/builds/${slug}/hazards/${id}` : `/builds/${slug}#hazard-${id}`,
		code
	);

/** The flag, checked to belong to the build in the URL. */
async function flagOfBuild(slug: string, id: string, user: Actor) {
	const b = await requireVisibleBuild(slug, user);
	const flag = await getFlag(id);
	if (flag.buildId !== b.id) error(404, 'Not found');
	return { b, flag };
}

/** Clear (resolve, with an optional note) or re-tag (reopen) the hazard tag: one action, told the state it moves to. */
const moveFlag =
	(to: 'resolve' | 'reopen'): Action =>
	async ({ params, request }) => {
		const user = actorOf(requireUser());
		const { b, flag } = await flagOfBuild(params.slug, params.id, user);
		const form = await request.formData();
		const parsed = clearFlagSchema.safeParse({ note: String(form.get('note') ?? '') });
		if (!parsed.success) return fail(400, { error: parsed.error.issues[0].message });
		const r = await attempt(() => setFlagState(user, flag.id, to, { note: parsed.data.note }));
		if (!r.ok) return r.failure;
		redirect(303, back(b.slug, flag.id, form.get('return'), to === 'resolve' ? 'tag-cleared' : 'tag-retagged'));
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
		redirect(303, back(b.slug, flag.id, form.get('return'), 'tag-fixed'));
	},
	resolve: moveFlag('resolve'),
	reopen: moveFlag('reopen'),
	message: async ({ params, request }) => {
		const user = actorOf(requireUser());
		const { b, flag } = await flagOfBuild(params.slug, params.id, user);
		const form = await request.formData();
		const parsed = flagMessageSchema.safeParse({ body: String(form.get('body') ?? '') });
		if (!parsed.success) return fail(400, { error: parsed.error.issues[0].message, body: String(form.get('body') ?? '') });
		const r = await attempt(() => postFlagMessage(user, flag.id, parsed.data.body));
		if (!r.ok) return fail(r.status, { error: r.error, body: parsed.data.body });
		redirect(303, back(b.slug, flag.id, 'flag', 'tag-message') + `#thread`);
	}
};
