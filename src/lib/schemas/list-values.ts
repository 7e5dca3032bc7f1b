/**
 * Values and labels of the build list's filters and orders (browse, search, the builds API), without the
 * query-string schema: the pages' forms import these, so zod stays out of the browser. $lib/schemas/list
 * re-exports them with the schema.
 */

/** Orders of a list. `relevance` needs a search text `q` and is its default. */
export const LIST_SORTS = ['recent', 'most-derived', 'recently-reviewed', 'relevance'] as const;
export type ListSort = (typeof LIST_SORTS)[number];

export const SORT_LABELS: Record<ListSort, string> = {
	recent: 'Newest',
	'most-derived': 'Most started from',
	'recently-reviewed': 'Recently reviewed',
	relevance: 'Best match'
};

/** Review-state filter values: the review labels, with both "edited since" labels folded into `changed`. */
export const REVIEW_FILTERS = ['unreviewed', 'waiting', 'safe', 'rework', 'changed'] as const;
export type ReviewFilter = (typeof REVIEW_FILTERS)[number];

export const REVIEW_FILTER_LABELS: Record<ReviewFilter, string> = {
	unreviewed: 'Not reviewed',
	waiting: 'Waiting for review',
	safe: 'Signed off as safe (this revision)',
	rework: 'Sent back for changes (this revision)',
	changed: 'Edited since sign-off or send-back'
};

/** The `mains` filter: 'true' = mains powered, 'false' = runs from a low-voltage supply or batteries. */
export const MAINS_FILTER_LABELS = { true: 'Mains powered', false: 'Not mains powered' } as const;

export const LIST_LIMIT_DEFAULT = 20;
export const LIST_LIMIT_MAX = 100;
/** Longest accepted search text, in characters. */
export const QUERY_MAX = 200;

/** Highest rail (each side), power and load a find filter takes; beyond these nothing is published. */
export const FIND_LIMITS = { railV: 1000, powerW: 100_000, loadOhm: 100_000, text: 100 } as const;

/** The query-string keys of the find fields, in the order forms show them. */
export const FIND_KEYS = ['railMinV', 'railMaxV', 'loadOhm', 'powerMinW', 'powerMaxW', 'partKind', 'partValue', 'partPackage'] as const;

/** The find fields as a form shows them (text, '' or absent when not given). */
export type FindFilterValues = Partial<Record<(typeof FIND_KEYS)[number], string>>;
