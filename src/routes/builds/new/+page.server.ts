import { fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requireUser } from '$lib/server/auth';
import { createDraft } from '$lib/server/builds';
import { buildSchema } from '$lib/schemas/build';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	requireUser();
	return { form: await superValidate(zod4(buildSchema)) };
};

export const actions: Actions = {
	default: async ({ request }) => {
		const user = requireUser();
		const form = await superValidate(request, zod4(buildSchema));
		if (!form.valid) return fail(400, { form });
		const { slug } = await createDraft(user.id, form.data);
		redirect(303, `/builds/${slug}/edit?created=1`);
	}
};
