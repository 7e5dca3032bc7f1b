import { fail, redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth';
import { isOwner, requireVisibleBuild } from '$lib/server/builds';
import { getDeskEntry, getReviewState, requestReview } from '$lib/server/reviews';
import { requestReviewSchema } from '$lib/schemas/review';
import { withOutcome } from '$lib/outcomes';
import type { Actions, PageServerLoad } from './$types';
import { actorOf } from '$lib/server/actor';
import { attempt } from '$lib/server/http';

/** The maker's confirmation page for asking for review, with a note for the reviewer (also where the button lands without JavaScript). */
export const load: PageServerLoad = async ({ params }) => {
	const user = actorOf(requireUser());
	const b = await requireVisibleBuild(params.slug, user);
	const [state, entry] = await Promise.all([getReviewState(b.id), isOwner(user, b) ? getDeskEntry(b.id) : Promise.resolve(null)]);
	return {
		build: { slug: b.slug, title: b.title, status: b.status, revision: b.revision, locked: b.locked },
		own: isOwner(user, b),
		state,
		note: entry?.note ?? ''
	};
};

export const actions: Actions = {
	default: async ({ params, request }) => {
		const user = actorOf(requireUser());
		const b = await requireVisibleBuild(params.slug, user);
		const form = await request.formData();
		const parsed = requestReviewSchema.safeParse({ note: String(form.get('note') ?? '') });
		if (!parsed.success) return fail(400, { error: parsed.error.issues[0].message, note: String(form.get('note') ?? '') });
		const before = await getReviewState(b.id);
		const r = await attempt(() => requestReview(user, b.id, undefined, parsed.data.note));
		if (!r.ok) return fail(r.status, { error: r.error, note: parsed.data.note });
		const code = r.value === 'already-waiting' ? 'review-note' : before.verdict ? 'review-asked-again' : 'review-asked';
		redirect(303, withOutcome(`/builds/${b.slug}#review-state`, code));
	}
};
