import { fail } from '@sveltejs/kit';
import { superValidate, message } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { forgotSchema } from '$lib/schemas/account';
import { requestPasswordReset } from '$lib/server/members';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => ({ form: await superValidate(zod4(forgotSchema)) });

export const actions: Actions = {
	default: async ({ request, getClientAddress }) => {
		const form = await superValidate(request, zod4(forgotSchema));
		if (!form.valid) return fail(400, { form });
		const result = await requestPasswordReset(form.data.email, getClientAddress());
		if (!result.ok) return message(form, result.message, { status: result.status as 429 });
		return message(form, 'If an account uses that address, a reset link is on its way.');
	}
};
