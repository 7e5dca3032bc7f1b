import { fail } from '@sveltejs/kit';
import { superValidate, message } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requireUser } from '$lib/server/auth';
import { getProfileSettings, saveProfileSettings } from '$lib/server/members';
import { profileSchema } from '$lib/schemas/account';
import type { Actions, PageServerLoad } from './$types';

/** Profile settings: display name, bio and the three notification switches. */
export const load: PageServerLoad = async () => {
	const user = requireUser();
	const settings = await getProfileSettings(user.id);
	return {
		form: await superValidate(settings.form, zod4(profileSchema)),
		account: settings.account
	};
};

export const actions: Actions = {
	default: async ({ request }) => {
		const user = requireUser();
		const form = await superValidate(request, zod4(profileSchema));
		if (!form.valid) return fail(400, { form });
		await saveProfileSettings(user.id, form.data);
		return message(form, 'Saved.');
	}
};
