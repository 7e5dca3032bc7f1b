import { error, fail, redirect } from '@sveltejs/kit';
import { NOTIFY_KIND_TEXT, readUnsubscribeToken, refusedLinkText, setMailKind } from '$lib/server/notifications';
import { followedCategories } from '$lib/server/reviews';
import { CATEGORY_LABELS } from '$lib/labels';
import type { Actions, PageServerLoad } from './$types';

/**
 * Opt-out from a notification mail or the review desk digest without signing in: the link's signed,
 * expiring token names the member and the kind. Opening the link changes nothing (mail scanners open links
 * too); the page asks, and the button posts. After a change the action redirects here with `done=off` or
 * `done=on`, which again changes nothing. Mail clients use the RFC 8058 one-click POST at
 * /unsubscribe/one-click instead. A refused token (tampered, cut short, expired) → 400/410 with a sentence.
 */
export const load: PageServerLoad = async ({ url }) => {
	const token = url.searchParams.get('token');
	const claim = readUnsubscribeToken(token);
	if (!claim.ok) error(claim.reason === 'expired' ? 410 : 400, refusedLinkText(claim.reason));
	const done = url.searchParams.get('done');
	return {
		token: token!,
		kind: claim.kind,
		what: NOTIFY_KIND_TEXT[claim.kind],
		/** The desk digest: the categories followed now (turned back on by picking them on the review desk). */
		following: claim.kind === 'digest' ? (await followedCategories(claim.userId)).map((c) => CATEGORY_LABELS[c]) : null,
		state: done === 'on' ? ('on' as const) : done === 'off' ? ('off' as const) : ('ask' as const)
	};
};

async function change(request: Request, on: boolean) {
	const token = String((await request.formData()).get('token') ?? '');
	const claim = readUnsubscribeToken(token);
	if (!claim.ok) return fail(claim.reason === 'expired' ? 410 : 400, { error: refusedLinkText(claim.reason) });
	if (on && claim.kind === 'digest') return fail(409, { error: 'Pick the categories to follow on the review desk (sign-in needed).' });
	const found = await setMailKind(claim.userId, claim.kind, on);
	if (!found) return fail(404, { error: 'The account this link belongs to no longer exists.' });
	redirect(303, `/unsubscribe?token=${encodeURIComponent(token)}&done=${on ? 'on' : 'off'}`);
}

export const actions: Actions = {
	unsubscribe: async ({ request }) => change(request, false),
	resubscribe: async ({ request }) => change(request, true)
};
