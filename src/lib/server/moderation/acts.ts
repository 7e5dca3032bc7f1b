/**
 * The moderation acts (PRODUCT.md §4.6), one function each, called by every screen that offers them (the
 * moderation desk, the members page, the build page's lock): hide/restore a comment, lock/unlock a build,
 * suspend/restore a member, change a member's role, close a report. Each runs in ONE transaction that
 * makes the change, closes the open reports it settles and writes the audit entry — all or nothing.
 *
 * Acting against someone (hide, lock, suspend, closing a report) needs a reason of 3–500 characters; undoing
 * it (restore, unlock) and a role change take an optional one. Asking for the state a target is already in
 * changes nothing and writes no audit entry, but still settles open reports about it.
 */
import { error } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import * as schema from '../db/schema';
import { db, type Tx } from '../db';
import { recordAudit } from '../audit';
import type { Actor } from '../actor';
import { lockBuild } from '../builds/edit';
import { assertCanView } from '../builds/access';
import { assignableRoles, roleAtLeast, type Role } from '$lib/roles';
import { moderationReason, type ReportTargetKind } from '$lib/schemas/review';
import { isUuid } from '$lib/uuid';

/** 403 unless `actor` is a moderator or above. */
function assertModerator(actor: Actor, message = 'Only moderators can do this.'): void {
	if (!roleAtLeast(actor.role, 'moderator')) error(403, message);
}

/** A required reason (hide, lock, suspend, close): 3–500 characters after trimming, else 422. */
function requiredReason(reason: string): string {
	const parsed = moderationReason.safeParse(reason);
	if (!parsed.success) error(422, parsed.error.issues[0].message);
	return parsed.data;
}

/** An optional reason (restore, unlock, role change): at most 500 characters after trimming, else 422. */
function optionalReason(reason = ''): string {
	const why = reason.trim();
	if (why.length > 500) error(422, 'Keep the reason under 500 characters.');
	return why;
}

/** Close every open report about one target, in the act's transaction. → how many were closed. */
async function closeReportsAbout(tx: Tx, actor: Actor, kind: ReportTargetKind, targetId: string, resolution: string): Promise<number> {
	const closed = await tx
		.update(schema.report)
		.set({ state: 'closed', handledById: actor.id, handledAt: new Date(), resolution })
		.where(and(eq(schema.report.targetKind, kind), eq(schema.report.targetId, targetId), eq(schema.report.state, 'open')))
		.returning({ id: schema.report.id });
	return closed.length;
}

/** Hide (or restore) a comment from readers (moderators). Hiding closes the open reports about it. */
export async function setCommentHidden(actor: Actor, commentId: string, hidden: boolean, reason: string): Promise<void> {
	assertModerator(actor);
	const why = hidden ? requiredReason(reason) : optionalReason(reason);
	if (!isUuid(commentId)) error(404, 'No such comment.');
	await db.transaction(async (tx) => {
		const [c] = await tx.select().from(schema.comment).where(eq(schema.comment.id, commentId)).for('update');
		if (!c) error(404, 'No such comment.');
		if (c.hidden !== hidden) {
			await tx.update(schema.comment).set({ hidden, hiddenReason: hidden ? why : null }).where(eq(schema.comment.id, c.id));
			const [b] = await tx.select({ slug: schema.build.slug }).from(schema.build).where(eq(schema.build.id, c.buildId));
			await recordAudit(tx, {
				actorId: actor.id,
				action: hidden ? 'comment.hide' : 'comment.restore',
				targetKind: 'comment',
				targetId: c.id,
				reason: why,
				details: { build: b?.slug, excerpt: c.bodyMd.slice(0, 200) }
			});
		}
		if (hidden) await closeReportsAbout(tx, actor, 'comment', c.id, `Comment hidden: ${why}`);
	});
}

/**
 * Lock or unlock a build (moderators). A locked build cannot be changed by its maker, who sees the reason.
 * Locking closes the open reports about it.
 */
export async function setBuildLocked(actor: Actor, buildId: string, locked: boolean, reason: string): Promise<void> {
	assertModerator(actor, 'Only moderators can lock or unlock builds.');
	const why = locked ? requiredReason(reason) : optionalReason(reason);
	if (!isUuid(buildId)) error(404, 'No such build.');
	await db.transaction(async (tx) => {
		const b = await lockBuild(tx, buildId);
		// View before edit: a moderator cannot see another member's draft, so cannot lock it (404, as if absent).
		assertCanView(actor, b);
		if (b.locked !== locked) {
			await tx.update(schema.build).set({ locked, lockedReason: locked ? why : null }).where(eq(schema.build.id, buildId));
			await recordAudit(tx, {
				actorId: actor.id,
				action: locked ? 'build.lock' : 'build.unlock',
				targetKind: 'build',
				targetId: buildId,
				reason: why,
				details: { slug: b.slug, title: b.title }
			});
		}
		if (locked) await closeReportsAbout(tx, actor, 'build', buildId, `Build locked: ${why}`);
	});
}

/** The member an act concerns, row-locked until the act's transaction ends; 404 when there is none. */
async function memberForAct(tx: Tx, actor: Actor, userId: string) {
	const [target] = await tx.select().from(schema.user).where(eq(schema.user.id, userId)).for('update');
	if (!target) error(404, 'No such member.');
	return target;
}

/**
 * Suspend or restore a member (moderators; a moderator or admin only by an admin; never oneself).
 * Suspension ends their sessions at once and closes the open reports about them.
 */
export async function setMemberSuspended(actor: Actor, userId: string, suspended: boolean, reason: string): Promise<void> {
	assertModerator(actor, 'Only moderators can suspend members.');
	const why = suspended ? requiredReason(reason) : optionalReason(reason);
	await db.transaction(async (tx) => {
		const target = await memberForAct(tx, actor, userId);
		if (target.id === actor.id) error(403, 'You cannot suspend yourself.');
		if (actor.role !== 'admin' && roleAtLeast(target.role, 'moderator')) error(403, 'Only an admin can suspend a moderator or admin.');
		if (!!target.suspendedAt !== suspended) {
			await tx
				.update(schema.user)
				.set({ suspendedAt: suspended ? new Date() : null, suspendedReason: suspended ? why : null })
				.where(eq(schema.user.id, userId));
			await recordAudit(tx, {
				actorId: actor.id,
				action: suspended ? 'member.suspend' : 'member.restore',
				targetKind: 'member',
				targetId: userId,
				reason: why
			});
		}
		if (suspended) {
			await tx.delete(schema.session).where(eq(schema.session.userId, userId));
			await closeReportsAbout(tx, actor, 'member', userId, `Member suspended: ${why}`);
		}
	});
}

/**
 * Change a member's role. Admins appoint and revoke moderators (and admins); moderators appoint and
 * revoke reviewers. Nobody changes their own role or that of someone at or above their rank (except
 * admins); a suspended member is restored before being appointed.
 */
export async function setMemberRole(actor: Actor, userId: string, role: Role, reason = ''): Promise<void> {
	const why = optionalReason(reason);
	const allowed = assignableRoles(actor.role);
	await db.transaction(async (tx) => {
		const target = await memberForAct(tx, actor, userId);
		if (target.id === actor.id) error(403, 'You cannot change your own role.');
		if (!allowed.includes(role)) error(403, `A ${actor.role} cannot appoint a ${role}.`);
		if (actor.role !== 'admin' && !allowed.includes(target.role as Role)) error(403, `A ${actor.role} cannot change the role of a ${target.role}.`);
		if (target.suspendedAt && roleAtLeast(role, 'reviewer')) error(409, 'Restore this member before appointing them.');
		if (target.role === role) return;
		await tx.update(schema.user).set({ role }).where(eq(schema.user.id, userId));
		await recordAudit(tx, {
			actorId: actor.id,
			action: 'member.role',
			targetKind: 'member',
			targetId: userId,
			reason: why,
			details: { from: target.role, to: role }
		});
	});
}

/**
 * Close a report with a resolution (moderators), e.g. "no action: within the rules" — and with it every
 * other open report about the same thing, since the matter is settled. Audited once, with the count.
 */
export async function closeReport(actor: Actor, reportId: string, resolution: string): Promise<void> {
	assertModerator(actor);
	const why = requiredReason(resolution);
	if (!isUuid(reportId)) error(404, 'No such report.');
	await db.transaction(async (tx) => {
		const [r] = await tx.select().from(schema.report).where(eq(schema.report.id, reportId)).for('update');
		if (!r) error(404, 'No such report.');
		if (r.state !== 'open') error(409, 'This report is already closed.');
		const closed = await closeReportsAbout(tx, actor, r.targetKind as ReportTargetKind, r.targetId, why);
		await recordAudit(tx, {
			actorId: actor.id,
			action: 'report.close',
			targetKind: 'report',
			targetId: r.id,
			reason: why,
			details: { about: r.targetKind, targetId: r.targetId, reports: closed }
		});
	});
}
