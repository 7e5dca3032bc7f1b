// The list orders read their indexes in order (no sort of every published build): each ORDER BY of
// builds/list.ts spells the index's NULLS placement, or PostgreSQL cannot use the index for the order
// (PostgreSQL manual, "Indexes and ORDER BY": an index serves ORDER BY only when direction and NULLS
// ordering both match, or both are reversed). The queries are the ones the home page sends, captured
// from the driver and explained with sorts and sequential scans priced out, so a plan that still
// sorts is one that cannot avoid it.
import { describe, expect, it } from 'vitest';
import { client } from '../db';
import { listPublishedBuilds } from './list';

type Captured = { query: string; params: unknown[] };

async function capture(run: () => Promise<unknown>): Promise<Captured[]> {
	const out: Captured[] = [];
	const opts = client.options as unknown as { debug?: (conn: number, query: string, params: unknown[]) => void };
	const before = opts.debug;
	opts.debug = (_c, query, params) => out.push({ query, params });
	try {
		await run();
	} finally {
		opts.debug = before;
	}
	return out;
}

async function plan(c: Captured): Promise<string> {
	const rows = await client.begin(async (t) => {
		await t.unsafe('set local enable_sort = off');
		await t.unsafe('set local enable_incremental_sort = off');
		await t.unsafe('set local enable_seqscan = off');
		return t.unsafe(`explain ${c.query}`, c.params as never[]);
	});
	return (rows as unknown as { 'QUERY PLAN': string }[]).map((r) => r['QUERY PLAN']).join('\n');
}

describe('list orders read their indexes in order', () => {
	for (const [name, opts, index] of [
		['most started from (home)', { limit: 6, sort: 'most-derived', filters: { derivedOnly: true } }, 'build_published_derived_idx'],
		['recently reviewed, safe (home)', { limit: 6, sort: 'recently-reviewed', filters: { review: 'safe' } }, 'build_published_reviewed_idx'],
		['recent', { limit: 6 }, 'build_status_published_idx']
	] as const) {
		it(name, async () => {
			const c = (await capture(() => listPublishedBuilds(opts as Parameters<typeof listPublishedBuilds>[0]))).find((q) => /from "build"/.test(q.query));
			if (!c) throw new Error('the list query was not sent');
			expect(c.query).toMatch(/order by/i);
			const text = await plan(c);
			expect(text).toContain(index);
			// No sort of the builds by the list's keys (the review-state subplans sort one build's reviews).
			expect(text).not.toMatch(/Sort Key: .*(published_at|derived_count|last_reviewed_at)/);
			expect(text).not.toMatch(/Incremental Sort/);
		});
	}
});
