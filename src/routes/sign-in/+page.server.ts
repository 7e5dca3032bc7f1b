import { fail, redirect } from '@sveltejs/kit';
import { superValidate, message, setError } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { signInSchema } from '$lib/schemas/account';
import { signInWithPassword } from '$lib/server/members';
import { safeNext } from '$lib/server/http/redirect';
import type { Actions, PageServerLoad } from './$types';


export const load: PageServerLoad = async ({ locals, url }) => {
	if (locals.user) redirect(303, safeNext(url.searchParams.get('next'), url.origin));
	return { form: await superValidate(zod4(signInSchema)) };
};

export const actions: Actions = {
	default: async ({ request, url, cookies, getClientAddress }) => {
		const form = await superValidate(request, zod4(signInSchema));
		if (!form.valid) return fail(400, { form });
		const result = await signInWithPassword(form.data.email, form.data.password, getClientAddress(), cookies);
		if (!result.ok) {
			form.data.password = '';
			if (result.code === 'INVALID_EMAIL_OR_PASSWORD') return setError(form, 'password', result.message);
			return message(form, result.message, { status: result.status === 429 ? 429 : 400 });
		}
		redirect(303, safeNext(url.searchParams.get('next'), url.origin));
	}
};
