import { fail, redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { requireUser } from '$lib/server/auth';
import { BENCH_NOTE_MAX, benchNotes, listBench, setBenchNote, setOnBench } from '$lib/server/bench';
import { attempt } from '$lib/server/http';
import { toCards } from '$lib/server/discover';
import { consumeWrite } from '$lib/server/rate-limit';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const user = requireUser();
	const [rows, notes] = await Promise.all([listBench(user.id), benchNotes(user.id)]);
	return { builds: await toCards(rows), notes: Object.fromEntries(rows.map((r) => [r.slug, notes.get(r.id) ?? ''])), noteMax: BENCH_NOTE_MAX };
};

const toggleForm = z.object({
	slug: z.string().trim().min(1).max(200),
	/** The state wanted: '1' save, '0' remove (idempotent, unlike a blind flip). */
	save: z.enum(['0', '1']),
	/** Where to go back to without JavaScript: a path on this site. */
	back: z
		.string()
		.regex(/^\/(?!\/)[^\s\\]*$/)
		.max(500)
		.optional()
});

const noteForm = z.object({ slug: z.string().trim().min(1).max(200), note: z.string().max(20_000).default('') });

export const actions: Actions = {
	/** Keep a note on a saved build. */
	note: async ({ request, getClientAddress }) => {
		const user = requireUser();
		const parsed = noteForm.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return fail(400, { message: 'That request was incomplete. Reload the page and try again.' });
		const verdict = await consumeWrite({ userId: user.id, address: getClientAddress() });
		if (!verdict.ok) return fail(429, { message: `Too many changes at once. Try again in ${verdict.retryAfterS} s.` });
		const r = await attempt(() => setBenchNote(user.id, parsed.data.slug, parsed.data.note));
		if (!r.ok) return r.failure;
		return { noted: r.value.slug };
	},
	toggle: async ({ request, getClientAddress }) => {
		const user = requireUser();
		const parsed = toggleForm.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return fail(400, { message: 'That request was incomplete. Reload the page and try again.' });
		const verdict = await consumeWrite({ userId: user.id, address: getClientAddress() });
		if (!verdict.ok) return fail(429, { message: `Too many changes at once. Try again in ${verdict.retryAfterS} s.` });
		const result = await setOnBench(user.id, parsed.data.slug, parsed.data.save === '1');
		if (parsed.data.back && request.headers.get('x-sveltekit-action') !== 'true') redirect(303, parsed.data.back);
		return result;
	}
};
