import { fail, redirect } from '@sveltejs/kit';
import { superValidate, setError, message } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { signUpSchema } from '$lib/schemas/account';
import { signUp } from '$lib/server/members';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	if (locals.user) redirect(303, '/');
	return { form: await superValidate(zod4(signUpSchema)) };
};

export const actions: Actions = {
	default: async ({ request, getClientAddress }) => {
		const form = await superValidate(request, zod4(signUpSchema));
		if (!form.valid) {
			form.data.password = '';
			return fail(400, { form });
		}
		const result = await signUp(form.data, getClientAddress());
		if (!result.ok) {
			form.data.password = '';
			if (result.field) return setError(form, result.field, result.message);
			return message(form, result.message, { status: result.status as 429 });
		}
		redirect(303, `/sign-up/check-mail?email=${encodeURIComponent(form.data.email)}`);
	}
};
