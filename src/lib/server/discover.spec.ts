import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { GET as listBuilds } from '../../routes/api/v1/builds/+server';
import { cachedHomeLists, homeLists, listPage } from './discover';
import { decodeCursor, encodeCursor } from './builds/list';
import { createMember, insertBuilds, insertReview, removeMembers, uniqueWord } from './testing/discover';

type Item = { slug: string; title: string; derivedCount: number; publishedAt: string; review: { label: string } | null; match?: { titleHtml: string; snippetHtml: string } | null };

/** Call GET /api/v1/builds with a query string, as SvelteKit would. */
async function api(query: Record<string, string>): Promise<{ status: number; body: any }> {
	const url = new URL(`http://localhost/api/v1/builds?${new URLSearchParams(query)}`);
	const res = await listBuilds({ url, request: new Request(url), locals: { user: null, session: null } } as never);
	return { status: res.status, body: await res.json() };
}

const members: string[] = [];
afterAll(() => removeMembers(members));

describe('GET /api/v1/builds — keyset pagination under concurrent publishing', () => {
	let maker: Awaited<ReturnType<typeof createMember>>;
	let word: string;
	/** Builds published by "others" while the tests page (all orders). */
	const fresh = new Set<string>();
	/** slug → the values each order sorts on. */
	const original = new Map<string, { publishedAt: number; derivedCount: number; reviewedAt: number | null; rank: number }>();

	beforeAll(async () => {
		maker = await createMember('maker', 'Pager');
		members.push(maker.id);
		word = uniqueWord();
		const base = Date.now() - 10 * 86_400_000;
		// 23 builds; publish times tie in threes, derive counts tie in fours, review times tie and are null for a third.
		const specs = Array.from({ length: 23 }, (_, i) => ({
			title: `Pager ${word} ${i}`,
			summary: i % 2 ? `${word} ${word} twice` : '',
			publishedAt: new Date(base + Math.floor(i / 3) * 60_000),
			derivedCount: i % 4,
			lastReviewedAt: i % 3 === 0 ? null : new Date(base + (i % 5) * 3_600_000)
		}));
		const rows = await insertBuilds(maker.id, specs);
		rows.forEach((r, i) =>
			original.set(r.slug, {
				publishedAt: specs[i].publishedAt.getTime(),
				derivedCount: specs[i].derivedCount,
				reviewedAt: specs[i].lastReviewedAt?.getTime() ?? null,
				rank: 0
			})
		);
	});

	for (const sort of ['recent', 'most-derived', 'recently-reviewed', 'relevance'] as const) {
		it(`order "${sort}": every build exactly once, in order, while 2 builds are published before each page`, async () => {
			const query: Record<string, string> = { maker: maker.handle, sort, limit: '4' };
			if (sort === 'relevance') query.q = word;
			const seen: string[] = [];
			let cursor: string | null = null;
			for (let page = 0; page < 30; page++) {
				const r = await api(cursor ? { ...query, cursor } : query);
				expect(r.status).toBe(200);
				expect(r.body.sort).toBe(sort);
				seen.push(...r.body.items.map((i: Item) => i.slug));
				cursor = r.body.nextCursor;
				if (!cursor) break;
				// Others publish while the reader pages: new builds, some with the same derive counts and review times.
				const added = await insertBuilds(maker.id, [
					{ title: `Fresh ${word} a`, derivedCount: page % 4, lastReviewedAt: page % 2 ? new Date() : null },
					{ title: `Fresh ${word} b`, derivedCount: 3 }
				]);
				added.forEach((a) => fresh.add(a.slug));
			}
			expect(cursor).toBeNull();
			expect(new Set(seen).size).toBe(seen.length); // no repeats
			const originals = seen.filter((s) => original.has(s));
			expect(new Set(originals)).toEqual(new Set(original.keys())); // no skips
			expect(seen.every((s) => original.has(s) || fresh.has(s))).toBe(true);
			// The originals come in the order's sequence (each later one never sorts before an earlier one).
			const key = (s: string) => {
				const v = original.get(s)!;
				if (sort === 'most-derived') return [v.derivedCount, v.publishedAt];
				if (sort === 'recently-reviewed') return [v.reviewedAt ?? -Infinity, v.publishedAt];
				return [v.publishedAt];
			};
			if (sort !== 'relevance') {
				for (let i = 1; i < originals.length; i++) {
					const [a, b] = [key(originals[i - 1]), key(originals[i])];
					const cmp = a[0] !== b[0] ? a[0] - b[0] : (a[1] ?? 0) - (b[1] ?? 0);
					expect(cmp).toBeGreaterThanOrEqual(0);
				}
			}
		});
	}

	it('refuses a cursor it did not make, and one from another order', async () => {
		const bad = await api({ maker: maker.handle, cursor: 'not-a-cursor' });
		expect(bad.status).toBe(400);
		expect(bad.body.error).toMatchObject({ code: 'invalid', issues: [{ path: 'cursor' }] });
		const first = await api({ maker: maker.handle, limit: '2', sort: 'most-derived' });
		const other = await api({ maker: maker.handle, limit: '2', sort: 'recent', cursor: first.body.nextCursor });
		expect(other.status).toBe(400);
		expect(other.body.error.issues[0].path).toBe('cursor');
		const forged = encodeCursor({ sort: 'recent', keys: ["2026-01-01T00:00:00.000000'; drop table build; --"], id: crypto.randomUUID() });
		expect(decodeCursor(forged)).toBeNull();
		expect((await api({ cursor: forged })).status).toBe(400);
	});

	it('answers 400 with the field for a bad filter value', async () => {
		const r = await api({ category: 'spaceship', mains: 'maybe' });
		expect(r.status).toBe(400);
		expect(r.body.error.issues.map((i: { path: string }) => i.path).sort()).toEqual(['category', 'mains']);
		expect((await api({ sort: 'relevance' })).status).toBe(400); // relevance needs q
	});
});

describe('filters: category, topology, mains powered, review state, maker', () => {
	it('each filter selects exactly the builds that match it', async () => {
		const maker = await createMember('maker', 'Filterer');
		const reviewer = await createMember('reviewer', 'Looker');
		members.push(maker.id, reviewer.id);
		const [a, b, c, d, e] = await insertBuilds(maker.id, [
			{ title: 'A', category: 'power-amp', mainsPowered: true },
			{ title: 'B', category: 'preamp', topology: 'valve' },
			{ title: 'C', category: 'power-amp', revision: 1 },
			{ title: 'D', category: 'headphone-amp', revision: 2 },
			{ title: 'E', category: 'dac', reviewRequestedAt: new Date() }
		]);
		await insertReview(c.id, reviewer.id, 'safe', 1);
		await insertReview(d.id, reviewer.id, 'rework', 1);
		const slugs = async (q: Record<string, string>) => {
			const r = await api({ maker: maker.handle, ...q });
			expect(r.status).toBe(200);
			return r.body.items.map((i: Item) => i.slug).sort();
		};
		expect(await slugs({})).toEqual([a, b, c, d, e].map((x) => x.slug).sort());
		expect(await slugs({ category: 'power-amp' })).toEqual([a.slug, c.slug].sort());
		expect(await slugs({ topology: 'valve' })).toEqual([b.slug]);
		expect(await slugs({ mains: 'true' })).toEqual([a.slug]);
		expect(await slugs({ mains: 'false' })).toEqual([b, c, d, e].map((x) => x.slug).sort());
		expect(await slugs({ review: 'safe' })).toEqual([c.slug]);
		expect(await slugs({ review: 'rework' })).toEqual([]);
		expect(await slugs({ review: 'changed' })).toEqual([d.slug]);
		expect(await slugs({ review: 'waiting' })).toEqual([e.slug]);
		expect(await slugs({ review: 'unreviewed' })).toEqual([a.slug, b.slug].sort());
		expect(await slugs({ category: 'power-amp', review: 'safe' })).toEqual([c.slug]);
		// The list item carries the review state the badge shows.
		const r = await api({ maker: maker.handle, review: 'changed' });
		expect(r.body.items[0].review).toMatchObject({ label: 'rework-changed', verdict: 'rework', verdictRevision: 1 });
	});

	it('the browse page keeps going when a link carries a bad filter, and links the next page with the same filters', async () => {
		const maker = await createMember('maker', 'Browser');
		members.push(maker.id);
		await insertBuilds(maker.id, Array.from({ length: 5 }, (_, i) => ({ title: `Browse ${i}`, category: 'preamp' })));
		const page = await listPage(new URL(`http://localhost/builds?maker=${maker.handle}&category=preamp&topology=nonsense`), 3);
		expect(page.problems.map((p) => p.path)).toEqual(['topology']);
		expect(page.builds).toHaveLength(3);
		expect(page.filters).toMatchObject({ category: 'preamp', maker: maker.handle, sort: 'recent', topology: '' });
		const next = new URL(page.nextHref!, 'http://localhost');
		expect(next.pathname).toBe('/builds');
		expect(next.searchParams.get('category')).toBe('preamp');
		expect(next.searchParams.get('maker')).toBe(maker.handle);
		const second = await listPage(next, 3);
		expect(second.builds).toHaveLength(2);
		expect(second.nextHref).toBeNull();
		expect(new Set([...page.builds, ...second.builds].map((b) => b.slug)).size).toBe(5);
	});
});

describe('full-text search', () => {
	it('ranks title hits first, highlights with <mark> only, and escapes everything else', async () => {
		const maker = await createMember('maker', 'Searcher');
		members.push(maker.id);
		const word = uniqueWord();
		const [inTitle, inSteps, unrelated] = await insertBuilds(maker.id, [
			{ title: `Toroid ${word} supply`, summary: 'A supply.' },
			{ title: 'Plain title', summary: `<script>alert(1)</script> ${word} wiring`, searchText: `Step one: keep R1 < 4k7 & C2 > 1u, fit the ${word} bleeder <b>now</b>.` },
			{ title: 'Other build', summary: 'nothing here' }
		]);
		const r = await api({ q: word, maker: maker.handle });
		expect(r.status).toBe(200);
		expect(r.body.sort).toBe('relevance');
		const items: Item[] = r.body.items;
		expect(items.map((i) => i.slug)).toEqual([inTitle.slug, inSteps.slug]);
		expect(items.map((i) => i.slug)).not.toContain(unrelated.slug);
		expect(items[0].match!.titleHtml).toBe(`Toroid <mark>${word}</mark> supply`);
		const snippet = items[1].match!.snippetHtml;
		expect(snippet).toContain(`<mark>${word}</mark>`);
		expect(snippet).toContain('R1 &lt; 4k7 &amp; C2 &gt; 1u');
		expect(snippet.replace(/<\/?mark>/g, '')).not.toMatch(/<[a-z/]/i);
		// Websearch syntax: a minus leaves builds with that word out.
		const without = await api({ q: `${word} -toroid`, maker: maker.handle });
		expect(without.body.items.map((i: Item) => i.slug)).toEqual([inSteps.slug]);
	});
});

describe('home lists', () => {
	it('recent, recently reviewed safe and most started from each hold what their heading says', async () => {
		const maker = await createMember('maker', 'Homer');
		const reviewer = await createMember('reviewer', 'Homeview');
		members.push(maker.id, reviewer.id);
		const future = new Date(Date.now() + 5 * 365 * 86_400_000); // newer than anything else in the database
		const [fresh, safe, derived] = await insertBuilds(maker.id, [
			{ title: 'Home fresh', publishedAt: future },
			{ title: 'Home safe', publishedAt: new Date(Date.now() - 86_400_000) },
			{ title: 'Home derived', derivedCount: 1_000_000 }
		]);
		await insertReview(safe.id, reviewer.id, 'safe', 1, future);
		const lists = await homeLists();
		expect(lists.recent[0].slug).toBe(fresh.slug);
		expect(lists.reviewedSafe[0]).toMatchObject({ slug: safe.slug, review: { label: 'safe' } });
		expect(lists.reviewedSafe.every((b) => b.review?.label === 'safe')).toBe(true);
		expect(lists.mostDerived[0]).toMatchObject({ slug: derived.slug, derivedCount: 1_000_000 });
		expect(lists.mostDerived.every((b) => b.derivedCount > 0)).toBe(true);
	});
});

describe('home list cache', () => {
	it('reuses the lists while the reader version stands, and asks again once a published build changes', async () => {
		const maker = await createMember('maker', 'Home cache');
		members.push(maker.id);
		const first = await cachedHomeLists();
		expect(await cachedHomeLists()).toBe(first);
		// A build published by plain SQL (as another app instance would) moves the version: the next view sees it.
		const [fresh] = await insertBuilds(maker.id, [{ title: `Home cache ${uniqueWord()}`, publishedAt: new Date(Date.now() + 6 * 365 * 86_400_000) }]); // newer than the lists test above
		const later = await cachedHomeLists();
		expect(later).not.toBe(first);
		expect(later.recent[0].slug).toBe(fresh.slug);
		// A draft is nobody's business: inserting one leaves the lists as they were.
		await insertBuilds(maker.id, [{ title: `Home cache draft ${uniqueWord()}`, status: 'draft' }]);
		expect(await cachedHomeLists()).toBe(later);
	});
});
