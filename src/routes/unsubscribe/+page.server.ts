import { error, fail, redirect } from '@sveltejs/kit';
import { NOTIFY_KIND_TEXT, setNotification, verifyUnsubscribeToken } from '$lib/server/notifications';
import type { Actions, PageServerLoad } from './$types';

/**
 * One-click opt-out from a notification mail, without signing in: the link's signed token names the
 * member and the kind. Opening it turns that kind off; the page offers to turn it back on. After turning
 * it back on, the action redirects here with `on=1`, which changes nothing (so the page's reload after the
 * action cannot switch the mail off again, and a browser without JavaScript keeps the token in the address).
 */
export const load: PageServerLoad = async ({ url }) => {
	const token = url.searchParams.get('token');
	const claim = verifyUnsubscribeToken(token);
	if (!claim) error(400, 'This unsubscribe link is not valid. It may have been cut short when copied; open it from the e-mail again, or change your e-mail settings on your account page.');
	const on = url.searchParams.get('on') === '1';
	if (!on) {
		const found = await setNotification(claim.userId, claim.kind, false);
		if (!found) error(404, 'The account this link belongs to no longer exists.');
	}
	return { token: token!, kind: claim.kind, what: NOTIFY_KIND_TEXT[claim.kind], on };
};

export const actions: Actions = {
	resubscribe: async ({ request }) => {
		const token = String((await request.formData()).get('token') ?? '');
		const claim = verifyUnsubscribeToken(token);
		if (!claim) return fail(400, { error: 'This link is not valid.' });
		const found = await setNotification(claim.userId, claim.kind, true);
		if (!found) return fail(404, { error: 'The account this link belongs to no longer exists.' });
		redirect(303, `/unsubscribe?token=${encodeURIComponent(token)}&on=1`);
	}
};
