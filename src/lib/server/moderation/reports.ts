/**
 * Reports and what the moderation desk and the audit log read (PRODUCT.md §4.6). Any member reports a
 * build, a comment or a member with a reason; moderators work the queue with the acts in ./acts.
 */
import { error } from '@sveltejs/kit';
import { and, asc, desc, eq, gte, ilike, inArray, lt, or, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { env } from '$env/dynamic/private';
import * as schema from '../db/schema';
import { db } from '../db';
import type { Actor } from '../actor';
import { roleAtLeast } from '$lib/roles';
import { reportSchema, type ReportInput, type ReportTargetKind } from '$lib/schemas/review';
import { isUuid } from '$lib/uuid';

/** Where a reported thing lives: a build slug, a comment's id and build slug, a member's handle or id. */
async function resolveReportTarget(kind: ReportTargetKind, id: string): Promise<{ targetId: string }> {
	if (kind === 'build') {
		const [b] = await db
			.select({ id: schema.build.id, status: schema.build.status })
			.from(schema.build)
			.where(isUuid(id) ? eq(schema.build.id, id) : eq(schema.build.slug, id));
		if (!b || b.status === 'draft') error(422, 'There is no such build to report.');
		return { targetId: b.id };
	}
	if (kind === 'comment') {
		if (!isUuid(id)) error(422, 'There is no such comment to report.');
		const [c] = await db.select({ id: schema.comment.id, deletedAt: schema.comment.deletedAt }).from(schema.comment).where(eq(schema.comment.id, id));
		if (!c || c.deletedAt) error(422, 'There is no such comment to report.');
		return { targetId: c.id };
	}
	const [u] = await db
		.select({ id: schema.user.id })
		.from(schema.user)
		.where(or(eq(schema.user.id, id), eq(schema.user.handle, id.replace(/^@/, '').toLowerCase())));
	if (!u) error(422, 'There is no such member to report.');
	return { targetId: u.id };
}

/**
 * A member reports a build (id or slug), a comment (id) or a member (id or handle) with a reason.
 * A second report of the same thing by the same member while the first is open adds nothing.
 * At most REPORT_RATE_PER_HOUR (default 20) reports an hour per member. → { id, duplicate }.
 */
export async function fileReport(actor: Actor, input: ReportInput): Promise<{ id: string; duplicate: boolean }> {
	const data = reportSchema.parse(input);
	const { targetId } = await resolveReportTarget(data.targetKind, data.targetId);
	if (data.targetKind === 'member' && targetId === actor.id) error(422, 'You cannot report yourself.');
	const [existing] = await db
		.select({ id: schema.report.id })
		.from(schema.report)
		.where(
			and(
				eq(schema.report.reporterId, actor.id),
				eq(schema.report.targetKind, data.targetKind),
				eq(schema.report.targetId, targetId),
				eq(schema.report.state, 'open')
			)
		);
	if (existing) return { id: existing.id, duplicate: true };
	const [{ n }] = await db
		.select({ n: sql<number>`count(*)::int` })
		.from(schema.report)
		.where(and(eq(schema.report.reporterId, actor.id), sql`${schema.report.createdAt} > now() - interval '1 hour'`));
	if (n >= Number(env.REPORT_RATE_PER_HOUR ?? 20)) error(429, 'You have sent many reports in the last hour. Wait a while and try again.');
	const [row] = await db
		.insert(schema.report)
		.values({ reporterId: actor.id, targetKind: data.targetKind, targetId, reason: data.reason })
		.returning({ id: schema.report.id });
	return { id: row.id, duplicate: false };
}

export interface QueueItem {
	id: string;
	targetKind: ReportTargetKind;
	targetId: string;
	reason: string;
	createdAt: Date;
	state: string;
	resolution: string | null;
	handledAt: Date | null;
	handledBy: string | null;
	reporter: { name: string; handle: string | null };
	/** Open reports about the same target (this one included). */
	sameTarget: number;
	/** Every report about the target in this list, oldest first (the open queue groups them under one item). */
	reports: { id: string; reporter: { name: string; handle: string | null }; reason: string; createdAt: Date }[];
	context: {
		title: string;
		href: string | null;
		excerpt: string | null;
		/** Comment: hidden?; build: locked?; member: suspended? */
		hidden?: boolean;
		deleted?: boolean;
		locked?: boolean;
		suspended?: boolean;
		memberRole?: string;
		buildId?: string;
		memberId?: string;
		author?: { id: string; name: string; handle: string | null; role: string; suspended: boolean };
	};
}

/** The report queue with context (excerpt, link): open reports oldest first, or recently closed ones newest first. */
export async function listReports(state: 'open' | 'closed' = 'open', limit = 100): Promise<QueueItem[]> {
	const reporter = alias(schema.user, 'reporter');
	const handler = alias(schema.user, 'handler');
	const rows = await db
		.select({
			r: schema.report,
			reporterName: reporter.name,
			reporterHandle: reporter.handle,
			handlerName: handler.name,
			sameTarget: sql<number>`(select count(*) from ${schema.report} o where o.target_kind = ${schema.report.targetKind} and o.target_id = ${schema.report.targetId} and o.state = 'open')::int`
		})
		.from(schema.report)
		.innerJoin(reporter, eq(reporter.id, schema.report.reporterId))
		.leftJoin(handler, eq(handler.id, schema.report.handledById))
		.where(eq(schema.report.state, state))
		.orderBy(state === 'open' ? asc(schema.report.createdAt) : desc(schema.report.handledAt))
		.limit(limit);

	const ids = (k: string) => rows.filter((x) => x.r.targetKind === k).map((x) => x.r.targetId);
	const commentIds = ids('comment').filter(isUuid);
	const buildIds = ids('build').filter(isUuid);
	const memberIds = ids('member');
	const author = alias(schema.user, 'author');
	const [comments, builds, members] = await Promise.all([
		commentIds.length
			? db
					.select({
						id: schema.comment.id,
						bodyMd: schema.comment.bodyMd,
						hidden: schema.comment.hidden,
						deletedAt: schema.comment.deletedAt,
						slug: schema.build.slug,
						title: schema.build.title,
						authorId: author.id,
						authorName: author.name,
						authorHandle: author.handle,
						authorRole: author.role,
						authorSuspended: author.suspendedAt
					})
					.from(schema.comment)
					.innerJoin(schema.build, eq(schema.build.id, schema.comment.buildId))
					.innerJoin(author, eq(author.id, schema.comment.authorId))
					.where(inArray(schema.comment.id, commentIds))
			: [],
		buildIds.length
			? db
					.select({ id: schema.build.id, slug: schema.build.slug, title: schema.build.title, summary: schema.build.summary, locked: schema.build.locked })
					.from(schema.build)
					.where(inArray(schema.build.id, buildIds))
			: [],
		memberIds.length
			? db
					.select({ id: schema.user.id, name: schema.user.name, handle: schema.user.handle, bio: schema.user.bio, role: schema.user.role, suspendedAt: schema.user.suspendedAt })
					.from(schema.user)
					.where(inArray(schema.user.id, memberIds))
			: []
	]);
	const cMap = new Map(comments.map((c) => [c.id, c]));
	const bMap = new Map(builds.map((b) => [b.id, b]));
	const mMap = new Map(members.map((m) => [m.id, m]));
	const cut = (s: string, n = 280) => (s.length > n ? `${s.slice(0, n - 1)}…` : s);

	const items = rows.map(({ r, reporterName, reporterHandle, handlerName, sameTarget }): QueueItem => {
		let context: QueueItem['context'] = { title: 'Removed since', href: null, excerpt: null };
		if (r.targetKind === 'comment') {
			const c = cMap.get(r.targetId);
			if (c)
				context = {
					title: `Comment on “${c.title}”`,
					href: `/builds/${c.slug}#comment-${c.id}`,
					excerpt: c.deletedAt ? null : cut(c.bodyMd),
					hidden: c.hidden,
					deleted: !!c.deletedAt,
					author: { id: c.authorId, name: c.authorName, handle: c.authorHandle, role: c.authorRole, suspended: !!c.authorSuspended }
				};
		} else if (r.targetKind === 'build') {
			const b = bMap.get(r.targetId);
			if (b) context = { title: b.title, href: `/builds/${b.slug}`, excerpt: b.summary ? cut(b.summary) : null, locked: b.locked, buildId: b.id };
		} else {
			const m = mMap.get(r.targetId);
			if (m)
				context = {
					title: m.name,
					href: m.handle ? `/makers/${m.handle}` : null,
					excerpt: m.bio ? cut(m.bio) : null,
					suspended: !!m.suspendedAt,
					memberRole: m.role,
					memberId: m.id
				};
		}
		return {
			id: r.id,
			targetKind: r.targetKind as ReportTargetKind,
			targetId: r.targetId,
			reason: r.reason,
			createdAt: r.createdAt,
			state: r.state,
			resolution: r.resolution,
			handledAt: r.handledAt,
			handledBy: handlerName,
			reporter: { name: reporterName, handle: reporterHandle },
			sameTarget,
			reports: [{ id: r.id, reporter: { name: reporterName, handle: reporterHandle }, reason: r.reason, createdAt: r.createdAt }],
			context
		};
	});
	if (state !== 'open') return items;
	// One item per reported thing, at the place of its oldest report.
	const byTarget = new Map<string, QueueItem>();
	for (const item of items) {
		const key = `${item.targetKind}:${item.targetId}`;
		const first = byTarget.get(key);
		if (first) first.reports.push(...item.reports);
		else byTarget.set(key, item);
	}
	return [...byTarget.values()];
}

/** Builds under a lock right now (the desk lists them to unlock). */
export async function listLockedBuilds(limit = 50) {
	return db
		.select({ id: schema.build.id, slug: schema.build.slug, title: schema.build.title, lockedReason: schema.build.lockedReason })
		.from(schema.build)
		.where(eq(schema.build.locked, true))
		.orderBy(asc(schema.build.title))
		.limit(limit);
}

/** Hidden comments (the desk lists them to restore). */
export async function listHiddenComments(limit = 50) {
	return db
		.select({
			id: schema.comment.id,
			bodyMd: schema.comment.bodyMd,
			hiddenReason: schema.comment.hiddenReason,
			slug: schema.build.slug,
			title: schema.build.title,
			authorName: schema.user.name
		})
		.from(schema.comment)
		.innerJoin(schema.build, eq(schema.build.id, schema.comment.buildId))
		.innerJoin(schema.user, eq(schema.user.id, schema.comment.authorId))
		.where(eq(schema.comment.hidden, true))
		.orderBy(desc(schema.comment.createdAt))
		.limit(limit);
}

export interface AuditFilter {
	action?: string;
	/** Matches the actor's name, handle or e-mail (part of it). */
	actor?: string;
	targetKind?: string;
	/** Inclusive start day, yyyy-mm-dd (UTC). */
	from?: string;
	/** Inclusive end day, yyyy-mm-dd (UTC). */
	to?: string;
	/** 1-based page of `limit` entries. */
	page?: number;
}

const DAY = /^\d{4}-\d{2}-\d{2}$/;

/** Audit-log entries, newest first, filtered (admins only). → { entries, page, more }. */
export async function listAudit(actor: Actor, filter: AuditFilter, limit = 50) {
	if (!roleAtLeast(actor.role, 'admin')) error(403, 'Only admins can read the audit log.');
	const who = alias(schema.user, 'who');
	const where: SQL[] = [];
	if (filter.action) where.push(eq(schema.auditEntry.action, filter.action));
	if (filter.targetKind) where.push(eq(schema.auditEntry.targetKind, filter.targetKind));
	if (filter.actor) {
		const t = `%${filter.actor.trim().replace(/^@/, '').replace(/[%_\\]/g, (c) => `\\${c}`)}%`;
		where.push(or(ilike(who.name, t), ilike(who.handle, t), ilike(who.email, t))!);
	}
	if (filter.from && DAY.test(filter.from)) where.push(gte(schema.auditEntry.createdAt, new Date(`${filter.from}T00:00:00Z`)));
	if (filter.to && DAY.test(filter.to)) {
		const end = new Date(`${filter.to}T00:00:00Z`);
		end.setUTCDate(end.getUTCDate() + 1);
		where.push(lt(schema.auditEntry.createdAt, end));
	}
	const page = Math.max(1, Math.min(10_000, Math.floor(filter.page ?? 1) || 1));
	const rows = await db
		.select({
			id: schema.auditEntry.id,
			action: schema.auditEntry.action,
			targetKind: schema.auditEntry.targetKind,
			targetId: schema.auditEntry.targetId,
			reason: schema.auditEntry.reason,
			details: schema.auditEntry.details,
			createdAt: schema.auditEntry.createdAt,
			actorName: who.name,
			actorHandle: who.handle,
			actorRole: who.role
		})
		.from(schema.auditEntry)
		.leftJoin(who, eq(who.id, schema.auditEntry.actorId))
		.where(where.length ? and(...where) : undefined)
		.orderBy(desc(schema.auditEntry.createdAt), desc(schema.auditEntry.id))
		.limit(limit + 1)
		.offset((page - 1) * limit);
	const more = rows.length > limit;
	return { entries: rows.slice(0, limit), page, more };
}

/** The distinct actions and target kinds in the log (for the filter menus). */
export async function auditFacets() {
	const [actions, kinds] = await Promise.all([
		db.selectDistinct({ v: schema.auditEntry.action }).from(schema.auditEntry).orderBy(schema.auditEntry.action),
		db.selectDistinct({ v: schema.auditEntry.targetKind }).from(schema.auditEntry).orderBy(schema.auditEntry.targetKind)
	]);
	return { actions: actions.map((a) => a.v), targetKinds: kinds.map((k) => k.v) };
}
