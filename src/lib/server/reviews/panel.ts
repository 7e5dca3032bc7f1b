/** Everything the build page's review panel shows, and what the viewer may do there. */
import type { Viewer } from '../actor';
import { asc, desc, eq } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import * as schema from '../db/schema';
import { db } from '../db';
import { roleAtLeast } from '$lib/roles';
import type { FlagCategory, FlagSeverity, FlagState, PanelFlag, PanelFlagMessage, ReviewPanelData, Verdict } from '$lib/reviews';

export type { PanelFlag, PanelPerson, PanelReview, ReviewPanelData } from '$lib/reviews';
import { getReviewState } from './state';
import { loadTargets, missingTarget } from './targets';
import { canReview } from './flags';

const STATE_ORDER: Record<string, number> = { open: 0, addressed: 1, resolved: 2 };

/**
 * The review panel of a build for `viewer` (null when signed out): badge state, reviews newest first,
 * flags with their targets, and the viewer's permitted actions. The caller has already checked that the
 * viewer may see the build.
 */
export async function getReviewPanel(
	buildId: string,
	viewer: Viewer
): Promise<ReviewPanelData> {
	const [b] = await db
		.select({
			id: schema.build.id,
			slug: schema.build.slug,
			status: schema.build.status,
			ownerId: schema.build.ownerId,
			locked: schema.build.locked,
			reviewRequestedAt: schema.build.reviewRequestedAt
		})
		.from(schema.build)
		.where(eq(schema.build.id, buildId));
	if (!b) throw new Error(`build ${buildId} does not exist`);

	const raiser = alias(schema.user, 'raiser');
	const resolver = alias(schema.user, 'resolver');
	const author = alias(schema.user, 'author');
	const [state, reviews, flags, targets, messages] = await Promise.all([
		getReviewState(buildId),
		db
			.select({
				id: schema.review.id,
				verdict: schema.review.verdict,
				revision: schema.review.revision,
				summaryHtml: schema.review.summaryHtml,
				checklist: schema.review.checklist,
				checklistNote: schema.review.checklistNote,
				createdAt: schema.review.createdAt,
				name: schema.user.name,
				handle: schema.user.handle
			})
			.from(schema.review)
			.innerJoin(schema.user, eq(schema.user.id, schema.review.reviewerId))
			.where(eq(schema.review.buildId, buildId))
			.orderBy(desc(schema.review.createdAt))
			.limit(50),
		db
			.select({
				flag: schema.safetyFlag,
				raiserName: raiser.name,
				raiserHandle: raiser.handle,
				resolverName: resolver.name,
				resolverHandle: resolver.handle
			})
			.from(schema.safetyFlag)
			.innerJoin(raiser, eq(raiser.id, schema.safetyFlag.raisedById))
			.leftJoin(resolver, eq(resolver.id, schema.safetyFlag.resolvedById))
			.where(eq(schema.safetyFlag.buildId, buildId))
			.orderBy(asc(schema.safetyFlag.createdAt)),
		loadTargets(buildId),
		db
			.select({
				id: schema.flagMessage.id,
				flagId: schema.flagMessage.flagId,
				authorId: schema.flagMessage.authorId,
				name: author.name,
				handle: author.handle,
				bodyHtml: schema.flagMessage.bodyHtml,
				createdAt: schema.flagMessage.createdAt
			})
			.from(schema.flagMessage)
			.innerJoin(schema.safetyFlag, eq(schema.safetyFlag.id, schema.flagMessage.flagId))
			.innerJoin(author, eq(author.id, schema.flagMessage.authorId))
			.where(eq(schema.safetyFlag.buildId, buildId))
			.orderBy(asc(schema.flagMessage.createdAt), asc(schema.flagMessage.id))
	]);
	const threadOf = new Map<string, PanelFlagMessage[]>();
	for (const m of messages) {
		const list = threadOf.get(m.flagId) ?? [];
		list.push({ id: m.id, author: { name: m.name, handle: m.handle }, byMaker: m.authorId === b.ownerId, bodyHtml: m.bodyHtml, createdAt: m.createdAt });
		threadOf.set(m.flagId, list);
	}

	const isOwner = !!viewer && viewer.id === b.ownerId;
	const panelFlags: PanelFlag[] = flags
		.map(({ flag: f, ...r }) => ({
			id: f.id,
			target: targets.get(f.targetId) ?? missingTarget(f.targetKind, f.targetId),
			category: f.category as FlagCategory,
			severity: f.severity as FlagSeverity,
			state: f.state as FlagState,
			noteHtml: f.noteHtml,
			raisedBy: { name: r.raiserName, handle: r.raiserHandle },
			revision: f.revision,
			createdAt: f.createdAt,
			addressedNote: f.addressedNote,
			addressedAt: f.addressedAt,
			resolvedBy: r.resolverName ? { name: r.resolverName, handle: r.resolverHandle } : null,
			resolvedAt: f.resolvedAt,
			resolvedNote: f.resolvedNote,
			messages: threadOf.get(f.id) ?? []
		}))
		.sort((x, y) => STATE_ORDER[x.state] - STATE_ORDER[y.state] || y.createdAt.getTime() - x.createdAt.getTime());

	return {
		slug: b.slug,
		status: b.status,
		locked: b.locked,
		state,
		reviews: reviews.map((r) => ({
			id: r.id,
			reviewer: { name: r.name, handle: r.handle },
			verdict: r.verdict as Verdict,
			revision: r.revision,
			summaryHtml: r.summaryHtml,
			checklist: r.checklist,
			checklistNote: r.checklistNote,
			createdAt: r.createdAt
		})),
		flags: panelFlags,
		can: {
			requestReview: isOwner && b.status === 'published' && !b.locked && !b.reviewRequestedAt,
			review: canReview(viewer, b),
			address: isOwner && !b.locked,
			resolve: !!viewer && !isOwner && roleAtLeast(viewer.role, 'reviewer'),
			discuss: isOwner || (!!viewer && roleAtLeast(viewer.role, 'reviewer'))
		}
	};
}
