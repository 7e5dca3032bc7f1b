import { error, fail, redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth';
import { actorOf } from '$lib/server/actor';
import { requireVisibleBuild } from '$lib/server/builds';
import { listBuiltIt, recordBuiltIt, removeBuiltIt } from '$lib/server/built-it';
import { consumeWrite } from '$lib/server/rate-limit';
import { builtItForm } from '$lib/schemas/built-it';
import type { Actions, PageServerLoad } from './$types';

/** "I built this too": the member's record on this build (their figures, photo), to add or change. */
export const load: PageServerLoad = async ({ params, url }) => {
	const user = requireUser();
	const actor = actorOf(user)!;
	const b = await requireVisibleBuild(params.slug, actor);
	if (b.ownerId === actor.id) error(409, 'This is your own build: its bring-up and measurement blocks belong in the build itself.');
	if (b.status !== 'published') error(409, 'Only a published build can be recorded as built.');
	const mine = (await listBuiltIt(b.id, actor)).find((r) => r.mine) ?? null;
	return { build: { slug: b.slug, title: b.title }, mine, saved: url.searchParams.has('saved') };
};

/** The form's fields back as text (what the member typed), for a refused save. */
const echo = (form: FormData) => Object.fromEntries([...form.entries()].filter(([, v]) => typeof v === 'string')) as Record<string, string>;

export const actions: Actions = {
	record: async ({ params, request, getClientAddress }) => {
		const user = requireUser();
		const actor = actorOf(user)!;
		const form = await request.formData();
		const parsed = builtItForm.safeParse(echo(form));
		if (!parsed.success)
			return fail(400, { values: echo(form), issues: parsed.error.issues.map((i) => ({ path: String(i.path[0] ?? ''), message: i.message })) });
		const verdict = await consumeWrite({ userId: user.id, address: getClientAddress() });
		if (!verdict.ok) return fail(429, { values: echo(form), issues: [{ path: '', message: `Too many changes at once. Try again in ${verdict.retryAfterS} s.` }] });
		const r = await recordBuiltIt(actor, params.slug, parsed.data);
		if (!r.ok) return fail(400, { values: echo(form), issues: r.issues });
		redirect(303, `/builds/${params.slug}#built-it`);
	},
	remove: async ({ params }) => {
		const user = requireUser();
		await removeBuiltIt(actorOf(user)!, params.slug);
		redirect(303, `/builds/${params.slug}#built-it`);
	}
};
