// Integration tests against the real PostgreSQL of DATABASE_URL: the anonymous list cache (home, browse,
// search, API list) and the site-wide reader version it keys on. Writes are made by plain SQL as well as
// through the app — what another app instance sharing the database would do, which this process's
// cache never hears about — and the next anonymous request must see them. Nothing kept may ever reach a
// signed-in member, and nothing a signed-in member was shown may ever be kept.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { RequestEvent } from '@sveltejs/kit';
import { eq, sql } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { createMember, insertBuilds, removeMembers, uniqueWord } from '../testing/discover';
import { listPage } from '../discover';
import { GET as apiList } from '../../../routes/api/v1/builds/+server';
import { clearListCache, handleListCache, isCachedList, listCacheSize } from './list-cache';
import { currentReaderVersion } from './reader-version';

const ORIGIN = 'http://127.0.0.1:3999';
const members: string[] = [];
let maker: Awaited<ReturnType<typeof createMember>>;
let word: string;

beforeAll(async () => {
	maker = await createMember('maker', 'List Cache');
	members.push(maker.id);
	word = uniqueWord();
});
afterAll(() => removeMembers(members));
beforeEach(() => clearListCache());

type Who = { id: string; name: string; role: string } | null;

/**
 * A GET through the list cache hook; the route behind it is the real one (the browse and search pages'
 * listPage, or the API list), and `rendered` counts how often it ran.
 */
async function request(path: string, who: Who = null, headers: Record<string, string> = {}) {
	const url = new URL(path, ORIGIN);
	const event = { request: new Request(url, { headers }), url, locals: { user: who, session: null }, isDataRequest: false } as unknown as RequestEvent;
	let rendered = 0;
	const response = await handleListCache({
		event,
		resolve: async (e: RequestEvent) => {
			rendered++;
			if (e.url.pathname === '/api/v1/builds') return apiList({ url: e.url, request: e.request, locals: e.locals } as never);
			const data = await listPage(e.url, 24);
			// What a signed-in member's page would carry on top of the list.
			const page = { ...data, viewer: e.locals.user ? { name: e.locals.user.name } : null };
			return new Response(JSON.stringify(page), { status: 200, headers: { 'content-type': 'text/html; charset=utf-8' } });
		}
	} as never);
	return { response, rendered, text: response.status === 200 ? await response.text() : '' };
}

const slugsOf = (text: string) => ((JSON.parse(text) as { builds?: { slug: string }[]; items?: { slug: string }[] }).builds ?? JSON.parse(text).items).map((b: { slug: string }) => b.slug);

describe('reader version (migration 0012)', () => {
	it('moves once per transaction that touches a non-draft build; drafts and rolled-back writes leave it', async () => {
		const [p1, p2] = await insertBuilds(maker.id, [{ title: `V one ${word}` }, { title: `V two ${word}` }]);
		const [draft] = await insertBuilds(maker.id, [{ title: `V draft ${word}`, status: 'draft' }]);
		const v0 = (await currentReaderVersion()).version;

		await db.transaction(async (tx) => {
			await tx.update(schema.build).set({ summary: 'one' }).where(eq(schema.build.id, p1.id));
			await tx.update(schema.build).set({ summary: 'two' }).where(eq(schema.build.id, p2.id));
		});
		const v1 = (await currentReaderVersion()).version;
		expect(v1).toBe(v0 + 1);

		await db.update(schema.build).set({ summary: 'draft only' }).where(eq(schema.build.id, draft.id));
		expect((await currentReaderVersion()).version).toBe(v1);

		await db
			.transaction(async (tx) => {
				await tx.update(schema.build).set({ summary: 'never' }).where(eq(schema.build.id, p1.id));
				throw new Error('roll back');
			})
			.catch(() => undefined);
		expect((await currentReaderVersion()).version).toBe(v1);

		// A comment (0004's triggers touch its build) and a draft going public both move it.
		await db.execute(sql`insert into comment (build_id, author_id, body_md, body_html) values (${p1.id}, ${maker.id}, 'x', '<p>x</p>')`);
		const v2 = (await currentReaderVersion()).version;
		expect(v2).toBe(v1 + 1);
		await db.update(schema.build).set({ status: 'published', publishedAt: new Date() }).where(eq(schema.build.id, draft.id));
		expect((await currentReaderVersion()).version).toBe(v2 + 1);
	});

	it('concurrent callers share reads, and every caller gets a read that started after it asked', async () => {
		const before = (await currentReaderVersion()).version;
		const first = currentReaderVersion();
		// Committed while `first` may already be in flight: a caller asking now must see it.
		await insertBuilds(maker.id, [{ title: `V three ${word}` }]);
		const many = await Promise.all(Array.from({ length: 6 }, () => currentReaderVersion()));
		expect((await first).version).toBeGreaterThanOrEqual(before);
		expect(many.every((m) => m.version === before + 1)).toBe(true);
		// One read in flight, one queued behind it: six callers, at most two reads.
		expect(new Set(many).size).toBeLessThanOrEqual(2);
	});
});

describe('anonymous list cache', () => {
	it('keeps home, browse, search and the API list only', () => {
		expect(['/', '/builds', '/search', '/api/v1/builds'].every(isCachedList)).toBe(true);
		expect(['/builds/x', '/my-builds', '/bench', '/api/v1/builds/x', '/review-desk', '/makers/x'].some(isCachedList)).toBe(false);
	});

	for (const [n, path] of ['/builds?q=WORD', '/search?q=WORD', '/api/v1/builds?q=WORD'].entries()) {
		it(`${path.split('?')[0]}: the second anonymous read is kept; a build published by another instance shows at once`, async () => {
			const url = path.replace('WORD', word + 'l' + 'bcd'[n]);
			const q = new URL(url, ORIGIN).searchParams.get('q')!;
			await insertBuilds(maker.id, [{ title: `Listed ${q}` }]);
			const first = await request(url);
			expect(first.rendered).toBe(1);
			expect(slugsOf(first.text)).toHaveLength(1);
			const second = await request(url);
			expect(second.rendered).toBe(0);
			expect(second.text).toBe(first.text);

			// Published by plain SQL (another instance): the next read renders again and shows it.
			const [fresh] = await insertBuilds(maker.id, [{ title: `Listed again ${q}` }]);
			const third = await request(url);
			expect(third.rendered).toBe(1);
			expect(slugsOf(third.text)).toContain(fresh.slug);

			// Back to draft by plain SQL: gone for the next reader.
			await db.update(schema.build).set({ status: 'draft' }).where(eq(schema.build.id, fresh.id));
			const fourth = await request(url);
			expect(fourth.rendered).toBe(1);
			expect(slugsOf(fourth.text)).not.toContain(fresh.slug);
		});
	}

	it('a draft never reaches a kept list; a signed-in answer is never kept and never served from the cache', async () => {
		const q = word + 'dr';
		const [pub] = await insertBuilds(maker.id, [{ title: `Shown ${q}` }]);
		const [draft] = await insertBuilds(maker.id, [{ title: `Hidden ${q}`, status: 'draft' }]);
		const member: Who = { id: maker.id, name: 'Signed-in Member', role: 'maker' };

		// Signed in first: rendered, not kept.
		const mine = await request(`/builds?q=${q}`, member);
		expect(mine.rendered).toBe(1);
		expect(mine.text).toContain('Signed-in Member');
		expect(listCacheSize()).toBe(0);

		const anon = await request(`/builds?q=${q}`);
		expect(anon.rendered).toBe(1);
		expect(anon.text).not.toContain('Signed-in Member');
		expect(slugsOf(anon.text)).toEqual([pub.slug]);
		expect(anon.text).not.toContain(draft.slug);
		expect(listCacheSize()).toBe(1);

		// With the anonymous answer kept, a member still gets their own render.
		const again = await request(`/builds?q=${q}`, member);
		expect(again.rendered).toBe(1);
		expect(again.text).toContain('Signed-in Member');
		// And the anonymous reader the kept one, with no trace of the member.
		const kept = await request(`/builds?q=${q}`);
		expect(kept.rendered).toBe(0);
		expect(kept.text).not.toContain('Signed-in Member');
	});

	it('answers 304 to the ETag it gave; data requests and other methods pass through', async () => {
		const q = word + 'et';
		await insertBuilds(maker.id, [{ title: `Tagged ${q}` }]);
		const first = await request(`/api/v1/builds?q=${q}`);
		const etag = first.response.headers.get('etag')!;
		expect(etag).toBeTruthy();
		const cond = await request(`/api/v1/builds?q=${q}`, null, { 'if-none-match': etag });
		expect(cond.response.status).toBe(304);
		expect(cond.rendered).toBe(0);
		// After a change the old tag no longer matches.
		await insertBuilds(maker.id, [{ title: `Tagged again ${q}` }]);
		const changed = await request(`/api/v1/builds?q=${q}`, null, { 'if-none-match': etag });
		expect(changed.response.status).toBe(200);
		expect(slugsOf(changed.text)).toHaveLength(2);

		const url = new URL(`/builds?q=${q}`, ORIGIN);
		let ran = 0;
		for (const e of [
			{ request: new Request(url), url, locals: { user: null }, isDataRequest: true },
			{ request: new Request(url, { method: 'POST', body: 'a=1', headers: { 'content-type': 'application/x-www-form-urlencoded' } }), url, locals: { user: null }, isDataRequest: false }
		]) {
			await handleListCache({ event: e as never, resolve: async () => (ran++, new Response('x', { headers: { 'content-type': 'text/html' } })) } as never);
		}
		expect(ran).toBe(2);
	});

	it('renders once for many readers who miss at the same moment; never keeps an error or a cookie', async () => {
		const q = word + 'co';
		await insertBuilds(maker.id, [{ title: `Crowd ${q}` }]);
		const answers = await Promise.all(Array.from({ length: 8 }, () => request(`/search?q=${q}`)));
		expect(answers.reduce((n, a) => n + a.rendered, 0)).toBe(1);
		expect(new Set(answers.map((a) => a.text)).size).toBe(1);

		const url = new URL(`/builds?q=${q}zz`, ORIGIN);
		const run = (response: Response) =>
			handleListCache({ event: { request: new Request(url), url, locals: { user: null }, isDataRequest: false } as never, resolve: async () => response } as never);
		await run(new Response('boom', { status: 500, headers: { 'content-type': 'text/html' } }));
		await run(new Response('hello', { status: 200, headers: { 'content-type': 'text/html', 'set-cookie': 'a=b' } }));
		expect(listCacheSize()).toBe(1);
	});
});
