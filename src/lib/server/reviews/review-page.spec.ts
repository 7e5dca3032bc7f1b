// Integration (real PostgreSQL): what the review page and the build page show around a verdict — the mains
// checklist stored with it (and the rule for signing off with items unticked), the changes since the last
// sign-off on a re-review, and hazard tag threads with a note on clearing and mail to the other side.
import { afterAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { stopMail } from '../mail';
import { addStep, publishRevision } from '../builds';
import { saveSpecBlock } from '../specs';
import { useTestUsers } from '../testing/builds';
import { createPublishedBuild, emailOf, queuedMailTo, SUPPLY_DATA } from '../testing/reviews';
import { CHECKLIST_ITEMS } from '$lib/review-checklist';
import { changesSinceVerdict, getReviewPanel, postFlagMessage, raiseFlag, requestReview, setFlagState, submitReview } from './index';

const { maker, other, reviewer, reviewer2 } = useTestUsers({
	maker: ['maker', 'Page maker'],
	other: ['maker', 'Page other'],
	reviewer: ['reviewer', 'Page reviewer'],
	reviewer2: ['reviewer', 'Page reviewer two']
});
const ALL = CHECKLIST_ITEMS.map((i) => i.key);

afterAll(() => stopMail());

describe('mains checklist with the sign-off or send-back', () => {
	it('six items, each with a source; a sign-off with unticked items needs the reviewer to say why', () => {
		expect(ALL).toEqual(['pe-continuity', 'live-fuse', 'mains-insulation', 'creepage-clearance', 'reservoir-discharge', 'heatsink-isolation']);
		for (const i of CHECKLIST_ITEMS) expect(i.source.length).toBeGreaterThan(10);
	});

	it('stores the ticked list on a mains sign-off and shows it in the build page panel', async () => {
		const b = await createPublishedBuild(maker);
		await requestReview(maker, b.id);
		const summary = 'Earth bond measured, fuse in the live, tabs insulated.';
		await expect(submitReview(reviewer, b.id, { verdict: 'safe', summary, checklist: ['pe-continuity'] }, { notify: false })).rejects.toMatchObject({
			status: 422
		});
		// A note that is too short does not count as a reason.
		await expect(
			submitReview(reviewer, b.id, { verdict: 'safe', summary, checklist: ['pe-continuity'], checklistNote: 'n/a' }, { notify: false })
		).rejects.toMatchObject({ status: 422 });
		// Unknown keys are refused by the schema.
		await expect(submitReview(reviewer, b.id, { verdict: 'safe', summary, checklist: ['looks-fine' as never] }, { notify: false })).rejects.toThrow();

		const why = 'No heatsink in this build (class D module); reservoir caps are 470 µF only.';
		await submitReview(reviewer, b.id, { verdict: 'safe', summary, checklist: ALL.filter((k) => k !== 'heatsink-isolation'), checklistNote: why }, { notify: false });
		const panel = await getReviewPanel(b.id, null);
		expect(panel.reviews[0].checklist).toEqual(ALL.map((key) => ({ key, ticked: key !== 'heatsink-isolation' })));
		expect(panel.reviews[0].checklistNote).toBe(why);
	});

	it('a send-back stores what was ticked with no note needed; a build without mains stores no checklist', async () => {
		const b = await createPublishedBuild(maker);
		await submitReview(reviewer, b.id, { verdict: 'rework', summary: 'Fuse is in the neutral; move it.', checklist: ['pe-continuity'] }, { notify: false });
		expect((await getReviewPanel(b.id, null)).reviews[0].checklist.filter((c) => c.ticked).map((c) => c.key)).toEqual(['pe-continuity']);
		// A send-back with nothing ticked stores no checklist (nothing to show on the build page).
		await submitReview(reviewer2, b.id, { verdict: 'rework', summary: 'Agree: the fuse goes in the live.' }, { notify: false });
		expect((await getReviewPanel(b.id, null)).reviews[0].checklist).toEqual([]);

		const low = await createPublishedBuild(maker);
		await db.update(schema.build).set({ mainsPowered: false }).where(eq(schema.build.id, low.id));
		await submitReview(reviewer, low.id, { verdict: 'safe', summary: 'Battery powered, nothing to worry about.', checklist: ALL }, { notify: false });
		const r = (await getReviewPanel(low.id, null)).reviews[0];
		expect(r.checklist).toEqual([]);
		expect(r.checklistNote).toBe('');
	});
});

describe('re-review: what changed since the sign-off', () => {
	it('diffs the revision last signed off against the current one (steps, spec values)', async () => {
		const b = await createPublishedBuild(maker);
		const [{ revision: r1 }] = await db.select({ revision: schema.build.revision }).from(schema.build).where(eq(schema.build.id, b.id));
		expect(await changesSinceVerdict(b.id, r1)).toBeNull();
		await submitReview(reviewer, b.id, { verdict: 'safe', summary: 'All good at the first revision.', checklist: ALL }, { notify: false });
		expect(await changesSinceVerdict(b.id, r1)).toBeNull();

		await addStep(maker, b.id, { title: 'Soft start relay', bodyMd: 'A 10 Ω resistor bypassed after 2 s.' });
		const saved = await saveSpecBlock(maker, b.id, { id: b.supplyBlockId, kind: 'supply', title: 'Main supply', data: { ...SUPPLY_DATA, fuse: null } });
		expect(saved.ok).toBe(true);
		const rev2 = await publishRevision(maker, b.id, 'Soft start, fuse moved');
		// A later send-back does not move the base: the diff starts at the last sign-off.
		await submitReview(reviewer2, b.id, { verdict: 'rework', summary: 'The supply fuse went missing.' }, { notify: false });

		const since = (await changesSinceVerdict(b.id, rev2.number))!;
		expect(since).toMatchObject({ verdict: 'safe', from: r1, to: rev2.number });
		expect(since.diff.steps.filter((s) => s.status === 'added').map((s) => s.title)).toEqual(['Soft start relay']);
		const supply = since.diff.specBlocks.find((s) => s.status === 'changed')!;
		expect(supply.fields.some((f) => f.name.startsWith('fuse'))).toBe(true);
	});
});

describe('hazard tag threads and clearing notes', () => {
	it('maker and reviewers write; others cannot; the other side is mailed; clearing keeps its note', async () => {
		const b = await createPublishedBuild(maker);
		const flag = await raiseFlag(reviewer, b.id, {
			targetKind: 'step',
			targetId: b.steps.heatsink,
			category: 'heat',
			severity: 'fix',
			note: 'Is the tab insulated from the heatsink?'
		}, { notify: false });
		const t0 = new Date(Date.now() - 1000);
		const [makerMail, reviewerMail] = await Promise.all([emailOf(maker.id), emailOf(reviewer.id)]);

		await expect(postFlagMessage(other, flag, 'Drive-by comment')).rejects.toMatchObject({ status: 403 });
		await expect(postFlagMessage(maker, flag, '   ')).rejects.toThrow();
		await postFlagMessage(maker, flag, 'Yes: a **silicone pad**\u0000 and a shoulder washer. Photo in step 2.');
		await postFlagMessage(reviewer2, flag, 'Did you measure tab to chassis with the meter?');

		const thread = (await getReviewPanel(b.id, maker)).flags.find((f) => f.id === flag)!.messages;
		expect(thread.map((m) => m.byMaker)).toEqual([true, false]);
		expect(thread[0].bodyHtml).toContain('<strong>silicone pad</strong>');
		expect(thread[0].bodyHtml).not.toContain('\u0000');
		expect((await queuedMailTo(reviewerMail, t0)).map((m) => m.subject)).toEqual([`New message on a hazard tag on “${b.title}”`]);
		expect((await queuedMailTo(makerMail, t0)).map((m) => m.subject)).toEqual([`New message on a hazard tag on “${b.title}”`]);

		// The maker turned hazard-tag mail off: clearing it queues nothing, but the note is kept.
		await db.update(schema.user).set({ notifyFlag: false }).where(eq(schema.user.id, maker.id));
		await setFlagState(reviewer2, flag, 'resolve', { note: 'Measured open circuit on the 2 kΩ range; pad is fine.' });
		let f = (await getReviewPanel(b.id, null)).flags.find((x) => x.id === flag)!;
		expect(f.state).toBe('resolved');
		expect(f.resolvedNote).toBe('Measured open circuit on the 2 kΩ range; pad is fine.');
		expect(await queuedMailTo(makerMail, t0)).toHaveLength(1);

		await db.update(schema.user).set({ notifyFlag: true }).where(eq(schema.user.id, maker.id));
		await setFlagState(reviewer, flag, 'reopen');
		f = (await getReviewPanel(b.id, null)).flags.find((x) => x.id === flag)!;
		expect(f.resolvedNote).toBe('');
		expect((await queuedMailTo(makerMail, t0)).map((m) => m.subject).at(-1)).toBe(`Hazard tagged again on “${b.title}”: Heat`);

		// A locked build: nobody writes on its tags.
		await db.update(schema.build).set({ locked: true, lockedReason: 'test' }).where(eq(schema.build.id, b.id));
		await expect(postFlagMessage(maker, flag, 'Can I still answer?')).rejects.toMatchObject({ status: 403 });
	});
});
