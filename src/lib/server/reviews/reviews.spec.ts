// Integration (real PostgreSQL): flag lifecycle and who may move it, verdicts pinned to revisions, the
// review desk, and notification opt-outs (nothing queued when a member turned a kind off).
import { revisionLabel } from '$lib/revision-label';
import { CHECKLIST_ITEMS } from '$lib/review-checklist';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { addStep, publishRevision } from '../builds';
import { saveSpecBlock } from '../specs';
import { stopMail } from '../mail';
import { useTestUsers } from '../testing/builds';
import { createPublishedBuild, emailOf, queuedMailTo, SUPPLY_DATA, type TestBuild } from '../testing/reviews';
import {
	addressFlag,
	getFlagMarkers,
	getReviewPanel,
	getReviewState,
	getReviewStates,
	listWaiting,
	raiseFlag,
	requestReview,
	reviewLabelText,
	setFlagState,
	submitReview
} from './index';

const { owner, other, reviewer, reviewer2, moderator, notified } = useTestUsers({
	owner: ['maker', 'Owner'],
	other: ['maker', 'Other'],
	reviewer: ['reviewer', 'Reviewer'],
	reviewer2: ['reviewer', 'Second reviewer'],
	moderator: ['moderator', 'Moderator'],
	notified: ['maker', 'Notified']
});
let build: TestBuild;

beforeAll(async () => {
	build = await createPublishedBuild(owner);
});

afterAll(() => stopMail());

const flagInput = (targetId: string, kind: 'step' | 'spec' | 'part' = 'step') => ({
	targetKind: kind,
	targetId,
	category: 'heat' as const,
	severity: 'fix' as const,
	note: 'The tab sits at V− and the heatsink is bonded to the chassis: add an insulator.'
});

describe('hazard tags (code: flags): who may tag and move them', () => {
	it('only reviewers who are not the maker tag hazards, on targets of the same build', async () => {
		await expect(raiseFlag(other, build.id, flagInput(build.steps.heatsink))).rejects.toMatchObject({ status: 403 });
		await expect(raiseFlag(owner, build.id, flagInput(build.steps.heatsink))).rejects.toMatchObject({ status: 403 });
		// A reviewer's own build: never reviewable by them.
		const ownReviewerBuild = await createPublishedBuild(reviewer2);
		await expect(raiseFlag(reviewer2, ownReviewerBuild.id, flagInput(ownReviewerBuild.steps.heatsink))).rejects.toMatchObject({
			status: 403
		});
		// A target of another build is refused.
		await expect(raiseFlag(reviewer, build.id, flagInput(ownReviewerBuild.steps.heatsink))).rejects.toMatchObject({ status: 422 });
	});

	it('tagged → fixed (maker only) → cleared (reviewer only) → re-tagged → fixed again', async () => {
		const id = await raiseFlag(reviewer, build.id, flagInput(build.steps.heatsink), { notify: false });
		const state = async () => (await db.select().from(schema.safetyFlag).where(eq(schema.safetyFlag.id, id)))[0];
		expect((await state()).state).toBe('open');
		expect((await state()).revision).toBe((await getReviewState(build.id)).currentRevision);
		expect((await getFlagMarkers(build.id)).get(build.steps.heatsink)).toBe(1);

		// Nobody but the maker addresses; reviewers do not resolve their way around the maker's note… but may resolve directly.
		await expect(addressFlag(reviewer, id, 'Fixed it')).rejects.toMatchObject({ status: 403 });
		await expect(addressFlag(other, id, 'Fixed it')).rejects.toMatchObject({ status: 403 });
		await expect(addressFlag(owner, id, 'x')).rejects.toThrow();
		await addressFlag(owner, id, 'Added a mica insulator and a shoulder washer; measured open circuit tab to chassis.');
		expect((await state()).state).toBe('addressed');
		expect((await state()).addressedNote).toContain('mica');
		await expect(addressFlag(owner, id, 'again, please')).rejects.toMatchObject({ status: 409 });

		// The maker cannot resolve their own flags; a maker without the role cannot either.
		await expect(setFlagState(owner, id, 'resolve')).rejects.toMatchObject({ status: 403 });
		await expect(setFlagState(other, id, 'resolve')).rejects.toMatchObject({ status: 403 });
		await setFlagState(reviewer2, id, 'resolve');
		const resolved = await state();
		expect(resolved.state).toBe('resolved');
		expect(resolved.resolvedById).toBe(reviewer2.id);
		await expect(setFlagState(reviewer, id, 'resolve')).rejects.toMatchObject({ status: 409 });
		expect((await getFlagMarkers(build.id)).get(build.steps.heatsink)).toBeUndefined();

		await setFlagState(moderator, id, 'reopen');
		expect((await state()).state).toBe('open');
		expect((await state()).resolvedById).toBeNull();
		await expect(setFlagState(reviewer, id, 'reopen')).rejects.toMatchObject({ status: 409 });
		await addressFlag(owner, id, 'Replaced the insulator with a thicker one.');
		expect((await state()).state).toBe('addressed');

		const audit = await db.select().from(schema.auditEntry).where(eq(schema.auditEntry.targetId, id));
		expect(audit.map((a) => a.action).sort()).toEqual(['flag.raise', 'flag.reopen', 'flag.resolve']);
		// Leave it resolved for the verdict tests.
		await setFlagState(reviewer, id, 'resolve');
	});

	it('the maker cannot mark hazard tags fixed while a moderator has locked the build', async () => {
		const id = await raiseFlag(reviewer, build.id, flagInput(build.supplyBlockId, 'spec'), { notify: false });
		await db.update(schema.build).set({ locked: true, lockedReason: 'test' }).where(eq(schema.build.id, build.id));
		try {
			await expect(addressFlag(owner, id, 'Changed the fuse to T2A.')).rejects.toMatchObject({ status: 403 });
		} finally {
			await db.update(schema.build).set({ locked: false, lockedReason: null }).where(eq(schema.build.id, build.id));
		}
		await setFlagState(reviewer, id, 'resolve');
	});
});

describe('sign-offs and send-backs pinned to revisions', () => {
	it('sent back at Rev A, the build is edited, it returns to the desk, signed off only once tags are cleared', async () => {
		const r0 = await getReviewState(build.id);
		expect(r0.verdict).toBeNull();

		expect(await requestReview(owner, build.id)).toBe('queued');
		expect(await requestReview(owner, build.id)).toBe('already-waiting');
		await expect(requestReview(other, build.id)).rejects.toMatchObject({ status: 403 });
		let s = await getReviewState(build.id);
		expect(s.label).toBe('waiting');
		expect(reviewLabelText(s)).toBe('Waiting for review');
		expect((await listWaiting()).some((w) => w.id === build.id)).toBe(true);
		const desk = (await listWaiting()).find((w) => w.id === build.id)!;
		expect(desk.mainsPowered).toBe(true);

		const rev1 = s.currentRevision;
		const flag = await raiseFlag(reviewer, build.id, flagInput(build.steps.heatsink), { notify: false });
		await expect(submitReview(owner, build.id, { verdict: 'safe', summary: 'Looks fine to me, honestly.' })).rejects.toMatchObject({
			status: 403
		});
		await expect(submitReview(reviewer, build.id, { verdict: 'safe', summary: 'Everything checks out nicely.' })).rejects.toMatchObject({
			status: 409
		});
		await submitReview(reviewer, build.id, { verdict: 'rework', summary: 'Insulate the tab before powering up.' }, { notify: false });

		s = await getReviewState(build.id);
		expect(s).toMatchObject({ label: 'rework', verdict: 'rework', verdictRevision: rev1, waiting: false, openFlags: 1 });
		expect(reviewLabelText(s)).toBe(`Sent back for changes at ${revisionLabel(rev1)}`);
		const [row] = await db.select().from(schema.build).where(eq(schema.build.id, build.id));
		expect(row.reviewRequestedAt).toBeNull();
		expect(row.lastReviewedAt).not.toBeNull();
		expect((await listWaiting()).some((w) => w.id === build.id)).toBe(false);

		// The maker changes the build and publishes the change as Rev B; the send-back stays with Rev A.
		await addressFlag(owner, flag, 'Insulator fitted, see the new step.');
		await addStep(owner, build.id, { title: 'Tab insulation', bodyMd: 'Mica, grease, shoulder washer.' });
		// An edit alone is a pending change: the verdict still belongs to the current revision.
		expect((await getReviewState(build.id)).label).toBe('rework');
		await publishRevision(owner, build.id, 'Tab insulation step added');
		s = await getReviewState(build.id);
		expect(s.currentRevision).toBe(rev1 + 1);
		expect(s).toMatchObject({ label: 'rework-changed', verdictRevision: rev1 });
		expect(reviewLabelText(s)).toBe(`Edited since send-back at ${revisionLabel(rev1)}`);

		await requestReview(owner, build.id);
		s = await getReviewState(build.id);
		expect(s.waiting).toBe(true);
		expect(reviewLabelText(s)).toBe(`Edited since send-back at ${revisionLabel(rev1)} · waiting for review`);
		expect((await listWaiting()).find((w) => w.id === build.id)?.previous).toEqual({ verdict: 'rework', revision: rev1 });

		await setFlagState(reviewer, flag, 'resolve');
		// A mains build: the checklist must be ticked (or the unticked items explained) for a sign-off.
		const ALL = CHECKLIST_ITEMS.map((i) => i.key);
		await expect(
			submitReview(reviewer, build.id, { verdict: 'safe', summary: 'Tab insulated, fuse right, earth bonded.', checklist: ALL.slice(1) }, { notify: false })
		).rejects.toMatchObject({ status: 422 });
		const review = await submitReview(reviewer, build.id, { verdict: 'safe', summary: 'Tab insulated, fuse right, earth bonded.', checklist: ALL }, { notify: false });
		expect(review.revision).toBe(rev1 + 1);
		s = (await getReviewStates([build.id])).get(build.id)!;
		expect(s).toMatchObject({ label: 'safe', verdict: 'safe', verdictRevision: rev1 + 1, waiting: false, openFlags: 0 });
		expect(s.reviewer?.name).toContain('Reviewer');
		expect(reviewLabelText(s)).toBe(`Signed off as safe at ${revisionLabel(rev1 + 1)}`);

		// A further change, once published as a revision, makes it "edited since sign-off".
		await addStep(owner, build.id, { title: 'Listening notes', bodyMd: 'Quiet at idle.' });
		expect((await getReviewState(build.id)).label).toBe('safe');
		await publishRevision(owner, build.id, 'Listening notes');
		s = await getReviewState(build.id);
		expect(s.label).toBe('safe-changed');
		expect(reviewLabelText(s)).toBe(`Edited since sign-off at ${revisionLabel(rev1 + 1)}`);

		const panel = await getReviewPanel(build.id, owner);
		expect(panel.reviews.map((r) => [r.verdict, r.revision])).toEqual([
			['safe', rev1 + 1],
			['rework', rev1]
		]);
		expect(panel.can).toMatchObject({ requestReview: true, review: false, address: true, resolve: false });
		expect((await getReviewPanel(build.id, reviewer)).can).toMatchObject({ requestReview: false, review: true, resolve: true });
		expect((await getReviewPanel(build.id, null)).can).toMatchObject({ requestReview: false, review: false, address: false, resolve: false });
	});
});

describe('review desk', () => {
	it('lists waiting builds oldest first with their danger and caution check counts', async () => {
		const first = await createPublishedBuild(other);
		const second = await createPublishedBuild(other);
		// No primary fuse on a mains supply: a danger check on the second build.
		const saved = await saveSpecBlock(other, second.id, { id: second.supplyBlockId, kind: 'supply', title: 'Main supply', data: { ...SUPPLY_DATA, fuse: null } });
		expect(saved.ok).toBe(true);
		// Published as a revision: the desk counts the published revision (what a review is of), not pending edits.
		await publishRevision(other, second.id, 'Fuse left out.');
		await requestReview(other, first.id);
		await requestReview(other, second.id);
		const desk = await listWaiting();
		const i1 = desk.findIndex((w) => w.id === first.id);
		const i2 = desk.findIndex((w) => w.id === second.id);
		expect(i1).toBeGreaterThanOrEqual(0);
		expect(i2).toBeGreaterThan(i1);
		expect(desk[i1].dangerChecks).toBe(0);
		expect(desk[i2].dangerChecks).toBeGreaterThanOrEqual(1);
		expect(desk[i2]).toMatchObject({ mainsPowered: true, maker: { id: other.id } });
	});
});

describe('notifications respect the opt-outs', () => {
	it('queues review and hazard tag mail for the maker only while those kinds are on', async () => {
		const maker = notified;
		const b = await createPublishedBuild(maker);
		const email = await emailOf(maker.id);
		const t0 = new Date(Date.now() - 1000);

		await raiseFlag({ ...reviewer, name: 'Reviewer R' }, b.id, flagInput(b.steps.heatsink));
		let mail = await queuedMailTo(email, t0);
		expect(mail.map((m) => m.subject)).toEqual([`Hazard tagged on “${b.title}”: Heat`]);

		await db.update(schema.user).set({ notifyFlag: false, notifyReview: false }).where(eq(schema.user.id, maker.id));
		const t1 = new Date();
		await raiseFlag(reviewer, b.id, flagInput(b.supplyBlockId, 'spec'));
		await submitReview(reviewer, b.id, { verdict: 'rework', summary: 'Two flags to deal with first.' });
		mail = await queuedMailTo(email, t1);
		expect(mail).toEqual([]);

		await db.update(schema.user).set({ notifyReview: true }).where(eq(schema.user.id, maker.id));
		await submitReview(reviewer2, b.id, { verdict: 'rework', summary: 'Agree with the flags raised.' });
		mail = await queuedMailTo(email, t1);
		expect(mail.map((m) => m.subject)).toEqual([`Sent back for changes at ${revisionLabel((await getReviewState(b.id)).currentRevision)}: “${b.title}”`]);
	});
});
