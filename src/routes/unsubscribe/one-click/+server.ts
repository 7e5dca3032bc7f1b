import { redirect, text } from '@sveltejs/kit';
import { readUnsubscribeToken, refusedLinkText, setMailKind } from '$lib/server/notifications';
import type { RequestHandler } from './$types';

/**
 * RFC 8058 one-click unsubscribe: the mail client POSTs `List-Unsubscribe=One-Click` to the address in
 * the List-Unsubscribe header; the signed token in the query names the member and the kind. The
 * cross-site form check lets this one path through (the token is the proof; no cookie is used).
 * A tampered or cut-short token → 400, an expired one → 410, each with a sentence.
 */
export const POST: RequestHandler = async ({ url, request }) => {
	const claim = readUnsubscribeToken(url.searchParams.get('token'));
	if (!claim.ok) return text(refusedLinkText(claim.reason), { status: claim.reason === 'expired' ? 410 : 400 });
	const body = await request.text().catch(() => '');
	if (!new URLSearchParams(body).has('List-Unsubscribe')) {
		return text('Send List-Unsubscribe=One-Click (RFC 8058), or open the link in a browser.', { status: 400 });
	}
	const found = await setMailKind(claim.userId, claim.kind, false);
	if (!found) return text('The account this link belongs to no longer exists.', { status: 404 });
	return text('Unsubscribed.');
};

/** Opened in a browser: the page that asks first. */
export const GET: RequestHandler = async ({ url }) => {
	redirect(303, `/unsubscribe?token=${encodeURIComponent(url.searchParams.get('token') ?? '')}`);
};
