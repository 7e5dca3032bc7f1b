import { fail, redirect } from '@sveltejs/kit';
import { superValidate, setError } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { signUpSchema } from '$lib/schemas/account';
import { emailTaken, handleIsFree, signUp } from '$lib/server/members';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	if (locals.user) redirect(303, '/');
	return { form: await superValidate(zod4(signUpSchema)) };
};

export const actions: Actions = {
	default: async ({ request }) => {
		const form = await superValidate(request, zod4(signUpSchema));
		if (!form.valid) {
			form.data.password = '';
			return fail(400, { form });
		}
		if (!(await handleIsFree(form.data.handle))) return setError(form, 'handle', 'That handle is taken; pick another.');
		if (await emailTaken(form.data.email)) {
			return setError(form, 'email', 'An account with this e-mail exists. Sign in, or reset the password.');
		}
		await signUp(form.data);
		redirect(303, `/sign-up/check-mail?email=${encodeURIComponent(form.data.email)}`);
	}
};
