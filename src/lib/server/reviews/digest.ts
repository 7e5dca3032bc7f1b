/**
 * Review desk mail for reviewers: a reviewer follows categories (reviewer_setting.categories); when a
 * request arrives in one of them, a digest job for that reviewer is scheduled in the durable queue
 * (pg-boss queue `review-digest`, policy "short": at most one job per reviewer waits at a time) to run
 * REVIEW_DIGEST_MINUTES later (default 60). When it runs it lists every request in their categories that
 * arrived since their last digest, in one mail through the mail queue. However many requests arrive in
 * the period, the reviewer gets one mail.
 */
import { and, asc, eq, gt, inArray, ne, sql } from 'drizzle-orm';
import { env } from '$env/dynamic/private';
import * as schema from '../db/schema';
import { db } from '../db';
import { composeMail, enqueueMail, getBoss } from '../mail';
import { unsubscribeUrl } from '../notifications';
import { CATEGORIES, type Category } from '$lib/schemas/build';
import { CATEGORY_LABELS } from '$lib/labels';
import { roleAtLeast, type Role } from '$lib/roles';
import { revisionLabel } from '$lib/revision-label';
import { reviewedRevisionOn, reviewedTitle } from './desk';

export const DIGEST_QUEUE = 'review-digest';
/** Most requests named in one digest; the rest are counted. */
const DIGEST_LIST_MAX = 20;

/** Minutes between a first new request and the digest mail (env REVIEW_DIGEST_MINUTES, default 60). */
export function digestMinutes(): number {
	const n = Number(env.REVIEW_DIGEST_MINUTES ?? 60);
	return Number.isFinite(n) && n >= 0 ? n : 60;
}

function origin(): string {
	return (env.ORIGIN ?? env.BETTER_AUTH_URL ?? 'http://127.0.0.1:5173').replace(/\/$/, '');
}

/** The categories a member follows on the review desk ([] when none). */
export async function followedCategories(userId: string): Promise<Category[]> {
	const [row] = await db.select({ c: schema.reviewerSetting.categories }).from(schema.reviewerSetting).where(eq(schema.reviewerSetting.userId, userId));
	return (row?.c ?? []).filter((c): c is Category => (CATEGORIES as readonly string[]).includes(c));
}

/**
 * Set the categories a reviewer follows (an account setting; [] turns the mail off). Reviewers and up
 * only. Unknown categories are dropped. Starting to follow does not mail about requests already waiting.
 */
export async function setFollowedCategories(actor: { id: string; role: Role | string }, categories: readonly string[]): Promise<Category[]> {
	if (!roleAtLeast(actor.role as Role, 'reviewer')) throw new Error('only reviewers follow desk categories');
	const keep = CATEGORIES.filter((c) => categories.includes(c));
	await db
		.insert(schema.reviewerSetting)
		.values({ userId: actor.id, categories: keep, digestSentAt: new Date() })
		.onConflictDoUpdate({
			target: schema.reviewerSetting.userId,
			// Newly following: the digest starts from now, not from the first request ever made.
			set: { categories: keep, digestSentAt: sql`coalesce(${schema.reviewerSetting.digestSentAt}, now())` }
		});
	return keep;
}

let queueReady: Promise<unknown> | null = null;
async function digestQueue() {
	const boss = await getBoss();
	queueReady ??= boss.createQueue(DIGEST_QUEUE, { name: DIGEST_QUEUE, policy: 'short' }).catch(() => {});
	await queueReady;
	return boss;
}

/**
 * A request arrived in `category` (by `makerId`): schedule a digest for each reviewer who follows it
 * (not the maker, not suspended). Never throws: the request is already stored. → jobs created (a
 * reviewer who already has a digest waiting gets none: the waiting one will list this request too).
 */
export async function scheduleDigests(category: string, makerId: string): Promise<number> {
	try {
		const followers = await db
			.select({ id: schema.user.id, role: schema.user.role })
			.from(schema.reviewerSetting)
			.innerJoin(schema.user, eq(schema.user.id, schema.reviewerSetting.userId))
			.where(
				and(
					sql`${schema.reviewerSetting.categories} @> array[${category}]::text[]`,
					ne(schema.user.id, makerId),
					sql`${schema.user.suspendedAt} is null`
				)
			);
		const reviewers = followers.filter((f) => roleAtLeast(f.role as Role, 'reviewer'));
		if (!reviewers.length) return 0;
		const boss = await digestQueue();
		let made = 0;
		for (const r of reviewers) {
			const id = await boss.send(DIGEST_QUEUE, { userId: r.id }, { singletonKey: r.id, startAfter: Math.round(digestMinutes() * 60), retryLimit: 5 });
			if (id) made++;
		}
		return made;
	} catch (err) {
		console.error('[review-digest] could not schedule', err);
		return 0;
	}
}

/**
 * Send one reviewer their digest: every waiting request in their followed categories that arrived since
 * their last digest (not their own builds), as one mail through the mail queue, and move their mark.
 * Nothing new → no mail. → the mail job id, or null.
 */
export async function sendReviewDigest(userId: string): Promise<string | null> {
	const picked = await db.transaction(async (tx) => {
		const [who] = await tx
			.select({
				categories: schema.reviewerSetting.categories,
				since: schema.reviewerSetting.digestSentAt,
				name: schema.user.name,
				email: schema.user.email,
				role: schema.user.role,
				suspendedAt: schema.user.suspendedAt
			})
			.from(schema.reviewerSetting)
			.innerJoin(schema.user, eq(schema.user.id, schema.reviewerSetting.userId))
			.where(eq(schema.reviewerSetting.userId, userId))
			.for('update', { of: schema.reviewerSetting });
		if (!who || who.suspendedAt || !who.categories.length || !roleAtLeast(who.role as Role, 'reviewer')) return null;
		const rr = schema.reviewRequest;
		const rows = await tx
			// What the desk shows: the published revision's title, mains flag, category and DANGER count.
			.select({ slug: schema.build.slug, title: reviewedTitle, revision: schema.build.revision, category: rr.category, requestedAt: rr.requestedAt, mains: rr.mainsPowered, danger: rr.dangerChecks })
			.from(rr)
			.innerJoin(schema.build, eq(schema.build.id, rr.buildId))
			.leftJoin(schema.buildRevision, reviewedRevisionOn)
			.where(
				and(
					inArray(rr.category, who.categories),
					who.since ? gt(rr.requestedAt, who.since) : undefined,
					eq(schema.build.status, 'published'),
					ne(schema.build.ownerId, userId)
				)
			)
			.orderBy(asc(rr.requestedAt), asc(rr.buildId));
		if (!rows.length) return null;
		await tx.update(schema.reviewerSetting).set({ digestSentAt: rows[rows.length - 1].requestedAt }).where(eq(schema.reviewerSetting.userId, userId));
		return { who, rows };
	});
	if (!picked) return null;
	const { who, rows } = picked;
	const n = rows.length;
	const lines = rows.slice(0, DIGEST_LIST_MAX).map(
		(r) =>
			`• “${r.title}” ${revisionLabel(Math.max(1, r.revision))} (${CATEGORY_LABELS[r.category as Category] ?? r.category}${r.mains ? ', mains powered' : ''}${r.danger ? `, ${r.danger} DANGER` : ''}): ${origin()}/builds/${r.slug}/review`
	);
	if (n > DIGEST_LIST_MAX) lines.push(`…and ${n - DIGEST_LIST_MAX} more on the desk.`);
	return enqueueMail(
		composeMail({
			to: who.email,
			subject: n === 1 ? `1 new build to review: “${rows[0].title}”` : `${n} new builds to review`,
			paragraphs: [
				`Hello ${who.name},`,
				`${n === 1 ? 'A maker has' : `${n} makers have`} asked for review in the categories you follow since your last digest:`,
				...lines,
				'Claim one on the review desk (“I’m reviewing this”) so other reviewers leave it to you. Change the categories you follow on the review desk, or stop the digest with the link below.'
			],
			action: { label: 'Open the review desk', url: `${origin()}/review-desk` },
			// RFC 8058 one-click (List-Unsubscribe headers, mail.ts) and the footer link: a signed, expiring token.
			unsubscribeUrl: unsubscribeUrl(userId, 'digest')
		})
	);
}

let working = false;

/** Work the digest queue from this process (started with the mail worker). */
export async function startDigestWorker(): Promise<void> {
	if (working) return;
	working = true;
	const boss = await digestQueue();
	await boss.work<{ userId: string }>(DIGEST_QUEUE, { pollingIntervalSeconds: Number(env.MAIL_POLL_S ?? 1), batchSize: 5 }, async (jobs) => {
		for (const job of jobs) await sendReviewDigest(job.data.userId);
	});
}
