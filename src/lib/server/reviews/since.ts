/**
 * What changed since the last verdict, for a re-review: the diff (revision-diff.ts) from the revision last
 * signed off — or, when the build was never signed off, the revision last sent back — to the current one.
 */
import { and, desc, eq } from 'drizzle-orm';
import * as schema from '../db/schema';
import { db } from '../db';
import { diffRevisions, type RevisionDiff } from '../builds/revision-diff';
import { getRevision } from '../builds/revisions';
import type { Verdict } from '$lib/reviews';

export interface ChangesSinceVerdict {
	verdict: Verdict;
	from: number;
	to: number;
	diff: RevisionDiff;
}

/** The changes from the last signed-off (else last reviewed) revision to `currentRevision`; null when none apply. */
export async function changesSinceVerdict(buildId: string, currentRevision: number): Promise<ChangesSinceVerdict | null> {
	const latestOf = async (verdict?: Verdict) => {
		const [r] = await db
			.select({ revision: schema.review.revision, verdict: schema.review.verdict })
			.from(schema.review)
			.where(verdict ? and(eq(schema.review.buildId, buildId), eq(schema.review.verdict, verdict)) : eq(schema.review.buildId, buildId))
			.orderBy(desc(schema.review.createdAt), desc(schema.review.id))
			.limit(1);
		return r ?? null;
	};
	const base = (await latestOf('safe')) ?? (await latestOf());
	if (!base || base.revision >= currentRevision) return null;
	const [a, z] = await Promise.all([getRevision(buildId, base.revision), getRevision(buildId, currentRevision)]);
	if (!a || !z) return null;
	return { verdict: base.verdict as Verdict, from: a.number, to: z.number, diff: diffRevisions(a.snapshot, z.snapshot) };
}
