import { fail } from '@sveltejs/kit';
import { superValidate, message } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { resendSchema } from '$lib/schemas/account';
import { resendConfirmation } from '$lib/server/members';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => ({
	form: await superValidate({ email: url.searchParams.get('email') ?? '' }, zod4(resendSchema), { errors: false })
});

export const actions: Actions = {
	default: async ({ request, getClientAddress }) => {
		const form = await superValidate(request, zod4(resendSchema));
		if (!form.valid) return fail(400, { form });
		const result = await resendConfirmation(form.data.email, getClientAddress());
		if (!result.ok) return message(form, result.message, { status: result.status as 429 });
		return message(form, 'If an account with that address is waiting for confirmation, a new link is on its way.');
	}
};
