// Integration tests against the real PostgreSQL of DATABASE_URL: saving spec blocks, refusals that store
// nothing, owner checks, cross checks between blocks, revisions.
import { describe, it, expect } from 'vitest';
import { asc, eq } from 'drizzle-orm';
import { db } from './db';
import * as schema from './db/schema';
import { useTestUsers } from './testing/builds';
import { AMP, SUPPLY, statusOf, testBuild } from './testing/parts';
import { buildCrossChecks, deleteSpecBlock, moveSpecBlock, saveSpecBlock, validateSpec } from './specs';
import { pendingChanges, publishRevision } from './builds';

const { maker, other, admin } = useTestUsers({ maker: ['maker', 'Spec owner'], other: ['maker', 'Spec other'], admin: ['admin', 'Spec admin'] });

async function blocks(buildId: string) {
	return db.select().from(schema.specBlock).where(eq(schema.specBlock.buildId, buildId)).orderBy(asc(schema.specBlock.position));
}

describe('validateSpec', () => {
	it('returns field-level issues with dot paths and never throws for bad input', () => {
		const r = validateSpec('amplifier', { ...AMP, loadOhm: 0.1, device: { ...AMP.device, dropoutV: 40 } });
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.issues.map((i) => i.path).sort()).toEqual(['device.dropoutV', 'loadOhm']);
		expect(validateSpec('teapot', {})).toEqual({ ok: false, issues: [expect.objectContaining({ path: 'kind' })] });
		expect(validateSpec('supply', 'not an object').ok).toBe(false);
	});
});

describe('saveSpecBlock', () => {
	it('stores parsed data, derived values and checks', async () => {
		const b = await testBuild(maker.id);
		const r = await saveSpecBlock(maker, b.id, { kind: 'amplifier', title: 'Both channels', data: { ...AMP, claimed: { powerW: 60, thdPct: 1 } } });
		expect(r.ok).toBe(true);
		const [row] = await blocks(b.id);
		expect(row).toMatchObject({ kind: 'amplifier', title: 'Both channels', position: 0 });
		expect(row.derived.maxPowerW).toBeCloseTo((28 - 3) ** 2 / (2 * 8), 9);
		expect(row.checks.map((c) => c.id)).toContain('amp.power-beyond-rails');
		// Parsed: the schema's output, e.g. absent optional groups stay absent, unknown keys dropped.
		const again = await saveSpecBlock(maker, b.id, { id: row.id, kind: 'amplifier', data: { ...AMP, colour: 'red' } });
		expect(again.ok).toBe(true);
		const [changed] = await blocks(b.id);
		expect(changed.data).not.toHaveProperty('colour');
		expect(changed.checks.map((c) => c.id)).not.toContain('amp.power-beyond-rails');
	});

	it('a save over a block changed since it was loaded is refused with the stored block; nothing is written', async () => {
		const b = await testBuild(maker.id);
		const first = await saveSpecBlock(maker, b.id, { kind: 'supply', title: 'Mine', data: SUPPLY });
		if (!first.ok) throw new Error('not saved');
		const loaded = first.version;
		const other = await saveSpecBlock(maker, b.id, { id: first.id, kind: 'supply', title: 'Other tab', data: { ...SUPPLY, capRatingV: 63 } }, undefined, loaded);
		expect(other.ok).toBe(true);
		const stale = await saveSpecBlock(maker, b.id, { id: first.id, kind: 'supply', title: 'Mine again', data: { ...SUPPLY, loadCurrentA: 2 } }, undefined, loaded);
		expect(stale.ok).toBe(false);
		if (stale.ok || !stale.conflict) throw new Error('expected a conflict');
		expect(stale.conflict).toMatchObject({ title: 'Other tab', data: { capRatingV: 63 } });
		const [row] = await blocks(b.id);
		expect(row.title).toBe('Other tab');
		// Saving again from the stored version replaces it on purpose.
		const again = await saveSpecBlock(maker, b.id, { id: first.id, kind: 'supply', title: 'Mine again', data: { ...SUPPLY, loadCurrentA: 2 } }, undefined, stale.conflict.version);
		expect(again.ok).toBe(true);
		expect((await blocks(b.id))[0].title).toBe('Mine again');
	});

	it('refuses an invalid block with field issues and stores nothing; a changed block keeps its old data', async () => {
		const b = await testBuild(maker.id);
		const bad = await saveSpecBlock(maker, b.id, { kind: 'supply', data: { ...SUPPLY, mainsVac: 20, reservoirF: 'big' } });
		expect(bad.ok).toBe(false);
		if (!bad.ok) expect((bad.issues ?? []).map((i) => i.path).sort()).toEqual(['mainsVac', 'reservoirF']);
		expect(await blocks(b.id)).toEqual([]);

		const ok = await saveSpecBlock(maker, b.id, { kind: 'supply', data: SUPPLY });
		if (!ok.ok) throw new Error('expected a valid block');
		const before = await blocks(b.id);
		const badEdit = await saveSpecBlock(maker, b.id, { id: ok.id, kind: 'supply', data: { ...SUPPLY, capRatingV: -5 } });
		expect(badEdit.ok).toBe(false);
		expect(await blocks(b.id)).toEqual(before);
		const kindChange = await saveSpecBlock(maker, b.id, { id: ok.id, kind: 'amplifier', data: AMP });
		expect(kindChange).toEqual({ ok: false, issues: [expect.objectContaining({ path: 'kind' })] });
		expect(await blocks(b.id)).toEqual(before);
	});

	it('lets only the maker or an admin add, change, move or delete; to another maker the draft is absent (404) and nothing changes', async () => {
		const b = await testBuild(maker.id);
		const r = await saveSpecBlock(maker, b.id, { kind: 'amplifier', data: AMP });
		if (!r.ok) throw new Error('expected a valid block');
		const before = await blocks(b.id);
		expect(await statusOf(saveSpecBlock(other, b.id, { kind: 'amplifier', data: AMP }))).toBe(404);
		expect(await statusOf(saveSpecBlock(other, b.id, { id: r.id, kind: 'amplifier', data: { ...AMP, railV: 30 } }))).toBe(404);
		expect(await statusOf(deleteSpecBlock(other, b.id, r.id))).toBe(404);
		expect(await statusOf(moveSpecBlock(other, b.id, r.id, 1))).toBe(404);
		expect(await blocks(b.id)).toEqual(before);
		expect((await saveSpecBlock(admin, b.id, { id: r.id, kind: 'amplifier', data: { ...AMP, railV: 30 } })).ok).toBe(true);
	});

	it('will not touch another build’s block through this build (404)', async () => {
		const mine = await testBuild(maker.id);
		const theirs = await testBuild(other.id);
		const r = await saveSpecBlock(other, theirs.id, { kind: 'amplifier', data: AMP });
		if (!r.ok) throw new Error('expected a valid block');
		expect(await statusOf(saveSpecBlock(maker, mine.id, { id: r.id, kind: 'amplifier', data: AMP }))).toBe(404);
		expect(await statusOf(deleteSpecBlock(maker, mine.id, r.id))).toBe(404);
		expect(await blocks(theirs.id)).toHaveLength(1);
	});

	it('orders, moves and deletes blocks', async () => {
		const b = await testBuild(maker.id);
		const a = await saveSpecBlock(maker, b.id, { kind: 'amplifier', data: AMP });
		const s = await saveSpecBlock(maker, b.id, { kind: 'supply', data: SUPPLY });
		if (!a.ok || !s.ok) throw new Error('expected valid blocks');
		expect((await blocks(b.id)).map((x) => x.kind)).toEqual(['amplifier', 'supply']);
		await moveSpecBlock(maker, b.id, s.id, -1);
		expect((await blocks(b.id)).map((x) => x.kind)).toEqual(['supply', 'amplifier']);
		await deleteSpecBlock(maker, b.id, a.id);
		expect((await blocks(b.id)).map((x) => x.kind)).toEqual(['supply']);
	});
});

describe('cross checks', () => {
	it('stores a supply/amplifier clash on the supply block and lifts it when the amplifier block changes', async () => {
		const b = await testBuild(maker.id);
		// A device rated 50 V total against ≈ 2 × 27.6 V unloaded rails: danger.
		const a = await saveSpecBlock(maker, b.id, { kind: 'amplifier', data: { ...AMP, device: { ...AMP.device, maxSupplyV: 50 } } });
		const s = await saveSpecBlock(maker, b.id, { kind: 'supply', data: SUPPLY });
		if (!a.ok || !s.ok) throw new Error('expected valid blocks');
		expect(s.checks.find((c) => c.id === 'cross.rails-beyond-device')?.level).toBe('danger');
		const placed = await buildCrossChecks(b.id);
		expect(placed).toEqual([expect.objectContaining({ blockId: s.id, partLineId: null, check: expect.objectContaining({ id: 'cross.rails-beyond-device' }) })]);

		await saveSpecBlock(maker, b.id, { id: a.id, kind: 'amplifier', data: { ...AMP, device: { ...AMP.device, maxSupplyV: 80 } } });
		const [supply] = (await blocks(b.id)).filter((x) => x.kind === 'supply');
		expect(supply.checks.some((c) => c.id.startsWith('cross.'))).toBe(false);
		// Its own checks stay.
		expect(supply.checks.length).toBe(s.checks.length - 1);
		expect(await buildCrossChecks(b.id)).toEqual([]);
	});

	it('a published build’s block change joins the pending changes; published, it is one revision', async () => {
		const b = await testBuild(maker.id, { published: true });
		const r = await saveSpecBlock(maker, b.id, { kind: 'thermal', data: { powerW: 20, ambientC: 40, junctionMaxC: 150, rthJcKPerW: 1, rthCsKPerW: 0.4, rthSaKPerW: 2, tabAtRail: true, tabInsulated: true, heatsinkBondedToChassis: true } });
		expect(r.ok && r.revision).toBe(null);
		expect((await pendingChanges(b.id)).changes).toEqual(['spec blocks: 1 added']);
		await publishRevision(maker, b.id, 'Thermal block');
		const revs = await db.select().from(schema.buildRevision).where(eq(schema.buildRevision.buildId, b.id)).orderBy(asc(schema.buildRevision.number));
		expect(revs.map((x) => x.number)).toEqual([1, 2]);
		expect(revs[1].summary).toContain('spec blocks: 1 added');
	});
});
