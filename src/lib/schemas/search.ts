import { z } from 'zod';

/** Query of GET /api/v1/search/suggest: what has been typed so far, and how many titles to return. */
export const suggestQuery = z.object({
	q: z.string().trim().max(100, 'must be at most 100 characters').default(''),
	limit: z.coerce
		.number({ error: 'must be a whole number' })
		.int('must be a whole number')
		.min(1, 'must be at least 1')
		.max(20, 'must be at most 20')
		.default(8)
});
