/**
 * Review state of builds (PRODUCT.md §4.5): the latest verdict, the revision it was given on, whether
 * the build changed since, whether it waits on the review desk, and its flag counts. Used by the build
 * page, cards, browse filters and the API.
 */
import { and, eq, inArray, sql, type SQL } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { computeLabel, emptyReviewState, isWaiting, type ReviewLabel, type ReviewState, type Verdict } from '$lib/reviews';

export {
	REVIEW_LABELS,
	computeLabel,
	emptyReviewState,
	isWaiting,
	reviewLabelText,
	reviewStateJson,
	type ReviewLabel,
	type ReviewState,
	type Verdict
} from '$lib/reviews';

/**
 * Review states for many builds at once (three queries whatever the count). Ids that do not exist get
 * the unreviewed state. The latest verdict is the most recent review of the build, whichever revision.
 */
export async function getReviewStates(buildIds: string[]): Promise<Map<string, ReviewState>> {
	const out = new Map<string, ReviewState>();
	const ids = [...new Set(buildIds.filter((id) => /^[0-9a-f-]{36}$/i.test(id)))];
	for (const id of buildIds) out.set(id, emptyReviewState());
	if (ids.length === 0) return out;

	const [builds, latest, flags] = await Promise.all([
		db
			.select({ id: schema.build.id, revision: schema.build.revision, reviewRequestedAt: schema.build.reviewRequestedAt })
			.from(schema.build)
			.where(inArray(schema.build.id, ids)),
		db
			.selectDistinctOn([schema.review.buildId], {
				buildId: schema.review.buildId,
				verdict: schema.review.verdict,
				revision: schema.review.revision,
				createdAt: schema.review.createdAt,
				reviewerName: schema.user.name,
				reviewerHandle: schema.user.handle
			})
			.from(schema.review)
			.innerJoin(schema.user, eq(schema.user.id, schema.review.reviewerId))
			.where(inArray(schema.review.buildId, ids))
			.orderBy(schema.review.buildId, sql`${schema.review.createdAt} desc`, sql`${schema.review.id} desc`),
		db
			.select({
				buildId: schema.safetyFlag.buildId,
				state: schema.safetyFlag.state,
				n: sql<number>`count(*)::int`
			})
			.from(schema.safetyFlag)
			.where(and(inArray(schema.safetyFlag.buildId, ids), inArray(schema.safetyFlag.state, ['open', 'addressed'])))
			.groupBy(schema.safetyFlag.buildId, schema.safetyFlag.state)
	]);

	const latestBy = new Map(latest.map((r) => [r.buildId, r]));
	for (const b of builds) {
		const r = latestBy.get(b.id);
		const waiting = isWaiting(b.reviewRequestedAt, r?.createdAt ?? null);
		const verdict = r ? (r.verdict as Verdict) : null;
		out.set(b.id, {
			label: computeLabel(verdict, r?.revision ?? null, b.revision, waiting),
			verdict,
			verdictRevision: r?.revision ?? null,
			currentRevision: b.revision,
			reviewedAt: r?.createdAt ?? null,
			reviewer: r ? { name: r.reviewerName, handle: r.reviewerHandle } : null,
			waiting,
			openFlags: 0,
			addressedFlags: 0
		});
	}
	for (const f of flags) {
		const s = out.get(f.buildId);
		if (!s) continue;
		if (f.state === 'open') s.openFlags = f.n;
		else if (f.state === 'addressed') s.addressedFlags = f.n;
	}
	return out;
}

/** The review state of one build. */
export async function getReviewState(buildId: string): Promise<ReviewState> {
	return (await getReviewStates([buildId])).get(buildId) ?? emptyReviewState();
}

/**
 * SQL condition on the `build` table selecting builds whose review state has `label` (for browse filters
 * and the API's `review=` parameter). Same rules as getReviewStates.
 */
export function reviewLabelCondition(label: ReviewLabel): SQL {
	const b = schema.build;
	const latestVerdict = sql`(select r.verdict from ${schema.review} r where r.build_id = ${b.id} order by r.created_at desc, r.id desc limit 1)`;
	const latestRevision = sql`(select r.revision from ${schema.review} r where r.build_id = ${b.id} order by r.created_at desc, r.id desc limit 1)`;
	const noReview = sql`not exists (select 1 from ${schema.review} r where r.build_id = ${b.id})`;
	switch (label) {
		case 'unreviewed':
			return sql`(${noReview} and ${b.reviewRequestedAt} is null)`;
		case 'waiting':
			return sql`(${noReview} and ${b.reviewRequestedAt} is not null)`;
		case 'safe':
			return sql`(${latestVerdict} = 'safe' and ${latestRevision} >= ${b.revision})`;
		case 'safe-changed':
			return sql`(${latestVerdict} = 'safe' and ${latestRevision} < ${b.revision})`;
		case 'rework':
			return sql`(${latestVerdict} = 'rework' and ${latestRevision} >= ${b.revision})`;
		case 'rework-changed':
			return sql`(${latestVerdict} = 'rework' and ${latestRevision} < ${b.revision})`;
	}
}
