import { afterAll, describe, expect, it } from 'vitest';
import { benchedIds, isOnBench, listBench, setOnBench } from './bench';
import { initials, getMakerProfile, reviewsGivenBy } from './members';
import { createMember, insertBuilds, insertReview, removeMembers } from './testing/discover';

const members: string[] = [];
afterAll(() => removeMembers(members));

describe('bench', () => {
	it('saves and removes idempotently, lists newest save first, refuses drafts and unknown builds', async () => {
		const maker = await createMember('maker', 'Bencher');
		const reader = await createMember('maker', 'Reader');
		members.push(maker.id, reader.id);
		const [one, two, draft] = await insertBuilds(maker.id, [{ title: 'One' }, { title: 'Two' }, { title: 'Draft', status: 'draft' }]);
		expect(await setOnBench(reader.id, one.slug, true)).toEqual({ slug: one.slug, saved: true });
		await new Promise((r) => setTimeout(r, 5));
		await setOnBench(reader.id, two.slug, true);
		await setOnBench(reader.id, two.slug, true); // twice is harmless
		expect((await listBench(reader.id)).map((r) => r.slug)).toEqual([two.slug, one.slug]);
		expect(await isOnBench(reader.id, one.id)).toBe(true);
		expect([...(await benchedIds(reader.id, [one.id, two.id, draft.id]))].sort()).toEqual([one.id, two.id].sort());
		expect(await setOnBench(reader.id, one.slug, false)).toEqual({ slug: one.slug, saved: false });
		await setOnBench(reader.id, one.slug, false);
		expect((await listBench(reader.id)).map((r) => r.slug)).toEqual([two.slug]);
		// Someone else's bench is their own.
		expect(await listBench(maker.id)).toEqual([]);
		await expect(setOnBench(reader.id, draft.slug, true)).rejects.toMatchObject({ status: 404 });
		await expect(setOnBench(maker.id, draft.slug, true)).rejects.toMatchObject({ status: 409 });
		await expect(setOnBench(reader.id, 'no-such-build-anywhere', true)).rejects.toMatchObject({ status: 404 });
	});
});

describe('maker profiles', () => {
	it('initials fall back sensibly', () => {
		expect(initials('  Ada  de Vries ')).toBe('AV');
		expect(initials('ravi')).toBe('R');
		expect(initials('')).toBe('?');
	});
	it('counts published builds and reviews on visible builds; unknown handles are 404', async () => {
		const maker = await createMember('maker', 'Profiled');
		const reviewer = await createMember('reviewer', 'Reviewing');
		members.push(maker.id, reviewer.id);
		const [pub, , draft] = await insertBuilds(maker.id, [{ title: 'P1' }, { title: 'P2' }, { title: 'D', status: 'draft' }]);
		await insertReview(pub.id, reviewer.id, 'safe', 1);
		await insertReview(draft.id, reviewer.id, 'rework', 0);
		const p = await getMakerProfile(maker.handle.toUpperCase());
		expect(p).toMatchObject({ handle: maker.handle, publishedCount: 2, reviewCount: 0, avatarUrl: null });
		const r = await getMakerProfile(reviewer.handle);
		expect(r.reviewCount).toBe(1);
		expect((await reviewsGivenBy(reviewer.id)).map((x) => [x.buildSlug, x.verdict])).toEqual([[pub.slug, 'safe']]);
		await expect(getMakerProfile('nobody-has-this-handle-xyz')).rejects.toMatchObject({ status: 404 });
		await expect(getMakerProfile('../etc')).rejects.toMatchObject({ status: 404 });
	});
});
