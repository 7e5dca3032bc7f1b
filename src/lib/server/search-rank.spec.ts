// Ranked search (migration 0016: the title-and-summary vector ranked through its RUM index): results come
// most relevant first — title (weight A) before summary (B) before steps and parts (C), as PostgreSQL's
// own ts_rank orders them — page by page with the keyset cursor, highlighted, and the order can be served
// by the index on the small vector (no sort of every match).
import { afterAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { db } from './db';
import { listPage } from './discover';
import { createMember, insertBuilds, removeMembers, uniqueWord } from './testing/discover';

const members: string[] = [];
afterAll(() => removeMembers(members));

describe('ranked search', () => {
	it('title hits before summary hits before step text, the same across pages, with highlights', async () => {
		const maker = await createMember('maker', 'Ranker');
		members.push(maker.id);
		const word = uniqueWord();
		const [inBody, inTitle, inSummary, twiceInTitle] = await insertBuilds(maker.id, [
			{ title: 'Plain supply', summary: 'Nothing.', searchText: `Fit the ${word} bleeder last.` },
			{ title: `Toroid ${word} supply`, summary: 'A supply.' },
			{ title: 'Another supply', summary: `Uses a ${word} on the rails.` },
			{ title: `${word} ${word} preamp`, summary: `${word} everywhere.` }
		]);
		// Oracle: PostgreSQL's built-in ts_rank with its default weights (A 1.0, B 0.4, C 0.2).
		const oracle = await db.execute<{ slug: string }>(
			sql`select slug from build where owner_id = ${maker.id} and search @@ websearch_to_tsquery('english', ${word})
			    order by ts_rank(search, websearch_to_tsquery('english', ${word})) desc`
		);
		expect(oracle.map((r) => r.slug)).toEqual([twiceInTitle.slug, inTitle.slug, inSummary.slug, inBody.slug]);

		const pages: string[] = [];
		let url = new URL(`http://localhost/search?q=${word}&maker=${maker.handle}`);
		for (let i = 0; i < 5; i++) {
			const page = await listPage(url, 1);
			pages.push(...page.builds.map((b) => b.slug));
			if (i === 0) expect(page.builds[0].titleHtml).toBe(`<mark>${word}</mark> <mark>${word}</mark> preamp`);
			if (!page.nextHref) break;
			url = new URL(`http://localhost${page.nextHref}`);
		}
		expect(pages).toEqual(oracle.map((r) => r.slug));
	});

	it('the title-and-summary order can come from its RUM index, with no sort step over the matches', async () => {
		const plan = await db.transaction(async (tx) => {
			await tx.execute(sql`set local enable_sort = off`);
			await tx.execute(sql`set local enable_seqscan = off`);
			return tx.execute<{ 'QUERY PLAN': string }>(
				sql`explain select id from build where status = 'published' and search_head @@ websearch_to_tsquery('english', 'toroid')
				    order by search_head <=> websearch_to_tsquery('english', 'toroid') limit 20`
			);
		});
		const text = plan.map((r) => r['QUERY PLAN']).join('\n');
		expect(text).toContain('build_search_head_rum_idx');
		expect(text).not.toMatch(/\bSort\b/);
	});
});
