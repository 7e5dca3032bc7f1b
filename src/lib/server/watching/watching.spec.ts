// Integration (real PostgreSQL + the pg-boss mail queue): watching a build — who may watch, and who gets which
// mail for each event (comment, reply, revision, sign-off / send-back, hazard tag tagged / fixed / cleared):
// the maker and the watchers, one mail per event per member, never the member who acted, each kind under its
// own opt-out. Mails are read from pg-boss's job table (queuedMailTo), as the review tests do.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { stopMail } from '../mail';
import { addStep, createDraft, publishRevision } from '../builds';
import { postComment } from '../comments';
import { addressFlag, raiseFlag, setFlagState, submitReview } from '../reviews';
import { notifyRevision } from '../notifications';
import { createTestUser, removeTestUsers } from '../testing/builds';
import { createPublishedBuild, emailOf, queuedMailTo, type TestBuild } from '../testing/reviews';
import { isWatching, unwatchBuild, watchBuild, watcherIds } from './index';
import { revisionLabel } from '$lib/revision-label';

type U = Awaited<ReturnType<typeof createTestUser>>;
let maker: U, watcher: U, quiet: U, reviewer: U, reviewerWatching: U, stranger: U;
let b: TestBuild;
const users: string[] = [];
const mail: Record<string, string> = {};

beforeAll(async () => {
	maker = await createTestUser('maker', 'Maker');
	watcher = await createTestUser('maker', 'Watcher');
	quiet = await createTestUser('maker', 'Quiet watcher');
	reviewer = await createTestUser('reviewer', 'Reviewer');
	reviewerWatching = await createTestUser('reviewer', 'Watching reviewer');
	stranger = await createTestUser('maker', 'Stranger');
	users.push(maker.id, watcher.id, quiet.id, reviewer.id, reviewerWatching.id, stranger.id);
	for (const u of [maker, watcher, quiet, reviewer, reviewerWatching, stranger]) mail[u.id] = await emailOf(u.id);
	b = await createPublishedBuild(maker);
	// The quiet watcher turned comment and revision mail off (account settings), but keeps review and hazard mail.
	await db.update(schema.user).set({ notifyComment: false, notifyRevision: false }).where(eq(schema.user.id, quiet.id));
});

afterAll(async () => {
	await removeTestUsers(users);
	await stopMail();
});

/** Subjects queued to `u` since `t`. */
const to = async (u: U, t: Date) => (await queuedMailTo(mail[u.id], t)).map((m) => m.subject);
/** A point in time after everything queued so far (pg-boss stamps jobs with the database clock, same machine). */
const mark = async () => {
	await new Promise((r) => setTimeout(r, 5));
	return new Date();
};
/** The build's first top-level comment. */
async function firstComment() {
	const [top] = await db.select({ id: schema.comment.id }).from(schema.comment).where(eq(schema.comment.buildId, b.id)).orderBy(schema.comment.createdAt).limit(1);
	return top;
}
/** The build as the comments module takes it. */
const ref = () => ({ id: b.id, slug: b.slug, title: b.title, status: 'published' as const, locked: false, ownerId: maker.id });

describe('watching: who may watch', () => {
	it('a member watches and stops watching a published build; the maker cannot watch their own; drafts are not watchable', async () => {
		expect(await watchBuild(watcher, b.slug)).toBe(true);
		expect(await watchBuild(watcher, b.slug)).toBe(true); // twice is harmless
		expect(await isWatching(watcher.id, b.id)).toBe(true);
		await watchBuild(quiet, b.slug);
		await watchBuild(reviewerWatching, b.slug);
		await expect(watchBuild(maker, b.slug)).rejects.toMatchObject({ status: 409 });
		await expect(watchBuild(stranger, 'no-such-build-anywhere')).rejects.toMatchObject({ status: 404 });

		const draftOwner = await createTestUser('maker', 'Draft owner');
		users.push(draftOwner.id);
		const draft = await createDraft(draftOwner.id, {
			title: `Draft ${Date.now()}`,
			summary: 'x',
			category: 'preamp',
			topology: 'class-ab-discrete',
			mainsPowered: false,
			licence: 'CC-BY-SA-4.0'
		});
		// Someone else cannot even see a draft: 404, not a hint that it exists.
		await expect(watchBuild(stranger, draft.slug)).rejects.toMatchObject({ status: 404 });

		await watchBuild(stranger, b.slug);
		expect(await unwatchBuild(stranger, b.slug)).toBe(false);
		expect(await isWatching(stranger.id, b.id)).toBe(false);
		expect(new Set(await watcherIds(b.id))).toEqual(new Set([watcher.id, quiet.id, reviewerWatching.id]));
	});
});

describe('watching: who gets which mail', () => {
	it('a new comment: the maker and the watchers who want comment mail, not the commenter', async () => {
		const t = await mark();
		await postComment(watcher, ref(), { body: 'Did you try a **bigger** heatsink?' });
		const subject = `New comment on “${b.title}”`;
		expect(await to(maker, t)).toEqual([subject]);
		expect(await to(reviewerWatching, t)).toEqual([subject]);
		expect(await to(watcher, t)).toEqual([]); // their own comment
		expect(await to(quiet, t)).toEqual([]); // comment mail off
		expect(await to(stranger, t)).toEqual([]); // not watching
	});

	it('a reply: its parent’s author gets ONE mail (the reply), even though they also watch the build', async () => {
		const top = await firstComment();
		const t = await mark();
		await postComment(maker, ref(), { body: 'Yes: 0.6 K/W now.', parentId: top.id });
		expect(await to(watcher, t)).toEqual([`${maker.name} replied to your comment on “${b.title}”`]);
		expect(await to(reviewerWatching, t)).toEqual([`New comment on “${b.title}”`]);
		expect(await to(maker, t)).toEqual([]); // the maker acted
	});

	it('a parent author who turned reply mail off but watches the build still gets one mail, under comment mail', async () => {
		const top = await firstComment();
		await db.update(schema.user).set({ notifyReply: false }).where(eq(schema.user.id, watcher.id));
		const t = await mark();
		await postComment(reviewer, ref(), { body: 'Measure the tab-to-chassis resistance too.', parentId: top.id });
		expect(await to(watcher, t)).toEqual([`New comment on “${b.title}”`]);
		await db.update(schema.user).set({ notifyReply: true }).where(eq(schema.user.id, watcher.id));
	});

	it('a new revision: the watchers who want revision mail; the maker (who published it) gets none', async () => {
		await addStep(maker, b.id, { title: 'Soft start', bodyMd: 'An NTC in the primary.' });
		const t = await mark();
		const rev = await publishRevision(maker, b.id, 'Soft start added.');
		await notifyRevision({ actorId: maker.id, makerName: maker.name, build: b, revision: rev.number, summary: rev.summary, note: 'Soft start added.' });
		const subject = `New revision of “${b.title}”: ${revisionLabel(rev.number)}`;
		expect(await to(watcher, t)).toEqual([subject]);
		expect(await to(reviewerWatching, t)).toEqual([subject]);
		expect(await to(quiet, t)).toEqual([]);
		expect(await to(maker, t)).toEqual([]);
		const [job] = await db.execute<{ text: string }>(
			// The body names the revision letter and the maker's note (PRODUCT.md §3 words).
			sql`select data->>'text' as text from pgboss.job where name = 'mail' and data->>'to' = ${mail[watcher.id]} and created_on >= ${t.toISOString()}::timestamptz`
		);
		expect(job.text).toContain(`published ${revisionLabel(rev.number)} of “${b.title}”, a build you watch`);
		expect(job.text).toContain('Soft start added.');
	});

	it('a hazard tag, fixed, cleared; then a send-back: the maker and every watcher once each, never the one who acted', async () => {
		let t = await mark();
		const flagId = await raiseFlag(reviewerWatching, b.id, {
			targetKind: 'step',
			targetId: b.steps.heatsink,
			category: 'heat',
			severity: 'fix',
			note: 'The tab sits at V− and the heatsink is bonded to the chassis.'
		});
		const tagged = `Hazard tagged on “${b.title}”: Heat`;
		expect(await to(maker, t)).toEqual([tagged]);
		expect(await to(watcher, t)).toEqual([tagged]);
		expect(await to(quiet, t)).toEqual([tagged]); // hazard mail is still on for them
		expect(await to(reviewerWatching, t)).toEqual([]); // they tagged it

		t = await mark();
		await addressFlag(maker, flagId, 'Added a silicone pad and a shoulder washer.');
		const fixed = `Hazard tag marked fixed on “${b.title}”: Heat`;
		expect(await to(reviewerWatching, t)).toEqual([fixed]); // hung the tag and watches: one mail
		expect(await to(watcher, t)).toEqual([fixed]);
		expect(await to(maker, t)).toEqual([]);

		t = await mark();
		await setFlagState(reviewer, flagId, 'resolve', { note: 'Measured open circuit tab to chassis.' });
		const cleared = `Hazard tag cleared on “${b.title}”: Heat`;
		expect(await to(maker, t)).toEqual([cleared]);
		expect(await to(watcher, t)).toEqual([cleared]);
		expect(await to(reviewerWatching, t)).toEqual([cleared]);
		expect(await to(reviewer, t)).toEqual([]);

		t = await mark();
		const { revision } = await submitReview(reviewerWatching, b.id, { verdict: 'rework', summary: 'Add a fuse holder cover before the sign-off.' });
		const sentBack = `Sent back for changes at ${revisionLabel(revision)}: “${b.title}”`;
		expect(await to(maker, t)).toEqual([sentBack]);
		expect(await to(watcher, t)).toEqual([sentBack]);
		expect(await to(quiet, t)).toEqual([sentBack]);
		expect(await to(reviewerWatching, t)).toEqual([]);
	});

	it('review mail turned off: a watcher gets nothing for a sign-off; an unwatched member gets nothing at all', async () => {
		await db.update(schema.user).set({ notifyReview: false }).where(eq(schema.user.id, quiet.id));
		await unwatchBuild(watcher, b.slug);
		const t = await mark();
		await submitReview(reviewer, b.id, { verdict: 'rework', summary: 'Agree: the fuse holder needs its cover.' });
		expect(await to(quiet, t)).toEqual([]);
		expect(await to(watcher, t)).toEqual([]);
		expect(await to(reviewerWatching, t)).toHaveLength(1);
		expect(await to(maker, t)).toHaveLength(1);
	});

	it('a suspended watcher gets no mail', async () => {
		await db.update(schema.user).set({ suspendedAt: new Date() }).where(eq(schema.user.id, reviewerWatching.id));
		const t = await mark();
		await postComment(stranger, ref(), { body: 'Nice build.' });
		expect(await to(reviewerWatching, t)).toEqual([]);
		expect(await to(maker, t)).toEqual([`New comment on “${b.title}”`]);
		await db.update(schema.user).set({ suspendedAt: null }).where(eq(schema.user.id, reviewerWatching.id));
	});
});
