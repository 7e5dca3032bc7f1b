/**
 * Values of the build list's filters and orders (browse, search, the builds API), shared by the server
 * query and the pages' forms, and the query string's schema. Labels are the product's words.
 */
import { z } from 'zod';
import { BUILD_PROGRESS, CATEGORIES, TOPOLOGIES } from './build';

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

export const LIST_LIMIT_DEFAULT = 20;
export const LIST_LIMIT_MAX = 100;
/** Longest accepted search text, in characters. */
export const QUERY_MAX = 200;

const oneOf = (values: readonly string[]) => ({ error: `must be one of: ${values.join(', ')}` });

/** Query string of GET /api/v1/builds and of the browse and search pages. */
export const listQuerySchema = z.object({
	q: z.string().trim().max(QUERY_MAX, `must be at most ${QUERY_MAX} characters`).optional(),
	category: z.enum(CATEGORIES, oneOf(CATEGORIES)).optional(),
	topology: z.enum(TOPOLOGIES, oneOf(TOPOLOGIES)).optional(),
	review: z.enum(REVIEW_FILTERS, oneOf(REVIEW_FILTERS)).optional(),
	mains: z.enum(['true', 'false'], oneOf(['true', 'false'])).optional(),
	/** The maker's build status (the list item's `progress`). */
	status: z
		.enum(BUILD_PROGRESS, oneOf(BUILD_PROGRESS))
		.optional()
		.describe('The maker’s build status (each item’s `progress`): in-progress, working or abandoned'),
	maker: z
		.string()
		.trim()
		.toLowerCase()
		.regex(/^[a-z0-9][a-z0-9-]{0,39}$/, 'must be a member handle')
		.optional(),
	sort: z.enum(LIST_SORTS, oneOf(LIST_SORTS)).optional(),
	cursor: z.string().max(400).optional(),
	limit: z.coerce
		.number({ error: 'must be a whole number' })
		.int('must be a whole number')
		.min(1, 'must be at least 1')
		.max(LIST_LIMIT_MAX, `must be at most ${LIST_LIMIT_MAX}`)
		.default(LIST_LIMIT_DEFAULT)
});
export type ListQuery = z.infer<typeof listQuerySchema>;
