import { fail, redirect } from '@sveltejs/kit';
import { superValidate, message } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requireRole } from '$lib/server/auth';
import { requireVisibleBuild } from '$lib/server/builds';
import { toAttachmentView } from '$lib/server/attachments';
import { assertCanReview, changesSinceVerdict, getDeskEntry, getReviewPanel, raiseFlag, reviewedContent, submitReview } from '$lib/server/reviews';
import { raiseFlagSchema, reviewSchema } from '$lib/schemas/review';
import { withOutcome } from '$lib/outcomes';
import type { Actions, PageServerLoad } from './$types';
import { actorOf } from '$lib/server/actor';
import { attempt } from '$lib/server/http';

/** The build, checked: reviewers and up, never the maker, published only. */
async function reviewable(slug: string) {
	const user = actorOf(requireRole('reviewer'));
	const b = await requireVisibleBuild(slug, user);
	assertCanReview(user, b);
	return { user, b };
}

export const load: PageServerLoad = async ({ params }) => {
	const { user, b } = await reviewable(params.slug);
	const [reviewed, panel, form, desk, since] = await Promise.all([
		reviewedContent(b, user),
		getReviewPanel(b.id, user),
		// An id of its own per page load: tagging or clearing a hazard reloads the page data, and a form with the
		// same id would replace what the reviewer has typed and ticked so far (superforms rebinds on reload).
		superValidate(zod4(reviewSchema), { id: `verdict-${crypto.randomUUID()}` }),
		getDeskEntry(b.id),
		changesSinceVerdict(b.id, b.revision)
	]);
	const { content, build: shown, pending } = reviewed;
	return {
		// The published revision the verdict is pinned to (its snapshot); pending changes come separately.
		build: { id: b.id, slug: b.slug, title: shown.title, revision: b.revision, mainsPowered: shown.mainsPowered, summary: shown.summary },
		pinned: reviewed.pinned,
		pending,
		attachments: reviewed.attachments.map((a) => toAttachmentView(a, b.slug)),
		steps: content.steps.map((s) => ({ id: s.id, title: s.title, bodyHtml: s.bodyHtml, photos: s.photos })),
		specBlocks: content.specBlocks,
		parts: content.parts,
		panel,
		form,
		desk: desk && { note: desk.note, rereview: desk.rereview, claim: desk.claim && { ...desk.claim, mine: desk.claim.byId === user.id } },
		since
	};
};

export const actions: Actions = {
	raiseFlag: async ({ params, request }) => {
		const { user, b } = await reviewable(params.slug);
		const data = Object.fromEntries(await request.formData());
		const values = Object.fromEntries(Object.entries(data).map(([k, v]) => [k, String(v)]));
		const parsed = raiseFlagSchema.safeParse(values);
		if (!parsed.success) {
			const issues: Record<string, string> = {};
			for (const i of parsed.error.issues) issues[String(i.path[0])] ??= i.message;
			return fail(400, { flagFailed: { targetId: values.targetId ?? '', message: 'The hazard was not tagged: check the fields below.', values, issues } });
		}
		const r = await attempt(() => raiseFlag(user, b.id, parsed.data));
		if (!r.ok) return fail(r.status, { flagFailed: { targetId: parsed.data.targetId, message: r.error, values, issues: {} } });
		return { flagged: parsed.data.targetId, flagId: r.value };
	},
	submitReview: async ({ params, request }) => {
		const { user, b } = await reviewable(params.slug);
		const form = await superValidate(request, zod4(reviewSchema));
		if (!form.valid) return fail(400, { form });
		const r = await attempt(() => submitReview(user, b.id, form.data));
		if (!r.ok) return message(form, r.error, { status: r.status as 409 });
		redirect(303, withOutcome(`/builds/${b.slug}#review-state`, form.data.verdict === 'safe' ? 'review-safe' : 'review-rework'));
	}
};
