import { fail, redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth';
import { removeAvatar, setAvatar } from '$lib/server/members';
import { PhotoError } from '$lib/server/photos';
import { consumeUpload, uploadLimitSentence } from '$lib/server/rate-limit';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = () => redirect(303, '/account');

export const actions: Actions = {
	upload: async ({ request }) => {
		const user = requireUser();
		const data = await request.formData();
		const file = data.get('avatar');
		if (!(file instanceof File) || file.size === 0) return fail(400, { avatarError: 'Choose a picture to upload.' });
		const budget = await consumeUpload(user.id);
		if (!budget.ok) return fail(429, { avatarError: uploadLimitSentence(budget.retryAfterS) });
		try {
			await setAvatar(user.id, new Uint8Array(await file.arrayBuffer()));
		} catch (err) {
			if (err instanceof PhotoError) return fail(err.status, { avatarError: err.message });
			throw err;
		}
		redirect(303, '/account?avatar=saved');
	},
	remove: async () => {
		const user = requireUser();
		await removeAvatar(user.id);
		redirect(303, '/account?avatar=removed');
	}
};
