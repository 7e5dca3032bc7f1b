import { error, fail } from '@sveltejs/kit';
import { NOTIFY_KIND_TEXT, setNotification, verifyUnsubscribeToken } from '$lib/server/notifications';
import type { Actions, PageServerLoad } from './$types';

/**
 * One-click opt-out from a notification mail, without signing in: the link's signed token names the
 * member and the kind. Opening it turns that kind off; the page offers to turn it back on.
 */
export const load: PageServerLoad = async ({ url }) => {
	const token = url.searchParams.get('token');
	const claim = verifyUnsubscribeToken(token);
	if (!claim) error(400, 'This unsubscribe link is not valid. It may have been cut short when copied; open it from the e-mail again, or change your e-mail settings on your account page.');
	const found = await setNotification(claim.userId, claim.kind, false);
	if (!found) error(404, 'The account this link belongs to no longer exists.');
	return { token: token!, kind: claim.kind, what: NOTIFY_KIND_TEXT[claim.kind], on: false };
};

export const actions: Actions = {
	resubscribe: async ({ request }) => {
		const token = String((await request.formData()).get('token') ?? '');
		const claim = verifyUnsubscribeToken(token);
		if (!claim) return fail(400, { error: 'This link is not valid.' });
		await setNotification(claim.userId, claim.kind, true);
		return { resubscribed: true };
	}
};
