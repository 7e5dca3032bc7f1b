// The relevance order (builds/list.ts relevancePage) on the real PostgreSQL, checked against an oracle
// written as one plain SQL ORDER BY over every match: first the builds whose title and summary match by
// themselves, ranked by rum's distance on the title-and-summary vector, then the builds that match only
// through their steps and parts, newest first; ties by newest, then id. Pages must give exactly the
// oracle's order, every match exactly once, also while builds are published between pages, with other
// filters, and with excluded words (`-word`). And the full search vector is recomputed only when the
// text it is made of changes (migration 0016's trigger), not on every write that touches the build row.
import { afterAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { db } from './db';
import * as schema from './db/schema';
import { listPublishedBuilds, relevancePage, type ListCursor, type ListFilters } from './builds/list';
import { createMember, insertBuilds, removeMembers, uniqueWord } from './testing/discover';

const members: string[] = [];
afterAll(() => removeMembers(members));

/** The complete relevance order of the matches, straight from SQL (independent of list.ts). */
async function oracle(q: string, ownerId?: string): Promise<string[]> {
	const rows = await db.execute<{ slug: string }>(sql`
		with t as (select websearch_to_tsquery('english', ${q}) as q)
		select slug from build, t
		where status = 'published' and search @@ t.q ${ownerId ? sql`and owner_id = ${ownerId}` : sql``}
		order by (search_head @@ t.q) desc,
		         case when search_head @@ t.q then search_head <=> t.q end,
		         published_at desc, id desc`);
	return rows.map((r) => r.slug);
}

/** Every page of the relevance order, following the cursors; `between` runs after each page. */
async function pageThrough(q: string, limit: number, filters: ListFilters = {}, between?: (page: number) => Promise<void>) {
	const seen: string[] = [];
	let cursor: ListCursor | null = null;
	for (let page = 0; page < 200; page++) {
		const r = await listPublishedBuilds({ limit, sort: 'relevance', filters: { ...filters, q }, cursor });
		seen.push(...r.rows.map((x) => x.slug));
		await between?.(page);
		if (!r.next) break;
		cursor = r.next;
	}
	return seen;
}

describe('relevance order: title and summary ranked, then steps-only matches newest first', () => {
	it('pages exactly like the oracle across the two tiers, while builds are published between pages', async () => {
		const maker = await createMember('maker', 'Relevance');
		members.push(maker.id);
		const word = uniqueWord();
		const t0 = Date.now() - 86_400_000;
		// Title hits (once or twice), summary hits and steps-only hits; publish times tie in pairs.
		await insertBuilds(
			maker.id,
			Array.from({ length: 30 }, (_, i) => ({
				title: i % 5 === 0 ? `${word} ${i % 2 ? word : ''} board ${i}` : `Board ${i}`,
				summary: i % 5 === 1 ? `${word} summary ${i}` : '',
				searchText: `${Array.from({ length: 1 + (i % 4) }, () => word).join(' filler ')} text ${i}`,
				publishedAt: new Date(t0 + Math.floor(i / 2) * 60_000)
			}))
		);
		const expected = await oracle(word);
		expect(expected).toHaveLength(30);
		const [{ n }] = await db.execute<{ n: number }>(
			sql`select count(*)::int as n from build where status = 'published' and search @@ websearch_to_tsquery('english', ${word})`
		);
		expect(n).toBe(30);

		const late = new Set<string>();
		const seen = await pageThrough(word, 4, {}, async (page) => {
			// Builds published by others between pages: one in each tier.
			const fresh = await insertBuilds(maker.id, [
				{ title: `${word} late title ${page}`, publishedAt: new Date() },
				{ title: `Late ${page}`, searchText: `${word} late steps`, publishedAt: new Date() }
			]);
			for (const f of fresh) late.add(f.slug);
		});
		// Every build there before paging began, exactly once and in the oracle's order; no repeats at all.
		expect(seen.filter((s) => !late.has(s))).toEqual(expected);
		expect(new Set(seen).size).toBe(seen.length);
		// Title and summary hits (12 of the 30) come first.
		expect(expected.slice(0, 12).every((s) => Number(s.split('-').at(-1)) % 5 <= 1)).toBe(true);
		// After paging, the whole list again equals the oracle (late builds included), with a page size that
		// ends a page exactly at the tier boundary and one that does not.
		const all = await oracle(word);
		expect(await pageThrough(word, 12)).toEqual(all);
		expect(await pageThrough(word, 7)).toEqual(all);
	});

	it('with other filters, and with an excluded word that only the steps contain', async () => {
		const maker = await createMember('maker', 'Filtered');
		const other = await createMember('maker', 'Other');
		members.push(maker.id, other.id);
		const word = uniqueWord();
		const banned = uniqueWord();
		const [titleOnly, titleButBanned, stepsOnly, stepsButBanned] = await insertBuilds(maker.id, [
			{ title: `${word} amp`, searchText: 'plain' },
			{ title: `${word} amp two`, searchText: `uses ${banned}` },
			{ title: 'Amp', searchText: `${word} in the steps` },
			{ title: 'Amp two', searchText: `${word} and ${banned}` }
		]);
		await insertBuilds(other.id, [{ title: `${word} elsewhere` }, { title: 'Elsewhere', searchText: word }]);

		const q = `${word} -${banned}`;
		expect(await oracle(q, maker.id)).toEqual([titleOnly.slug, stepsOnly.slug]);
		expect(await pageThrough(q, 1, { maker: maker.handle })).toEqual([titleOnly.slug, stepsOnly.slug]);
		expect(await pageThrough(word, 1, { maker: maker.handle })).toEqual(await oracle(word, maker.id));
		expect(await pageThrough(word, 2, { ownerId: maker.id })).toEqual(await oracle(word, maker.id));
		expect((await oracle(word, maker.id)).sort()).toEqual([titleOnly.slug, titleButBanned.slug, stepsOnly.slug, stepsButBanned.slug].sort());
	});

	it('a run of equal distances longer than the candidates read from the index is paged by recency, exactly', async () => {
		const maker = await createMember('maker', 'Runs');
		members.push(maker.id);
		const word = uniqueWord();
		const t0 = Date.now() - 3_600_000;
		// 3 nearer (the word twice in the title), 40 alike (once in the title: one distance), 5 in the steps only.
		await insertBuilds(maker.id, [
			...Array.from({ length: 3 }, (_, i) => ({ title: `${word} ${word} pair ${i}`, publishedAt: new Date(t0 + i * 1000) })),
			...Array.from({ length: 40 }, (_, i) => ({ title: `Same ${word}`, publishedAt: new Date(t0 + Math.floor(i / 3) * 1000) })),
			...Array.from({ length: 5 }, (_, i) => ({ title: `Steps ${i}`, searchText: word, publishedAt: new Date(t0 + i * 1000) }))
		]);
		const [{ runs }] = await db.execute<{ runs: number }>(sql`
			select count(distinct search_head <=> websearch_to_tsquery('english', ${word}))::int as runs
			from build where owner_id = ${maker.id} and search_head @@ websearch_to_tsquery('english', ${word})`);
		expect(runs, 'the 40 titles share one distance').toBe(2);
		const expected = await oracle(word, maker.id);
		expect(expected).toHaveLength(48);

		const seen: string[] = [];
		const late = new Set<string>();
		let cursor: ListCursor | null = null;
		for (let page = 0; page < 30; page++) {
			// At most 6 candidates from the index: the run of 40 always goes on past them.
			const r = await relevancePage(word, { ownerId: maker.id }, 4, cursor, db, 6);
			seen.push(...r.rows.map((x) => x.slug));
			const fresh = await insertBuilds(maker.id, [{ title: `Same ${word}`, publishedAt: new Date() }]);
			late.add(fresh[0].slug);
			if (!r.next) break;
			cursor = r.next;
		}
		expect(seen.filter((s) => !late.has(s))).toEqual(expected);
		expect(new Set(seen).size).toBe(seen.length);
	});

	it('a cursor of another shape is refused, not misread', async () => {
		await expect(relevancePage('amp', {}, 5, { sort: 'relevance', keys: ['-3.2', '2026-01-01T00:00:00.000000'], id: crypto.randomUUID() }, db)).rejects.toThrow(
			RangeError
		);
	});
});

describe('the full search vector (migration 0016 trigger)', () => {
	it('is recomputed only when title, summary or search text change, and then matches the new text', async () => {
		const maker = await createMember('maker', 'Vector');
		members.push(maker.id);
		const [before, after, body] = [uniqueWord(), uniqueWord(), uniqueWord()];
		const [b] = await insertBuilds(maker.id, [{ title: `${before} supply`, searchText: `${body} steps` }]);
		const hit = async (w: string) =>
			(await db.execute<{ hit: boolean }>(sql`select search @@ plainto_tsquery('english', ${w}) as hit from build where id = ${b.id}`))[0].hit;
		expect(await hit(before)).toBe(true);
		expect(await hit(body)).toBe(true);

		// Calls of the trigger function in this transaction (PostgreSQL's function statistics).
		const calls = await db.transaction(async (tx) => {
			await tx.execute(sql`set local track_functions = 'pl'`);
			const count = async () =>
				Number(
					(await tx.execute<{ n: string }>(sql`select coalesce(pg_stat_get_xact_function_calls('starground_build_search_vector'::regproc), 0) as n`))[0].n
				);
			const out: Record<string, number> = { start: await count() };
			// A comment: migration 0004's trigger touches the build row.
			await tx.insert(schema.comment).values({ buildId: b.id, authorId: maker.id, bodyMd: 'Nice', bodyHtml: '<p>Nice</p>' });
			out.comment = await count();
			await tx.update(schema.build).set({ derivedCount: 3, updatedAt: new Date() }).where(eq(schema.build.id, b.id));
			out.otherColumns = await count();
			await tx.execute(sql`update build set search_text = search_text, title = title where id = ${b.id}`);
			out.sameText = await count();
			await tx.update(schema.build).set({ title: `${after} supply` }).where(eq(schema.build.id, b.id));
			out.newTitle = await count();
			return out;
		});
		expect(calls).toEqual({ start: 0, comment: 0, otherColumns: 0, sameText: 0, newTitle: 1 });
		expect(await hit(after)).toBe(true);
		expect(await hit(before)).toBe(false);
		// The title-and-summary vector follows too.
		const [{ head }] = await db.execute<{ head: boolean }>(sql`select search_head @@ plainto_tsquery('english', ${after}) as head from build where id = ${b.id}`);
		expect(head).toBe(true);
		// Writing the vector directly does not stick: it is recomputed from the text.
		await db.execute(sql`update build set search = to_tsvector('english', 'nonsense') where id = ${b.id}`);
		expect(await hit(after)).toBe(true);
		await db.update(schema.build).set({ searchText: 'nothing left' }).where(eq(schema.build.id, b.id));
		expect(await hit(body)).toBe(false);
	});
});
