import { asc, eq, ilike, or } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';

/** Members for the members page, optionally filtered by name, handle or e-mail. */
export async function listMembers(q = '', limit = 200) {
	const term = `%${q.trim()}%`;
	return db
		.select({
			id: schema.user.id,
			name: schema.user.name,
			handle: schema.user.handle,
			email: schema.user.email,
			role: schema.user.role,
			emailVerified: schema.user.emailVerified,
			suspendedAt: schema.user.suspendedAt,
			createdAt: schema.user.createdAt
		})
		.from(schema.user)
		.where(q.trim() ? or(ilike(schema.user.name, term), ilike(schema.user.handle, term), ilike(schema.user.email, term)) : undefined)
		.orderBy(asc(schema.user.name))
		.limit(limit);
}
