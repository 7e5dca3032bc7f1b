/**
 * What the review page shows: the PUBLISHED revision the verdict is recorded against (the latest revision's
 * snapshot, as readers see it, with its files) and, apart from it, the maker's pending (unpublished) changes as
 * a diff from that revision — never live content mixed in. A build without a revision row (older data) falls
 * back to its live content, with no pending section.
 */
import * as schema from '../db/schema';
import { db } from '../db';
import type { Viewer } from '../actor';
import { loadBuildContent, type BuildContent } from '../builds/queries';
import { loadPublishedContent } from '../builds/published';
import { getRevision, takeSnapshot } from '../builds/revisions';
import { diffSnapshots } from '../builds/snapshot';
import { diffRevisions, type RevisionDiff } from '../builds/revision-diff';
import { attachmentsFor } from '../attachments';

export interface PendingChanges {
	/** When the first unpublished edit was made. */
	since: Date | null;
	/** The revision they are pending on. */
	from: number;
	/** Phrases ("1 step changed"), as the editor lists them. */
	summary: string[];
	diff: RevisionDiff;
}

/** The reviewed revision of `b` with its attachments, and the pending changes since it (null when none). */
export async function reviewedContent(b: schema.Build, viewer: Viewer) {
	const [published, attachments] = await Promise.all([loadPublishedContent(b), attachmentsFor(b, viewer)]);
	const content: BuildContent = published?.content ?? (await loadBuildContent(b));
	return { build: published?.build ?? b, content, pinned: published ? b.revision : null, attachments, pending: published ? await pendingOf(b) : null };
}

async function pendingOf(b: schema.Build): Promise<PendingChanges | null> {
	if (!b.pendingChangesAt) return null;
	const [rev, live] = await Promise.all([getRevision(b.id, b.revision), takeSnapshot(db, b.id)]);
	if (!rev) return null;
	const summary = diffSnapshots(rev.snapshot, live);
	if (!summary.length) return null;
	return { since: b.pendingChangesAt, from: b.revision, summary, diff: diffRevisions(rev.snapshot, live) };
}
