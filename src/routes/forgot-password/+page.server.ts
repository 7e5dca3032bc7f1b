import { fail } from '@sveltejs/kit';
import { superValidate, message } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { forgotSchema } from '$lib/schemas/account';
import { auth } from '$lib/server/auth';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => ({ form: await superValidate(zod4(forgotSchema)) });

export const actions: Actions = {
	default: async ({ request }) => {
		const form = await superValidate(request, zod4(forgotSchema));
		if (!form.valid) return fail(400, { form });
		await auth.api.requestPasswordReset({ body: { email: form.data.email, redirectTo: '/reset-password' } }).catch(() => {});
		return message(form, 'If an account uses that address, a reset link is on its way.');
	}
};
