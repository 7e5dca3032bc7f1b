/**
 * Values of the build list's filters and orders (browse, search, the builds API), shared by the server
 * query and the pages' forms. Labels are the product's words.
 */

/** Orders of a list. `relevance` needs a search text `q` and is its default. */
export const LIST_SORTS = ['recent', 'most-derived', 'recently-reviewed', 'relevance'] as const;
export type ListSort = (typeof LIST_SORTS)[number];

export const SORT_LABELS: Record<ListSort, string> = {
	recent: 'Newest',
	'most-derived': 'Most built upon',
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
