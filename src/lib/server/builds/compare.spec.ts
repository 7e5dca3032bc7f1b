// Integration tests against the real PostgreSQL of DATABASE_URL: comparing any two builds a viewer may see.
import { describe, it, expect } from 'vitest';
import { useTestUsers } from '../testing/builds';
import { statusOf, testBuild, AMP } from '../testing/parts';
import { saveSpecBlock } from '../specs';
import { savePartsList } from '../parts';
import { derive } from './index';
import { compareBuilds, slugFromInput } from './compare';
import { emptyDraft } from '$lib/parts';

const { maker, other, admin } = useTestUsers({ maker: ['maker', 'Compare maker'], other: ['maker', 'Compare other'], admin: ['admin', 'Compare admin'] });

describe('compareBuilds', () => {
	it('puts any two visible builds side by side with their parts and spec blocks', async () => {
		const a = await testBuild(maker.id, { published: true });
		const b = await testBuild(other.id, { published: true });
		await saveSpecBlock(other, b.id, { kind: 'amplifier', data: AMP });
		await savePartsList(other, b.id, [{ ...emptyDraft(), designators: 'R1', kind: 'resistor', value: '4k7' }]);
		// Seen by b's maker: b's live content (a reader sees its published revision, tested below).
		const r = await compareBuilds(a.slug, b.slug, { id: other.id, role: 'maker' });
		expect(r.left.build.slug).toBe(a.slug);
		expect(r.right!.build.slug).toBe(b.slug);
		expect(r.basedOn).toBe(false);
		expect(r.right!.parts.map((p) => p.valueText)).toEqual(['4k7']);
		expect(r.right!.specBlocks.map((s) => s.kind)).toEqual(['amplifier']);
		expect(r.left.specBlocks).toEqual([]);
	});

	it('shows a draft only to those who may see it, and refuses the same build twice', async () => {
		const pub = await testBuild(maker.id, { published: true });
		const draft = await testBuild(other.id);
		expect(await statusOf(compareBuilds(pub.slug, draft.slug, { id: maker.id, role: 'maker' }))).toBe(404);
		expect(await statusOf(compareBuilds(pub.slug, draft.slug, null))).toBe(404);
		expect(await statusOf(compareBuilds(draft.slug, pub.slug, null))).toBe(404);
		expect((await compareBuilds(pub.slug, draft.slug, { id: other.id, role: 'maker' })).right!.build.status).toBe('draft');
		expect((await compareBuilds(pub.slug, draft.slug, { id: admin.id, role: 'admin' })).right!.build.slug).toBe(draft.slug);
		expect(await statusOf(compareBuilds(pub.slug, pub.slug, null))).toBe(400);
	});

	it('without a second build: the one it is based on, else nothing', async () => {
		const origin = await testBuild(maker.id, { published: true });
		const { slug } = await derive({ id: other.id, role: 'maker' }, origin.id);
		const r = await compareBuilds(slug, null, { id: other.id, role: 'maker' });
		expect(r.basedOn).toBe(true);
		expect(r.right!.build.slug).toBe(origin.slug);
		expect((await compareBuilds(origin.slug, null, null)).right).toBeNull();
		// Named explicitly, the origin is still recognised as what the build is based on.
		expect((await compareBuilds(slug, origin.slug, { id: other.id, role: 'maker' })).basedOn).toBe(true);
	});
});

describe('compareBuilds and pending changes', () => {
	it('shows readers the published parts list and the maker the live one', async () => {
		const a = await testBuild(maker.id, { published: true });
		const b = await testBuild(other.id, { published: true });
		await savePartsList(other, b.id, [{ ...emptyDraft(), designators: 'R1', kind: 'resistor', value: '10k' }]);
		expect((await compareBuilds(a.slug, b.slug, null)).right!.parts).toEqual([]);
		expect((await compareBuilds(a.slug, b.slug, { id: other.id, role: 'maker' })).right!.parts.map((p) => p.valueText)).toEqual(['10k']);
	});
});

describe('slugFromInput', () => {
	it('reads a short name, a path or a full address', () => {
		expect(slugFromInput('quiet-amp')).toBe('quiet-amp');
		expect(slugFromInput('/builds/quiet-amp')).toBe('quiet-amp');
		expect(slugFromInput('https://starground.example/builds/Quiet-Amp/compare?with=x')).toBe('quiet-amp');
		expect(slugFromInput('not a build')).toBeNull();
		expect(slugFromInput('')).toBeNull();
	});
});
