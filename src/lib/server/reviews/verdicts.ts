/**
 * Review requests and verdicts (PRODUCT.md §4.5). A maker asks for review of a published build; a
 * reviewer (never the maker) gives a verdict, safe or rework, pinned to the revision current at that
 * moment. Once the build changes, the verdict is "changed since"; asking again puts it back on the desk.
 */
import { error } from '@sveltejs/kit';
import { and, eq, sql } from 'drizzle-orm';
import * as schema from '../db/schema';
import type { Tx } from '../db';
import { renderMarkdown } from '../markdown';
import { recordAudit } from '../audit';
import { notifyReview } from '../notifications';
import { inTx } from '../db/tx';
import { requestReviewSchema, reviewSchema, type ReviewInput } from '$lib/schemas/review';
import { checklistFromTicked, CHECKLIST_ITEMS } from '$lib/review-checklist';
import { stripControls } from '../http/control-chars';
import { assertNotClaimedByOther } from './desk';
import { scheduleDigests } from './digest';
import type { Actor } from '../actor';
import { assertCanReview, reviewerName, type WriteOptions } from './flags';
import { assertCanView } from '../builds/access';

/**
 * The maker asks for review of their published build: it joins the review desk (oldest request first),
 * with the maker's optional note for the reviewer. Asking while already waiting keeps the original place
 * in the queue (a new note replaces the old one). Reviewers following the build's category get a digest
 * (reviews/digest.ts). → 'queued' | 'already-waiting'.
 */
export async function requestReview(actor: Actor, buildId: string, tx?: Tx, note = ''): Promise<'queued' | 'already-waiting'> {
	const data = requestReviewSchema.parse({ note: stripControls(note) });
	const out = await inTx(tx, async (t) => {
		const [b] = await t.select().from(schema.build).where(eq(schema.build.id, buildId)).for('update');
		if (!b) error(404, 'Not found');
		assertCanView(actor, b);
		if (actor.id !== b.ownerId) error(403, 'Only the maker of this build can ask for its review.');
		if (b.status !== 'published') error(409, 'Publish the build first: reviewers review published builds.');
		if (b.locked) error(403, 'A moderator has locked this build; it cannot go to the review desk for now.');
		if (b.reviewRequestedAt) {
			if (data.note) await t.update(schema.reviewRequest).set({ note: data.note }).where(eq(schema.reviewRequest.buildId, b.id));
			return { state: 'already-waiting' as const, category: b.category };
		}
		// The trigger on build creates the desk row (review_request); the note goes onto it.
		await t.update(schema.build).set({ reviewRequestedAt: new Date() }).where(eq(schema.build.id, b.id));
		await t.update(schema.reviewRequest).set({ note: data.note }).where(eq(schema.reviewRequest.buildId, b.id));
		return { state: 'queued' as const, category: b.category };
	});
	if (out.state === 'queued' && !tx) await scheduleDigests(out.category, actor.id);
	return out.state;
}

/**
 * A reviewer gives a verdict on the build's current revision. "safe" is refused while the build has
 * open flags (resolve them or give "rework"). Clears the review request, stamps last_reviewed_at,
 * writes the audit log and e-mails the maker. → { id, revision }.
 */
export async function submitReview(
	actor: Actor,
	buildId: string,
	input: ReviewInput,
	opts: WriteOptions = {}
): Promise<{ id: string; revision: number }> {
	const data = reviewSchema.parse(input);
	const summaryHtml = renderMarkdown(data.summary);
	const checklistNote = stripControls(data.checklistNote);
	const result = await inTx(opts.tx, async (tx) => {
		const [b] = await tx.select().from(schema.build).where(eq(schema.build.id, buildId)).for('update');
		if (!b) error(404, 'Not found');
		assertCanReview(actor, b);
		await assertNotClaimedByOther(tx, actor, b.id);
		if (data.verdict === 'safe') {
			const [{ n }] = await tx
				.select({ n: sql<number>`count(*)::int` })
				.from(schema.safetyFlag)
				.where(and(eq(schema.safetyFlag.buildId, b.id), eq(schema.safetyFlag.state, 'open')));
			if (n > 0) {
				error(
					409,
					`This build still has ${n} hazard tag${n === 1 ? '' : 's'} tagged. Clear ${n === 1 ? 'it' : 'them'} first, or send the build back for changes.`
				);
			}
		}
		// A sign-off of a mains build always carries the checklist; a send-back only when something was ticked.
		const checklist = b.mainsPowered && (data.verdict === 'safe' || data.checklist.length) ? checklistFromTicked(data.checklist) : [];
		const unticked = checklist.filter((c) => !c.ticked).length;
		if (data.verdict === 'safe' && unticked > 0 && checklistNote.length < 10) {
			error(
				422,
				`This is a mains build: ${unticked} of ${CHECKLIST_ITEMS.length} checklist items are not ticked. Tick them, or say in the note below why they do not apply or could not be checked (at least 10 characters).`
			);
		}
		const now = new Date();
		const [row] = await tx
			.insert(schema.review)
			.values({
				buildId: b.id,
				reviewerId: actor.id,
				revision: b.revision,
				verdict: data.verdict,
				summaryMd: data.summary,
				summaryHtml,
				checklist,
				checklistNote: checklist.length ? checklistNote : '',
				createdAt: now
			})
			.returning({ id: schema.review.id });
		await tx.update(schema.build).set({ reviewRequestedAt: null, lastReviewedAt: now }).where(eq(schema.build.id, b.id));
		await recordAudit(tx, {
			actorId: actor.id,
			action: 'review.submit',
			targetKind: 'review',
			targetId: row.id,
			details: { build: b.slug, verdict: data.verdict, revision: b.revision }
		});
		return { id: row.id, revision: b.revision, build: b };
	});
	if (opts.notify !== false) {
		await notifyReview({
			ownerId: result.build.ownerId,
			actorId: actor.id,
			reviewerName: await reviewerName(actor),
			build: result.build,
			verdict: data.verdict,
			revision: result.revision,
			summaryMd: data.summary
		});
	}
	return { id: result.id, revision: result.revision };
}
