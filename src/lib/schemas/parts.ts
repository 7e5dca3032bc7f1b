/** Query of GET /api/v1/parts/value: a parts-list value as typed, read for a part kind. */
import { z } from 'zod';
import { PART_KINDS } from '$lib/parts';

export const partValueQuery = z.object({
	text: z.string({ error: 'required' }).max(200, 'at most 200 characters'),
	kind: z.enum(PART_KINDS, { error: `must be one of ${PART_KINDS.join(', ')}` })
});
