import { error, fail, redirect } from '@sveltejs/kit';
import { NOTIFY_KIND_TEXT, setNotification, verifyUnsubscribeToken } from '$lib/server/notifications';
import type { Actions, PageServerLoad } from './$types';

/**
 * Opt-out from a notification mail without signing in: the link's signed token names the member and
 * the kind. Opening the link changes nothing (mail scanners open links too); the page asks, and the
 * button posts. After a change the action redirects here with `done=off` or `done=on`, which again
 * changes nothing. Mail clients use the RFC 8058 one-click POST at /unsubscribe/one-click instead.
 */
export const load: PageServerLoad = async ({ url }) => {
	const token = url.searchParams.get('token');
	const claim = verifyUnsubscribeToken(token);
	if (!claim) error(400, 'This unsubscribe link is not valid. It may have been cut short when copied; open it from the e-mail again, or change your e-mail settings on your account page.');
	const done = url.searchParams.get('done');
	return {
		token: token!,
		kind: claim.kind,
		what: NOTIFY_KIND_TEXT[claim.kind],
		state: done === 'on' ? ('on' as const) : done === 'off' ? ('off' as const) : ('ask' as const)
	};
};

async function change(request: Request, on: boolean) {
	const token = String((await request.formData()).get('token') ?? '');
	const claim = verifyUnsubscribeToken(token);
	if (!claim) return fail(400, { error: 'This link is not valid.' });
	const found = await setNotification(claim.userId, claim.kind, on);
	if (!found) return fail(404, { error: 'The account this link belongs to no longer exists.' });
	redirect(303, `/unsubscribe?token=${encodeURIComponent(token)}&done=${on ? 'on' : 'off'}`);
}

export const actions: Actions = {
	unsubscribe: async ({ request }) => change(request, false),
	resubscribe: async ({ request }) => change(request, true)
};
