/**
 * Discover (PRODUCT.md §4.8): the home page's lists and the card data every build list shows
 * (cover, category, review badge, maker). Lists come from the one list query in builds/list.ts.
 */
import { effectiveSort, encodeCursor as encodeCursorFor, listPublishedBuilds, queryBuilds, type BuildListRow } from './builds/list';
import { getReviewStates, type ReviewState } from './reviews/state';
import { FIND_KEYS, listQuerySchema, type ListQuery } from '$lib/schemas/list';
import { highlightBuilds, type SearchHighlight } from './search';
import { currentReaderVersion } from './builds/reader-version';
import { queryObject, type ApiIssue } from './http';
import { listRowFields } from './builds/serialize';
import type { BuildCardData } from '$lib/components/build/card';

export type { BuildCardData };

/** Card data for list rows, with each build's review state (one batch query) and search highlights when given. */
export async function toCards(
	rows: BuildListRow[],
	highlights?: Map<string, SearchHighlight>,
	states?: Map<string, ReviewState>
): Promise<BuildCardData[]> {
	const reviews = states ?? (await getReviewStates(rows.map((r) => r.id)));
	return rows.map((r) => toCard(r, reviews.get(r.id) ?? null, highlights?.get(r.id)));
}

/** One card from a list row (pure): the list fields every list shows (builds/serialize), the review state, highlights. */
export function toCard(r: BuildListRow, review: ReviewState | null, hl?: SearchHighlight): BuildCardData {
	return { id: r.id, ...listRowFields(r), review, titleHtml: hl?.titleHtml, snippetHtml: hl?.snippetHtml };
}

let homeCache: { version: number; value: ReturnType<typeof homeLists> } | null = null;

/**
 * homeLists, reused while the site-wide reader version (builds/reader-version) stays the same: the home
 * page is the busiest page and identical for every reader; any write a list could show moves the
 * version (in the database, so every app instance sees it), and the next view asks again.
 */
export async function cachedHomeLists() {
	const { version } = await currentReaderVersion();
	if (!homeCache || homeCache.version !== version) {
		const value = homeLists();
		homeCache = { version, value };
		value.catch(() => {
			if (homeCache?.value === value) homeCache = null;
		});
	}
	return homeCache.value;
}

/** How many cards each home list shows. */
export const HOME_LIST_SIZE = 6;

/**
 * The home page's three lists: newest published, most recently reviewed with a current "safe" verdict,
 * and most started from (only builds at least one other build is based on). Review states load in one batch for all three.
 */
export async function homeLists() {
	const [recent, reviewed, derived] = await Promise.all([
		listPublishedBuilds({ limit: HOME_LIST_SIZE }),
		listPublishedBuilds({ limit: HOME_LIST_SIZE, sort: 'recently-reviewed', filters: { review: 'safe' } }),
		listPublishedBuilds({ limit: HOME_LIST_SIZE, sort: 'most-derived', filters: { derivedOnly: true } })
	]);
	const all = [...recent.rows, ...reviewed.rows, ...derived.rows];
	const states = await getReviewStates(all.map((r) => r.id));
	return {
		recent: await toCards(recent.rows, undefined, states),
		reviewedSafe: await toCards(reviewed.rows, undefined, states),
		mostDerived: await toCards(derived.rows, undefined, states)
	};
}

/**
 * Read the list parameters of a page URL (browse, search). Unlike the API, a page never refuses: a bad
 * value (unknown category, edited cursor…) is dropped and reported in `problems`, the rest still applies.
 * The page size is the page's own.
 */
export function parseListParams(url: URL, pageSize: number): { query: ListQuery; problems: ApiIssue[] } {
	const raw: Record<string, string> = queryObject(url);
	raw.limit = String(pageSize);
	const problems: ApiIssue[] = [];
	let parsed = listQuerySchema.safeParse(raw);
	for (let round = 0; !parsed.success && round < 3; round++) {
		for (const issue of parsed.error.issues) {
			const key = String(issue.path[0] ?? '');
			problems.push({ path: key, message: issue.message });
			delete raw[key];
		}
		parsed = listQuerySchema.safeParse(raw);
	}
	return { query: parsed.success ? parsed.data : listQuerySchema.parse({ limit: String(pageSize) }), problems };
}

/**
 * Everything a list page shows for its URL: the cards (with review states, and highlights when
 * searching), the order in force, and the link to the next page (same filters, the cursor after the
 * last card) or null. A stale cursor restarts from the first page with a note.
 */
export async function listPage(url: URL, pageSize: number) {
	const { query, problems } = parseListParams(url, pageSize);
	let result = await queryBuilds(query);
	if (!result.ok) {
		problems.push({ path: result.path, message: result.message });
		if (result.path === 'cursor') delete query.cursor;
		if (result.path === 'sort') delete query.sort;
		result = await queryBuilds(query);
	}
	if (!result.ok) throw new Error(`list query refused twice: ${result.path} ${result.message}`);
	const highlights = query.q ? await highlightBuilds(result.rows.map((r) => r.id), query.q) : undefined;
	const builds = await toCards(result.rows, highlights);
	const params = new URLSearchParams();
	for (const key of ['q', 'category', 'topology', 'review', 'mains', 'status', 'maker', 'sort', ...FIND_KEYS] as const) {
		const v = query[key];
		if (v !== undefined && v !== '') params.set(key, String(v));
	}
	const base = params.toString();
	let nextHref: string | null = null;
	if (result.next) {
		const p = new URLSearchParams(params);
		p.set('cursor', encodeCursorFor(result.next));
		nextHref = `${url.pathname}?${p}`;
	}
	return {
		builds,
		filters: {
			q: query.q ?? '',
			category: query.category ?? '',
			topology: query.topology ?? '',
			review: query.review ?? '',
			mains: query.mains ?? '',
			status: query.status ?? '',
			maker: query.maker ?? '',
			sort: effectiveSort(query),
			...findFilterValues(query)
		},
		problems,
		paged: !!query.cursor,
		firstHref: base ? `${url.pathname}?${base}` : url.pathname,
		nextHref
	};
}

/** The find fields of a list query as the filter form shows them (text; '' when not given). */
function findFilterValues(query: ListQuery): Record<(typeof FIND_KEYS)[number], string> {
	const out = {} as Record<(typeof FIND_KEYS)[number], string>;
	for (const k of FIND_KEYS) out[k] = query[k] === undefined ? '' : String(query[k]);
	return out;
}
