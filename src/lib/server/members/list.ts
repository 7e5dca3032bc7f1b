import { asc, eq, ilike, or } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';

/**
 * Members for the members page, optionally filtered by name or handle — and by e-mail for admins only:
 * e-mail addresses are shown to admins (`withEmail`) and to nobody else, and cannot be searched for
 * either (a search would reveal them one guess at a time).
 */
export async function listMembers(q = '', opts: { withEmail?: boolean; limit?: number } = {}) {
	const term = `%${q.trim()}%`;
	const withEmail = opts.withEmail === true;
	const rows = await db
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
		.where(
			q.trim()
				? or(ilike(schema.user.name, term), ilike(schema.user.handle, term), withEmail ? ilike(schema.user.email, term) : undefined)
				: undefined
		)
		.orderBy(asc(schema.user.name))
		.limit(opts.limit ?? 200);
	return rows.map(({ email, ...r }) => ({ ...r, email: withEmail ? email : null }));
}
