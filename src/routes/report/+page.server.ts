import { fail } from '@sveltejs/kit';
import { superValidate, message } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requireUser } from '$lib/server/auth';
import { fileReport } from '$lib/server/moderation';
import { reportSchema } from '$lib/schemas/review';
import type { Actions, PageServerLoad } from './$types';
import { actorOf } from '$lib/server/actor';
import { attempt } from '$lib/server/http';

/** Report a build (?kind=build&id=slug), a comment (?kind=comment&id=…) or a member (?kind=member&id=handle). */
export const load: PageServerLoad = async ({ url }) => {
	requireUser();
	const kind = url.searchParams.get('kind');
	const form = await superValidate(
		{
			targetKind: kind === 'build' || kind === 'comment' || kind === 'member' ? kind : undefined,
			targetId: url.searchParams.get('id') ?? ''
		},
		zod4(reportSchema),
		{ errors: false }
	);
	return { form };
};

export const actions: Actions = {
	default: async ({ request }) => {
		const actor = actorOf(requireUser());
		const form = await superValidate(request, zod4(reportSchema));
		if (!form.valid) return fail(400, { form });
		const r = await attempt(() => fileReport(actor, form.data));
		if (!r.ok) return message(form, { sent: false, text: r.error }, { status: r.status as 422 });
		return message(form, {
			sent: true,
			text: r.value.duplicate ? 'You have already reported this; the moderators have it in their queue.' : 'Thank you. The moderators have your report.'
		});
	}
};
