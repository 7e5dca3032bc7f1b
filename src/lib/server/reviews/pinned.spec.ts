// Integration (real PostgreSQL): the review page shows the published revision the verdict is pinned to, and the
// maker's unpublished edits only as a separate "pending changes" diff — never mixed into what is reviewed.
import { afterAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { addStep, getBuildBySlug, loadBuildContent, publishRevision, updateStep } from '../builds';
import type { BuildContent } from '../builds/queries';
import { saveSpecBlock } from '../specs';
import { useTestUsers } from '../testing/builds';
import { createPublishedBuild, SUPPLY_DATA } from '../testing/reviews';
import { stopMail } from '../mail';
import { deskQuerySchema, listDesk, requestReview, reviewedContent, sendReviewDigest, setFollowedCategories } from './index';

const { maker, reviewer } = useTestUsers({ maker: ['maker', 'Pinned maker'], reviewer: ['reviewer', 'Pinned reviewer'] });
afterAll(() => stopMail());

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

describe('the review desk and the review page count the same revision', () => {
	/** DANGER and CAUTION checks in content, counted as the review page counts them (spec blocks + parts lines). */
	const counts = (c: BuildContent) => {
		const all = [...c.specBlocks.flatMap((s) => s.checks), ...c.parts.flatMap((p) => p.checks)];
		return { danger: all.filter((x) => x.level === 'danger').length, caution: all.filter((x) => x.level === 'caution').length };
	};
	const deskRow = async (id: string) => (await listDesk(deskQuerySchema.parse({}), null, 1000)).items.find((w) => w.id === id)!;

	it('pending edits move neither; publishing them as a revision moves both', async () => {
		const t = await createPublishedBuild(maker);
		const row = async () => (await getBuildBySlug(t.slug))!;
		// The reviewer follows the category first (a digest lists the requests made since following).
		await setFollowedCategories(reviewer, ['power-amp']);
		await requestReview(maker, t.id);
		const published = counts((await reviewedContent(await row(), reviewer)).content);
		let desk = await deskRow(t.id);
		expect({ danger: desk.dangerChecks, caution: desk.cautionChecks }).toEqual(published);
		expect(desk.pendingChanges).toBe(false);

		// The maker removes the fuse from the supply block (supply.no-fuse, DANGER: DEVELOPERS.md, supply.spec.ts),
		// turns mains off and renames the build, without publishing.
		const saved = await saveSpecBlock(maker, t.id, { id: t.supplyBlockId, kind: 'supply', title: 'Main supply', data: { ...SUPPLY_DATA, fuse: null } });
		expect(saved.ok).toBe(true);
		await db.update(schema.build).set({ mainsPowered: false, title: 'Renamed while waiting' }).where(eq(schema.build.id, t.id));
		const live = counts(await loadBuildContent(await row()));
		expect(live.danger).toBeGreaterThan(published.danger);

		// The review page still shows the published revision; so does the desk (before the fix it counted the live rows).
		const page = await reviewedContent(await row(), reviewer);
		expect(counts(page.content)).toEqual(published);
		desk = await deskRow(t.id);
		expect({ danger: desk.dangerChecks, caution: desk.cautionChecks }).toEqual(published);
		expect(desk.mainsPowered).toBe(page.build.mainsPowered);
		expect(desk.mainsPowered).toBe(true);
		expect(desk.title).toBe(page.build.title);
		expect(desk.revision).toBe(page.pinned);
		expect(desk.pendingChanges).toBe(true);
		// The mains filter follows the published revision too.
		expect((await listDesk(deskQuerySchema.parse({ mains: true }), null, 1000)).items.map((w) => w.id)).toContain(t.id);
		// So does the desk digest: it names the published title, with its DANGER count.
		const jobId = await sendReviewDigest(reviewer.id);
		expect(jobId).not.toBeNull();
		const [job] = [...(await db.execute<{ text: string }>(sql`select data->>'text' as text from pgboss.job where id = ${jobId}::uuid`))];
		const line = job.text.split('\n').find((l) => l.includes(`/builds/${t.slug}/review`))!;
		expect(line).toContain(`“${t.title}”`);
		expect(line).not.toContain('Renamed while waiting');
		expect(line.includes('DANGER')).toBe(published.danger > 0);

		// Published as a revision: the desk counts what the review page now shows.
		await publishRevision(maker, t.id, 'Fuse left out for now; battery tests only.');
		const after = await reviewedContent(await row(), reviewer);
		expect(counts(after.content)).toEqual(live);
		desk = await deskRow(t.id);
		expect({ danger: desk.dangerChecks, caution: desk.cautionChecks }).toEqual(live);
		expect(desk).toMatchObject({ mainsPowered: false, title: 'Renamed while waiting', revision: after.pinned, pendingChanges: false });
	});
});
