import { asc, eq, ilike, or } from 'drizzle-orm';
import { error } from '@sveltejs/kit';
import { db } from './db';
import * as schema from './db/schema';
import { recordAudit } from './audit';
import type { Actor } from './actor';
import { assignableRoles, roleAtLeast, type Role } from '$lib/roles';


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

async function getTarget(id: string) {
	const [target] = await db.select().from(schema.user).where(eq(schema.user.id, id));
	if (!target) error(404, 'No such member.');
	return target;
}

/**
 * Change a member's role. Admins appoint and revoke moderators (and admins); moderators appoint
 * and revoke reviewers. Nobody changes their own role or that of someone at or above their rank
 * (except admins). Written to the audit log.
 */
export async function setRole(actor: Actor, targetId: string, newRole: Role, reason = ''): Promise<void> {
	const target = await getTarget(targetId);
	if (target.id === actor.id) error(403, 'You cannot change your own role.');
	const allowed = assignableRoles(actor.role);
	if (!allowed.includes(newRole)) error(403, `A ${actor.role} cannot appoint a ${newRole}.`);
	if (actor.role !== 'admin' && !allowed.includes(target.role as Role)) {
		error(403, `A ${actor.role} cannot change the role of a ${target.role}.`);
	}
	if (target.suspendedAt && roleAtLeast(newRole, 'reviewer')) error(409, 'Restore this member before appointing them.');
	if (target.role === newRole) return;
	await db.transaction(async (tx) => {
		await tx.update(schema.user).set({ role: newRole }).where(eq(schema.user.id, targetId));
		await recordAudit(tx, {
			actorId: actor.id,
			action: 'member.role',
			targetKind: 'member',
			targetId,
			reason,
			details: { from: target.role, to: newRole }
		});
	});
}

/** Suspend (or restore) a member. Suspension ends their sessions at once. Moderators and up; never someone of equal or higher rank unless admin. */
export async function setSuspended(actor: Actor, targetId: string, suspended: boolean, reason: string): Promise<void> {
	if (!roleAtLeast(actor.role, 'moderator')) error(403, 'Only moderators can suspend members.');
	const target = await getTarget(targetId);
	if (target.id === actor.id) error(403, 'You cannot suspend yourself.');
	if (actor.role !== 'admin' && roleAtLeast(target.role, 'moderator')) error(403, 'Only an admin can suspend a moderator or admin.');
	await db.transaction(async (tx) => {
		await tx
			.update(schema.user)
			.set({ suspendedAt: suspended ? new Date() : null, suspendedReason: suspended ? reason : null })
			.where(eq(schema.user.id, targetId));
		if (suspended) await tx.delete(schema.session).where(eq(schema.session.userId, targetId));
		await recordAudit(tx, {
			actorId: actor.id,
			action: suspended ? 'member.suspend' : 'member.restore',
			targetKind: 'member',
			targetId,
			reason
		});
	});
}
