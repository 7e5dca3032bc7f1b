// Integration (real PostgreSQL): one-click unsubscribe from the review desk digest — the mail carries a signed,
// expiring link and RFC 8058 headers (List-Unsubscribe with an https/http URI, List-Unsubscribe-Post:
// List-Unsubscribe=One-Click, RFC 8058 §3.1); opening the link changes nothing, posting it (the page's button or the
// mail client's one-click POST) stops the digest without signing in; a tampered, cut-short or expired token gets a
// clear 4xx sentence and changes nothing.
import { afterAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { isHttpError, isRedirect } from '@sveltejs/kit';
import { db } from '../db';
import * as schema from '../db/schema';
import { listUnsubscribeHeaders, stopMail } from '../mail';
import { readUnsubscribeToken, unsubscribeToken, unsubscribeLinkDays, verifyUnsubscribeToken } from '../notifications';
import { useTestUsers } from '../testing/builds';
import { createPublishedBuild } from '../testing/reviews';
import { followedCategories, requestReview, sendReviewDigest, setFollowedCategories } from './index';
import { POST as oneClick } from '../../../routes/unsubscribe/one-click/+server';
import { actions, load } from '../../../routes/unsubscribe/+page.server';

const { follower, maker } = useTestUsers({ follower: ['reviewer', 'Digest reader'], maker: ['maker', 'Asker'] });

afterAll(() => stopMail());

const base64url = (s: string) => Buffer.from(s, 'utf8').toString('base64url');

async function digestUnsubscribeUrl(): Promise<string> {
	await setFollowedCategories(follower, ['power-amp', 'preamp']);
	const t0 = new Date(Date.now() - 1000);
	const b = await createPublishedBuild(maker);
	expect(await requestReview(maker, b.id)).toBe('queued');
	expect(await sendReviewDigest(follower.id)).not.toBeNull();
	const [{ email }] = await db.select({ email: schema.user.email }).from(schema.user).where(eq(schema.user.id, follower.id));
	const [job] = await db.execute<{ url: string; text: string }>(
		sql`select data->>'unsubscribeUrl' as url, data->>'text' as text from pgboss.job where name = 'mail' and data->>'to' = ${email} and created_on >= ${t0.toISOString()}::timestamptz`
	);
	expect(job.text).toContain(job.url); // the footer carries the same link
	return job.url;
}

const postOneClick = (token: string, body = 'List-Unsubscribe=One-Click') => {
	const url = new URL(`http://localhost/unsubscribe/one-click?token=${encodeURIComponent(token)}`);
	return oneClick({ url, request: new Request(url, { method: 'POST', body, headers: { 'content-type': 'application/x-www-form-urlencoded' } }) } as never);
};

const loadPage = async (token: string, done = '') =>
	load({ url: new URL(`http://localhost/unsubscribe?token=${encodeURIComponent(token)}${done}`) } as never) as Record<string, unknown>;

describe('review desk digest: one-click unsubscribe', () => {
	it('the digest mail carries a signed link and the RFC 8058 headers', async () => {
		const link = new URL(await digestUnsubscribeUrl());
		const token = link.searchParams.get('token')!;
		expect(verifyUnsubscribeToken(token)).toEqual({ userId: follower.id, kind: 'digest' });
		const h = listUnsubscribeHeaders(link.toString());
		// RFC 8058 §3.1: List-Unsubscribe holds one URI in angle brackets; List-Unsubscribe-Post is exactly this value.
		expect(h['List-Unsubscribe-Post']).toBe('List-Unsubscribe=One-Click');
		const inHeader = new URL(/^<(.+)>$/.exec(h['List-Unsubscribe'])![1]);
		expect(inHeader.pathname).toBe('/unsubscribe/one-click');
		expect(inHeader.searchParams.get('token')).toBe(token);
	});

	it('GET asks first and changes nothing; POST (the page’s button) stops the digest without signing in', async () => {
		const token = new URL(await digestUnsubscribeUrl()).searchParams.get('token')!;
		const page = await loadPage(token);
		expect(page.state).toBe('ask');
		expect(page.kind).toBe('digest');
		expect(page.following).toEqual(['Power amp', 'Preamp']);
		expect(await followedCategories(follower.id)).toEqual(['power-amp', 'preamp']);

		const form = new FormData();
		form.set('token', token);
		const thrown = await Promise.resolve().then(() => actions.unsubscribe({ request: new Request('http://localhost/unsubscribe?/unsubscribe', { method: 'POST', body: form }) } as never)).catch((e: unknown) => e);
		expect(isRedirect(thrown) && thrown.location).toBe(`/unsubscribe?token=${encodeURIComponent(token)}&done=off`);
		expect(await followedCategories(follower.id)).toEqual([]);
		// No digest is sent while nothing is followed.
		expect(await sendReviewDigest(follower.id)).toBeNull();
	});

	it('the mail client’s one-click POST stops the digest too; without the RFC 8058 body it is refused', async () => {
		const token = new URL(await digestUnsubscribeUrl()).searchParams.get('token')!;
		const bare = await postOneClick(token, '');
		expect(bare.status).toBe(400);
		expect(await followedCategories(follower.id)).toEqual(['power-amp', 'preamp']);
		const res = await postOneClick(token);
		expect(res.status).toBe(200);
		expect(await followedCategories(follower.id)).toEqual([]);
	});

	it('a tampered, cut-short or expired token gets a clear 4xx sentence and changes nothing', async () => {
		const token = new URL(await digestUnsubscribeUrl()).searchParams.get('token')!;
		const [payload, sig] = token.split('.');
		const [userId, , expires] = Buffer.from(payload, 'base64url').toString('utf8').split('\n');
		const tampered = [
			`${base64url(`${maker.id}\ndigest\n${expires}`)}.${sig}`, // someone else's id, old signature
			`${base64url(`${userId}\nreview\n${expires}`)}.${sig}`, // another kind
			`${base64url(`${userId}\ndigest\n${Number(expires) + 86_400 * 365}`)}.${sig}`, // a later expiry
			`${payload}.${sig.slice(0, -3)}abc`, // signature changed
			token.slice(0, 30) // cut short when copied
		];
		for (const t of tampered) {
			expect(readUnsubscribeToken(t)).toEqual({ ok: false, reason: 'invalid' });
			const res = await postOneClick(t);
			expect(res.status).toBe(400);
			expect(await res.text()).toMatch(/^This unsubscribe link is not valid\. .*account page\.$/);
			const refused = await loadPage(t).catch((e: unknown) => e);
			expect(isHttpError(refused) && refused.status).toBe(400);
			expect(isHttpError(refused) && refused.body.message).toContain('not valid');
		}
		expect(await followedCategories(follower.id)).toEqual(['power-amp', 'preamp']);

		// Expired: a link written longer ago than UNSUBSCRIBE_LINK_DAYS → 410 Gone with its own sentence.
		const old = unsubscribeToken(follower.id, 'digest', Date.now() - (unsubscribeLinkDays() + 1) * 86_400_000);
		expect(readUnsubscribeToken(old)).toEqual({ ok: false, reason: 'expired' });
		const res = await postOneClick(old);
		expect(res.status).toBe(410);
		expect(await res.text()).toContain('has expired');
		const refused = await loadPage(old).catch((e: unknown) => e);
		expect(isHttpError(refused) && refused.status).toBe(410);
		expect(await followedCategories(follower.id)).toEqual(['power-amp', 'preamp']);
		// One day inside the limit still works.
		expect(readUnsubscribeToken(unsubscribeToken(follower.id, 'digest', Date.now() - (unsubscribeLinkDays() - 1) * 86_400_000)).ok).toBe(true);
	});

	it('a notification link from before links expired (two fields) is still honoured; a digest link never has that form', async () => {
		const { createHmac } = await import('node:crypto');
		const { env } = await import('$env/dynamic/private');
		const legacy = (kind: string) => {
			const p = base64url(`${follower.id}\n${kind}`);
			return `${p}.${createHmac('sha256', env.BETTER_AUTH_SECRET!).update(`unsubscribe:${p}`).digest('base64url')}`;
		};
		expect(readUnsubscribeToken(legacy('review'))).toEqual({ ok: true, userId: follower.id, kind: 'review' });
		expect(readUnsubscribeToken(legacy('digest'))).toEqual({ ok: false, reason: 'invalid' });
	});
});
