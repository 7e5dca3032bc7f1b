// Integration (real PostgreSQL): the review page shows the published revision the verdict is pinned to, and the
// maker's unpublished edits only as a separate "pending changes" diff — never mixed into what is reviewed.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { addStep, getBuildBySlug, publishRevision, updateStep } from '../builds';
import { createTestUser, removeTestUsers } from '../testing/builds';
import { createPublishedBuild } from '../testing/reviews';
import { reviewedContent } from './index';

type U = Awaited<ReturnType<typeof createTestUser>>;
let maker: U, reviewer: U;
beforeAll(async () => {
	maker = await createTestUser('maker', 'Pinned maker');
	reviewer = await createTestUser('reviewer', 'Pinned reviewer');
});
afterAll(() => removeTestUsers([maker.id, reviewer.id]));

describe('reviewedContent', () => {
	it('shows the published revision; pending edits come apart as a diff, and join the content only once published', async () => {
		const t = await createPublishedBuild(maker);
		const row = async () => (await getBuildBySlug(t.slug))!;
		let r = await reviewedContent(await row(), reviewer);
		expect(r.pinned).toBe((await row()).revision);
		expect(r.pending).toBeNull();
		expect(r.content.steps.map((s) => s.title)).toEqual(['Mains inlet and fuse', 'Heatsink and mounting']);

		// The maker edits without publishing: a new step and a changed one.
		await addStep(maker, t.id, { title: 'Soft start', bodyMd: 'An NTC thermistor in series with the primary.' });
		await updateStep(maker, t.steps.wiring, { title: 'Mains inlet, fuse and switch', bodyMd: 'Fused IEC inlet with a switch; earth to the chassis stud.' });
		await db.update(schema.build).set({ title: 'Renamed while pending' }).where(eq(schema.build.id, t.id));
		r = await reviewedContent(await row(), reviewer);
		// What is reviewed is unchanged: the published steps and title.
		expect(r.content.steps.map((s) => s.title)).toEqual(['Mains inlet and fuse', 'Heatsink and mounting']);
		expect(r.build.title).toBe(t.title);
		// The pending changes: listed apart, from the pinned revision.
		expect(r.pending).not.toBeNull();
		expect(r.pending!.from).toBe(r.pinned);
		expect(r.pending!.summary.join(' ')).toMatch(/step/);
		const byStatus = Object.fromEntries(r.pending!.diff.steps.map((s) => [s.title, s.status]));
		expect(byStatus['Soft start']).toBe('added');
		expect(byStatus['Mains inlet, fuse and switch']).toBe('changed');

		// Published: the edits become the reviewed revision and nothing is pending any more.
		const rev = await publishRevision(maker, t.id, 'Soft start and a mains switch.');
		r = await reviewedContent(await row(), reviewer);
		expect(r.pinned).toBe(rev.number);
		expect(r.pending).toBeNull();
		expect(r.content.steps.map((s) => s.title)).toContain('Soft start');
	});
});
