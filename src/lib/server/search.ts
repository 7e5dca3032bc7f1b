/**
 * Full-text search over builds (PRODUCT.md §4.8), all of it: `build.search` is the tsvector matched
 * (title A, summary B, the search text C; kept by a trigger, migration 0016) with a GIN index, and
 * `build.search_head` the small one ranked (title A, summary B; generated) with a RUM index. This module
 * keeps the search text current (refreshSearchText, after every content change), builds the tsquery and
 * the distance the list query (builds/list.ts relevancePage) filters and orders by, and adds the
 * highlighted snippets and the search-as-you-type title suggestions.
 */
import { and, asc, desc, eq, inArray, sql, type SQL } from 'drizzle-orm';
import { db, type Tx } from './db';
import * as schema from './db/schema';
import { escapeUTF8 as escapeHtml } from 'entities';
import { microSpellings } from '$lib/parts/values';

/** Longest search text kept per build, in characters (the tsvector has a 1 MB limit; this is far below it). */
const SEARCH_TEXT_MAX = 200_000;

/**
 * Rebuild `build.search_text` (step titles and text, spec-block titles, parts-list values and notes) in
 * the caller's transaction. The `search` tsvector follows it (its trigger, migration 0016). Call after every save that
 * touches steps or parts; the parts editor calls it too.
 */
export async function refreshSearchText(tx: Tx, buildId: string): Promise<void> {
	const [steps, parts, blocks] = await Promise.all([
		tx
			.select({ title: schema.buildStep.title, bodyMd: schema.buildStep.bodyMd })
			.from(schema.buildStep)
			.where(eq(schema.buildStep.buildId, buildId))
			.orderBy(asc(schema.buildStep.position)),
		tx
			.select({
				designators: schema.partLine.designators,
				kind: schema.partLine.kind,
				valueText: schema.partLine.valueText,
				designValueText: schema.partLine.designValueText,
				package: schema.partLine.package,
				notes: schema.partLine.notes,
				substitutionReason: schema.partLine.substitutionReason
			})
			.from(schema.partLine)
			.where(eq(schema.partLine.buildId, buildId))
			.orderBy(asc(schema.partLine.position)),
		tx.select({ title: schema.specBlock.title }).from(schema.specBlock).where(eq(schema.specBlock.buildId, buildId))
	]);
	const text = [
		...steps.map((s) => `${s.title}\n${s.bodyMd}`),
		...blocks.map((b) => b.title),
		...parts.map((p) =>
			[p.designators, p.kind, p.valueText, p.designValueText, p.package, p.notes, p.substitutionReason]
				.filter(Boolean)
				.join(' ')
		)
	]
		.filter(Boolean)
		.join('\n')
		.slice(0, SEARCH_TEXT_MAX);
	await tx.update(schema.build).set({ searchText: text }).where(eq(schema.build.id, buildId));
}

/**
 * websearch_to_tsquery over the English configuration: quotes, `or` and `-word` work as people expect. A text with a
 * micro sign is searched in both spellings, µ (U+00B5) and μ (U+03BC), so "4µ7" finds "4μ7" too ($lib/parts microSpellings).
 */
export function searchQuery(q: string): SQL {
	return sql`(${sql.join(microSpellings(q).map((v) => sql`websearch_to_tsquery('english', ${v})`), sql` || `)})`;
}

/** Rank of a build against a tsquery: cover density, length-normalised (flag 1: divide by 1 + log(length)). */
export function searchRank(tsquery: SQL): SQL<number> {
	return sql<number>`ts_rank_cd(${schema.build.search}, ${tsquery}, 1)`;
}

/**
 * Relevance as the RUM index on the title-and-summary vector orders it (migration 0016,
 * `build_search_head_rum_idx`): `search_head <=> tsquery` is rum's distance, the inverse of its rank
 * (weight A title > B summary), smaller is more relevant. Only the small vector is ranked, so the cost
 * does not grow with the length of step text; builds that match only in their steps and parts come
 * after, newest first (builds/list.ts relevancePage).
 */
export function searchDistance(tsquery: SQL): SQL<number> {
	return sql<number>`(${schema.build.searchHead} <=> ${tsquery})`;
}

/** Private-use characters that mark a hit inside ts_headline output; they never reach a page. */
const START = '\uE000';
const STOP = '\uE001';

/**
 * Turn ts_headline output with START/STOP markers into safe HTML: everything escaped, then each
 * balanced marker pair becomes <mark>…</mark>; stray markers are dropped. The only tag it can emit is
 * <mark>. 'a \uE000b<\uE001' → 'a <mark>b&lt;</mark>'.
 */
export function markedToHtml(text: string): string {
	return escapeHtml(text)
		.replace(/\uE000([^\uE000\uE001]*)\uE001/g, '<mark>$1</mark>')
		.replace(/[\uE000\uE001]/g, '');
}

/** Markdown punctuation that reads as noise inside a one-line snippet ('## Wiring **earth**' → 'Wiring earth'). */
export function plainSnippet(text: string): string {
	return text
		.replace(/!\[[^\]]*\]\([^)]*\)/g, ' ')
		.replace(/\[([^\]]*)\]\([^)]*\)/g, '$1')
		.replace(/^[ \t]*>+/gm, ' ')
		.replace(/[#*_`|~]+/g, ' ')
		.replace(/\s+/g, ' ')
		.trim();
}

export interface SearchHighlight {
	/** The title with hits in <mark> (escaped otherwise). */
	titleHtml: string;
	/** One or two fragments of summary, steps or parts around the hits, in <mark>; may be empty. */
	snippetHtml: string;
}

/** Characters of step and parts text scanned for a snippet (ts_headline re-parses the text; keep it cheap). */
const SNIPPET_SCAN = 20_000;

/**
 * Highlighted title and snippet for builds that matched `q` (one query for the whole page).
 * ts_headline with websearch_to_tsquery('english', q); output sanitized by markedToHtml.
 */
export async function highlightBuilds(ids: string[], q: string): Promise<Map<string, SearchHighlight>> {
	const out = new Map<string, SearchHighlight>();
	if (ids.length === 0 || !q.trim()) return out;
	const query = searchQuery(q);
	const titleOpts = `StartSel=${START}, StopSel=${STOP}, HighlightAll=true`;
	const snippetOpts = `StartSel=${START}, StopSel=${STOP}, MaxWords=26, MinWords=10, ShortWord=2, MaxFragments=2, FragmentDelimiter=" … "`;
	const rows = await db
		.select({
			id: schema.build.id,
			title: sql<string>`ts_headline('english', ${schema.build.title}, ${query}, ${titleOpts})`,
			snippet: sql<string>`ts_headline('english', ${schema.build.summary} || E'\n' || left(${schema.build.searchText}, ${SNIPPET_SCAN}), ${query}, ${snippetOpts})`
		})
		.from(schema.build)
		.where(inArray(schema.build.id, ids));
	for (const r of rows) {
		out.set(r.id, { titleHtml: markedToHtml(r.title), snippetHtml: markedToHtml(plainSnippet(r.snippet)) });
	}
	return out;
}

/**
 * A prefix tsquery for search-as-you-type over titles only (weight A): every word must match, the
 * last one as a prefix. 'dual rail sup' → 'dual:A & rail:A & sup:*A'; null when no word is left.
 */
export function suggestTsquery(q: string): string | null {
	const words = (q.toLowerCase().match(/[\p{L}\p{N}]+/gu) ?? []).slice(0, 8);
	if (words.length === 0) return null;
	return words.map((w, i) => (i === words.length - 1 ? `${w}:*A` : `${w}:A`)).join(' & ');
}

export interface Suggestion {
	slug: string;
	title: string;
}

/** Up to `limit` published build titles that start matching what the reader has typed, best first. */
export async function suggestTitles(q: string, limit = 8): Promise<Suggestion[]> {
	const tq = suggestTsquery(q);
	if (!tq) return [];
	const query = sql`to_tsquery('english', ${tq})`;
	return db
		.select({ slug: schema.build.slug, title: schema.build.title })
		.from(schema.build)
		.where(and(eq(schema.build.status, 'published'), sql`${schema.build.searchHead} @@ ${query}`))
		.orderBy(sql`ts_rank_cd(${schema.build.searchHead}, ${query}) desc`, desc(schema.build.publishedAt))
		.limit(Math.min(Math.max(limit, 1), 20));
}
