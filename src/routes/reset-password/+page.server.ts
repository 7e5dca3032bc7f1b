import { fail, redirect } from '@sveltejs/kit';
import { superValidate, message, setError } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { resetSchema } from '$lib/schemas/account';
import { auth } from '$lib/server/auth';
import { passwordProblem } from '$lib/server/members';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const token = url.searchParams.get('token') ?? '';
	const invalid = url.searchParams.get('error') === 'INVALID_TOKEN' || !token;
	return { invalid, form: await superValidate({ token, password: '', confirm: '' }, zod4(resetSchema), { errors: false }) };
};

export const actions: Actions = {
	default: async ({ request }) => {
		const form = await superValidate(request, zod4(resetSchema));
		if (!form.valid) return fail(400, { form });
		const problem = passwordProblem(form.data.password);
		if (problem) return setError(form, 'password', problem);
		try {
			await auth.api.resetPassword({ body: { token: form.data.token, newPassword: form.data.password } });
		} catch {
			return message(form, 'This reset link is invalid or has expired. Ask for a new one.', { status: 400 });
		}
		redirect(303, '/sign-in?reset=1');
	}
};
