import { fail, redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth';
import { removeAvatar, setAvatar } from '$lib/server/members';
import { FieldError, readUploadForm } from '$lib/server/http';
import { photoMaxBytes } from '$lib/server/photos';
import { consumeUpload, uploadLimitSentence } from '$lib/server/rate-limit';
import type { Actions, PageServerLoad } from './$types';

/** Nothing to show on its own; after a refused upload (a POST) this page says why. */
export const load: PageServerLoad = ({ request }) => {
	if (request.method !== 'POST') redirect(303, '/account');
};

export const actions: Actions = {
	upload: async ({ request }) => {
		const user = requireUser();
		try {
			const data = await readUploadForm(request, 'avatar', photoMaxBytes(), 'picture');
			const file = data.get('avatar');
			if (!(file instanceof File) || file.size === 0) return fail(400, { avatarError: 'Choose a picture to upload.' });
			const budget = await consumeUpload(user.id);
			if (!budget.ok) return fail(429, { avatarError: uploadLimitSentence(budget.retryAfterS) });
			await setAvatar(user.id, new Uint8Array(await file.arrayBuffer()));
		} catch (err) {
			// PhotoError is a FieldError: a refusal the member can act on.
			if (err instanceof FieldError) return fail(err.status, { avatarError: err.message });
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
