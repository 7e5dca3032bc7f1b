// The relevance order's bounded candidate set (builds/list.ts relevanceFromCandidates) on the real
// PostgreSQL: a page decided among the first RELEVANCE_CANDIDATES matches of RUM's ordered scan must be
// exactly the page of the complete order — distance, then newest, then id — as a plain ORDER BY over
// every match gives it (the oracle), page after page, also while builds are published between pages;
// and when a run of equal distances crosses the edge of the candidate set the bounded path declines
// (the general query answers), so no page is ever decided on an incomplete tie.
import { afterAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { db } from './db';
import { listPublishedBuilds, relevanceFromCandidates, RELEVANCE_CANDIDATES, type ListCursor } from './builds/list';
import { createMember, insertBuilds, removeMembers, uniqueWord } from './testing/discover';

const members: string[] = [];
afterAll(() => removeMembers(members));

/** The complete relevance order of the matches, straight from SQL (independent of list.ts). */
async function oracle(word: string): Promise<string[]> {
	const rows = await db.execute<{ slug: string }>(
		sql`select slug from build where status = 'published' and search @@ websearch_to_tsquery('english', ${word})
		    order by search <=> websearch_to_tsquery('english', ${word}), published_at desc, id desc`
	);
	return rows.map((r) => r.slug);
}

describe('relevance from a bounded candidate set', () => {
	it('pages exactly like the complete order, while builds are published between pages', async () => {
		const maker = await createMember('maker', 'Candidates');
		members.push(maker.id);
		const word = uniqueWord();
		const t0 = Date.now() - 86_400_000;
		// Distances spread out: the word once, twice or three times, in the title, summary or steps; publish times tie in pairs.
		await insertBuilds(
			maker.id,
			Array.from({ length: 30 }, (_, i) => ({
				title: i % 3 === 0 ? `${word} ${i % 2 ? word : ''} board ${i}` : `Board ${i}`,
				summary: i % 3 === 1 ? `${word} summary ${i}` : '',
				searchText: `${Array.from({ length: 1 + (i % 4) }, () => word).join(' filler ')} text ${i}`,
				publishedAt: new Date(t0 + Math.floor(i / 2) * 60_000)
			}))
		);
		const expected = await oracle(word);
		expect(expected).toHaveLength(30);

		const seen: string[] = [];
		const late = new Set<string>();
		let cursor: ListCursor | null = null;
		for (let page = 0; page < 20; page++) {
			const r = await relevanceFromCandidates(word, 4, cursor, db);
			expect(r, 'no tie crosses the edge here: the bounded path answers').not.toBeNull();
			seen.push(...r!.rows.map((x) => x.slug));
			// Builds published by others between pages rank where they rank; the pages after the cursor stay exact.
			const [fresh] = await insertBuilds(maker.id, [{ title: `${word} late ${page}`, searchText: word, publishedAt: new Date() }]);
			late.add(fresh.slug);
			if (!r!.next) break;
			cursor = r!.next;
		}
		// Every build there before paging began, exactly once and in order; the late ones never repeat.
		expect(seen.filter((s) => !late.has(s))).toEqual(expected);
		expect(new Set(seen).size).toBe(seen.length);
		// And the list query the pages call gives the same first page through either path.
		const viaList = await listPublishedBuilds({ limit: 5, sort: 'relevance', filters: { q: word } });
		expect(viaList.rows.map((x) => x.slug)).toEqual((await oracle(word)).slice(0, 5));
	});

	it('declines when equal distances run across the edge of the candidate set; the list query still pages exactly', async () => {
		const maker = await createMember('maker', 'Ties');
		members.push(maker.id);
		const word = uniqueWord();
		const n = RELEVANCE_CANDIDATES + 15;
		// Every build has the same text: one run of equal distances, ordered by publish time, then id.
		await insertBuilds(
			maker.id,
			Array.from({ length: n }, (_, i) => ({ title: `Same ${word}`, publishedAt: new Date(Date.now() - 1000 * Math.floor(i / 3)) }))
		);
		expect(await relevanceFromCandidates(word, 20, null, db)).toBeNull();

		const expected = await oracle(word);
		const seen: string[] = [];
		let cursor: ListCursor | null = null;
		for (let page = 0; page < 20; page++) {
			const r = await listPublishedBuilds({ limit: 25, sort: 'relevance', filters: { q: word }, cursor });
			seen.push(...r.rows.map((x) => x.slug));
			if (!r.next) break;
			cursor = r.next;
		}
		expect(seen).toEqual(expected);
		expect(seen).toHaveLength(n);
	});
});
