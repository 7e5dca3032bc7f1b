// Integration tests against the real PostgreSQL of DATABASE_URL: readers see the published snapshot, and
// the anonymous reader cache (page data + ETag/304) never leaks a draft, pending changes, a hidden
// comment or a signed-in member's view — also when the write comes from another app instance (plain SQL
// on the shared database, which this process's cache never hears about).
import { describe, it, expect, beforeEach } from 'vitest';
import type { RequestEvent } from '@sveltejs/kit';
import { isHttpError } from '@sveltejs/kit';
import { sql } from 'drizzle-orm';
import { db } from '../db';
import { buildFields as fields, uniqueTitle, useTestUsers, type TestUser } from '../testing/builds';
import { addStep, archive, createDraft, getBuildDetail, publish, publishRevision, updateBuild, updateStep } from './index';
import { postComment } from '../comments';
import type { BuildInput } from '$lib/schemas/build';
import { setBuildLocked, setCommentHidden } from '../moderation';
import { clearReaderCache, handleReaderCache, readerCacheStats } from './reader-cache';
import { load } from '../../../routes/builds/[slug]/+page.server';

const { maker, reader, moderator, admin } = useTestUsers({
	maker: ['maker', 'Cache Maker'],
	reader: ['maker', 'Cache Reader'],
	moderator: ['moderator', 'Cache Mod'],
	admin: ['admin', 'Cache Admin']
});
beforeEach(() => clearReaderCache());

const ORIGIN = 'http://127.0.0.1:3999';

/** A published build (Rev A) with one step. */
async function publishedBuild() {
	const title = uniqueTitle('Cache chip amp');
	const b = await createDraft(maker.id, fields(title));
	const step = await addStep(maker, b.id, { title: 'Wire the rails', bodyMd: 'Published text about the rails.' });
	await publish(maker, b.id);
	return { id: b.id, slug: b.slug, title, stepId: step.id };
}

type PageOut = {
	build: { title: string; status: string; locked: boolean };
	steps: { title: string; bodyHtml: string }[];
	comments: { id: string; bodyHtml?: string; hidden?: boolean }[];
	viewer: unknown;
	can: { edit: boolean };
};

/** The build page's load as `who` sees it (null: not signed in), through the reader cache hook like a request. */
async function page(slug: string, who: TestUser | null): Promise<PageOut> {
	const event = {
		params: { slug },
		locals: { user: who ? { id: who.id, name: who.name, handle: who.handle, role: who.role } : null, session: null },
		url: new URL(`${ORIGIN}/builds/${slug}`)
	};
	return (await load(event as never)) as unknown as PageOut;
}

/** Run the reader cache hook for a GET of the page; `rendered` counts how often the page itself ran. */
async function request(slug: string, who: TestUser | null, headers: Record<string, string> = {}) {
	const url = new URL(`${ORIGIN}/builds/${slug}`);
	const locals: App.Locals = { user: who ? ({ id: who.id, name: who.name, role: who.role } as never) : null, session: null };
	const event = { request: new Request(url, { headers }), url, locals, isDataRequest: false } as unknown as RequestEvent;
	let rendered = 0;
	const response = await handleReaderCache({
		event,
		resolve: async (e: RequestEvent) => {
			rendered++;
			const data = (await load({ params: { slug }, locals: e.locals, url: e.url } as never)) as unknown as PageOut;
			return new Response(JSON.stringify(data), { status: 200, headers: { 'content-type': 'text/html' } });
		}
	} as never);
	return { response, rendered, body: response.status === 200 ? await response.text() : '' };
}

const allText = (p: PageOut) => JSON.stringify(p);

describe('readers see the published snapshot', () => {
	it('pending changes show to the maker only; readers, signed in or not, page or API, get the revision', async () => {
		const b = await publishedBuild();
		await updateStep(maker, b.stepId, { title: 'Wire the rails', bodyMd: 'PENDING-SECRET wording not yet published.' });
		await updateBuild(maker, b.id, fields(`${b.title} PENDING-TITLE`));

		const own = await page(b.slug, maker);
		expect(allText(own)).toContain('PENDING-SECRET');
		expect(own.build.title).toContain('PENDING-TITLE');
		for (const who of [null, reader, moderator]) {
			const seen = await page(b.slug, who);
			expect(allText(seen), who?.name ?? 'anonymous').not.toContain('PENDING');
			expect(seen.build.title).toBe(b.title);
			expect(seen.steps[0].bodyHtml).toContain('Published text about the rails.');
			const api = await getBuildDetail(b.slug, who);
			expect(JSON.stringify(api)).not.toContain('PENDING');
			expect(api.steps[0].bodyMd).toBe('Published text about the rails.');
		}
		expect(JSON.stringify(await getBuildDetail(b.slug, maker))).toContain('PENDING-SECRET');

		// Published as Rev B: now everyone reads it.
		await publishRevision(maker, b.id, 'new wording');
		expect(allText(await page(b.slug, null))).toContain('PENDING-SECRET');
	});
});

describe('anonymous reader cache', () => {
	it('serves the second anonymous read from the cache, and a signed-in render never fills it', async () => {
		const b = await publishedBuild();
		await updateStep(maker, b.stepId, { title: 'Wire the rails', bodyMd: 'PENDING-SECRET again.' });
		// Signed-in first (the maker sees pending text, the reader their own view), then anonymous.
		await page(b.slug, maker);
		await page(b.slug, reader);
		expect(readerCacheStats().entries).toBe(0);
		const anon = await page(b.slug, null);
		expect(allText(anon)).not.toContain('PENDING');
		expect(anon.viewer).toBeNull();
		expect(anon.can.edit).toBe(false);
		expect(readerCacheStats().entries).toBe(1);
		// The maker still gets their live view after the anonymous one was cached.
		const own = await page(b.slug, maker);
		expect(allText(own)).toContain('PENDING-SECRET');
		expect(own.can.edit).toBe(true);
	});

	it('a hidden comment disappears for the next anonymous reader, hidden through the app or by another instance', async () => {
		const b = await publishedBuild();
		const ref = { id: b.id, slug: b.slug, status: 'published', locked: false, ownerId: maker.id };
		const c1 = await postComment(reader, ref as never, { body: 'COMMENT-ONE about the fuse rating.' });
		const c2 = await postComment(reader, ref as never, { body: 'COMMENT-TWO about the heatsink.' });
		expect(allText(await page(b.slug, null))).toContain('COMMENT-ONE');
		await setCommentHidden(moderator, c1.id, true, 'off topic');
		const after = allText(await page(b.slug, null));
		expect(after).not.toContain('COMMENT-ONE');
		expect(after).toContain('COMMENT-TWO');
		// Another app instance hides the second one: only the shared database knows.
		await db.execute(sql`update comment set hidden = true, hidden_reason = 'x' where id = ${c2.id}`);
		expect(allText(await page(b.slug, null))).not.toContain('COMMENT-TWO');
	});

	it('archive, lock and a draft: the anonymous view follows every state, drafts are never cached', async () => {
		const b = await publishedBuild();
		expect((await page(b.slug, null)).build.status).toBe('published');
		await setBuildLocked(moderator, b.id, true, 'under discussion');
		expect((await page(b.slug, null)).build.locked).toBe(true);
		await archive(admin, b.id);
		expect((await page(b.slug, null)).build.status).toBe('archived');
		const archived = await request(b.slug, null);
		const etag = archived.response.headers.get('etag')!;
		expect(etag).toBeTruthy();
		// Another instance turns it back into a draft (as a test fixture would): anonymous now gets 404,
		// also with the tag of the archived page (no 304 for a draft).
		await db.execute(sql`update build set status = 'draft' where id = ${b.id}`);
		const is404 = (e: unknown) => isHttpError(e) && e.status === 404;
		await expect(page(b.slug, null)).rejects.toSatisfy(is404);
		await expect(request(b.slug, null, { 'if-none-match': etag })).rejects.toSatisfy(is404);
	});

	it('answers 304 to If-None-Match / If-Modified-Since for the same version only; signed-in members get no validator', async () => {
		const b = await publishedBuild();
		const first = await request(b.slug, null);
		expect(first.response.status).toBe(200);
		expect(first.rendered).toBe(1);
		const etag = first.response.headers.get('etag')!;
		const lastModified = first.response.headers.get('last-modified')!;
		expect(etag).toMatch(/^W\/"r/);
		expect(first.response.headers.get('cache-control')).toBe('no-cache');
		expect(first.response.headers.get('vary')).toContain('Cookie');

		const again = await request(b.slug, null, { 'if-none-match': etag });
		expect(again.response.status).toBe(304);
		expect(again.rendered).toBe(0);
		const byDate = await request(b.slug, null, { 'if-modified-since': lastModified });
		expect(byDate.response.status).toBe(304);

		// A signed-in member (the maker) with the same tag gets the full page and no tag.
		const own = await request(b.slug, maker, { 'if-none-match': etag });
		expect(own.response.status).toBe(200);
		expect(own.response.headers.get('etag')).toBeNull();

		// A comment posted anywhere moves the version: the old tag no longer matches.
		const ref = { id: b.id, slug: b.slug, status: 'published', locked: false, ownerId: maker.id };
		await postComment(reader, ref as never, { body: 'COMMENT-NEW on the transformer.' });
		const changed = await request(b.slug, null, { 'if-none-match': etag });
		expect(changed.response.status).toBe(200);
		expect(changed.body).toContain('COMMENT-NEW');
		expect(changed.response.headers.get('etag')).not.toBe(etag);

		// Pending changes move the version too (the maker's page differs) but never reach the anonymous body.
		await updateStep(maker, b.stepId, { title: 'Wire the rails', bodyMd: 'PENDING-SECRET three.' });
		const pending = await request(b.slug, null, { 'if-none-match': changed.response.headers.get('etag')! });
		expect(pending.response.status).toBe(200);
		expect(pending.body).not.toContain('PENDING');
	});

	it('serves the rendered page again for the same version only, never to a signed-in member', async () => {
		const b = await publishedBuild();
		await updateStep(maker, b.stepId, { title: 'Wire the rails', bodyMd: 'PENDING-SECRET four.' });
		// The maker renders first: nothing of it is kept for readers.
		const own = await request(b.slug, maker);
		expect(own.body).toContain('PENDING-SECRET');
		const first = await request(b.slug, null);
		expect(first.rendered).toBe(1);
		expect(first.body).not.toContain('PENDING');
		const second = await request(b.slug, null);
		expect(second.rendered).toBe(0);
		expect(second.body).toBe(first.body);
		expect(second.response.headers.get('etag')).toBe(first.response.headers.get('etag'));
		expect((await request(b.slug, maker)).rendered).toBe(1);
		// Another instance hides the build's only comment… or here: locks it. The next reader gets a new render.
		await db.execute(sql`update build set locked = true where id = ${b.id}`);
		const third = await request(b.slug, null);
		expect(third.rendered).toBe(1);
		expect(third.body).toContain('"locked":true');
	});

	it('a page carrying a CSP nonce is never kept', async () => {
		const b = await publishedBuild();
		const url = new URL(`${ORIGIN}/builds/${b.slug}`);
		let rendered = 0;
		const once = () =>
			handleReaderCache({
				event: { request: new Request(url), url, locals: { user: null, session: null }, isDataRequest: false } as unknown as RequestEvent,
				resolve: async () => {
					rendered++;
					return new Response('<script nonce="abc">x</script>', { status: 200, headers: { 'content-type': 'text/html' } });
				}
			} as never);
		await once();
		await once();
		expect(rendered).toBe(2);
	});

	it('a member renamed by another instance shows under the new name', async () => {
		const b = await publishedBuild();
		const before = await page(b.slug, null);
		expect(allText(before)).toContain(maker.name);
		await db.execute(sql`update "user" set name = ${maker.name + ' Renamed'} where id = ${maker.id}`);
		expect(allText(await page(b.slug, null))).toContain(`${maker.name} Renamed`);
		await db.execute(sql`update "user" set name = ${maker.name} where id = ${maker.id}`);
	});
});
