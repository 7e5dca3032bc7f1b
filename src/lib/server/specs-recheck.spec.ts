// Integration test against the real PostgreSQL of DATABASE_URL: a block stored under revision 1 of the checks (old
// derived values, old check list) is brought up to what checkBuild returns now, without making a revision.
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { asc, desc, eq } from 'drizzle-orm';
import { db } from './db';
import * as schema from './db/schema';
import { createTestUser, removeTestUsers } from './testing/builds';
import { testBuild } from './testing/parts';
import { saveSpecBlock } from './specs';
import { addStep, publish } from './builds';
import type { BuildSnapshot } from './builds/snapshot';
import { CHECK_RULES_VERSION, appliedRulesVersion, recheckAtStart, recheckStoredBuilds } from './specs-recheck';
import { checkBuild } from '$lib/specs';
import { amplifierBlock, supplyBlock } from '$lib/specs/fixtures';

type TestUser = Awaited<ReturnType<typeof createTestUser>>;
let maker: TestUser;
beforeAll(async () => {
	maker = await createTestUser('maker', 'Recheck owner');
});
afterAll(async () => {
	await removeTestUsers([maker.id]);
});

const rows = (buildId: string) =>
	db.select().from(schema.specBlock).where(eq(schema.specBlock.buildId, buildId)).orderBy(asc(schema.specBlock.position));

describe('recheckStoredBuilds', () => {
	it('rewrites revision-1 results (nominal rail only, no worst case, old checks) to what checkBuild returns now', async () => {
		const b = await testBuild(maker.id);
		// 5 A fuse on 50 VA: revision 2 raises supply.fuse-size; revision 1 did not know it.
		expect((await saveSpecBlock(maker, b.id, { kind: 'supply', data: supplyBlock({ transformerVA: 50, fuse: { ratingA: 5, type: 'slow' } }) })).ok).toBe(true);
		expect((await saveSpecBlock(maker, b.id, { kind: 'amplifier', data: amplifierBlock() })).ok).toBe(true);
		// Published: readers are shown the revision's snapshot, which holds derived values and checks too.
		await addStep(maker, b.id, { title: 'Boards', bodyMd: 'Populate the boards.' });
		await publish(maker, b.id);
		const snapshotOf = async () => {
			const [build] = await db.select().from(schema.build).where(eq(schema.build.id, b.id));
			const [rev] = await db.select().from(schema.buildRevision).where(eq(schema.buildRevision.buildId, b.id)).orderBy(desc(schema.buildRevision.number)).limit(1);
			expect(rev.number).toBe(build.revision);
			return rev;
		};
		const published = await snapshotOf();
		const snap = published.snapshot as unknown as BuildSnapshot;
		await db
			.update(schema.buildRevision)
			.set({ snapshot: { ...snap, specBlocks: snap.specBlocks.map((x) => ({ ...x, derived: { peakDcV: 34.56 }, checks: [] })) } as unknown as Record<string, unknown> })
			.where(eq(schema.buildRevision.id, published.id));
		const [buildBefore] = await db.select().from(schema.build).where(eq(schema.build.id, b.id));
		const revisionsBefore = await db.select().from(schema.buildRevision).where(eq(schema.buildRevision.buildId, b.id));

		// What a revision-1 database holds: the old derived shape and check list.
		const [supplyRow, ampRow] = await rows(b.id);
		await db
			.update(schema.specBlock)
			.set({ derived: { peakDcV: 34.56, rippleVpp: 3, averageDcV: 36.1 }, checks: [{ id: 'supply.cap-rating', level: 'caution', message: 'thin margin', values: {} }] })
			.where(eq(schema.specBlock.id, supplyRow.id));
		await db
			.update(schema.specBlock)
			.set({ derived: { maxPowerW: 64, worstDissipationW: 19.9 }, checks: [] })
			.where(eq(schema.specBlock.id, ampRow.id));

		const r = await recheckStoredBuilds();
		expect(r.builds).toBeGreaterThanOrEqual(1);

		const after = await rows(b.id);
		const now = checkBuild(after.map((x) => ({ kind: x.kind, data: x.data })));
		for (const [i, row] of after.entries()) {
			const o = now.blocks[i];
			if (!o.ok) throw o.error;
			expect(row.derived).toEqual(JSON.parse(JSON.stringify(o.derived)));
			// The block's own checks, in order, then the cross checks placed on it.
			expect(row.checks.slice(0, o.checks.length).map((c) => c.id)).toEqual(o.checks.map((c) => c.id));
		}
		expect(after[0].checks.map((c) => `${c.id}:${c.level}`)).toContain('supply.fuse-size:caution');
		expect(after[0].checks.map((c) => c.id)).not.toEqual(['supply.cap-rating']);
		expect(after[1].derived.designDissipationW).toBeGreaterThan(19.9);

		// The published snapshot readers see holds the same figures as the rows.
		const snapAfter = (await snapshotOf()).snapshot as unknown as BuildSnapshot;
		expect(snapAfter.specBlocks.map((x) => x.derived)).toEqual(after.map((x) => x.derived));
		expect(snapAfter.specBlocks.map((x) => x.checks)).toEqual(after.map((x) => x.checks));
		expect(snapAfter.specBlocks.map((x) => x.data)).toEqual(snap.specBlocks.map((x) => x.data));

		// Nothing the maker wrote changed: no revision, same build row.
		const [buildAfter] = await db.select().from(schema.build).where(eq(schema.build.id, b.id));
		expect(buildAfter.updatedAt).toEqual(buildBefore.updatedAt);
		expect(await db.select().from(schema.buildRevision).where(eq(schema.buildRevision.buildId, b.id))).toHaveLength(revisionsBefore.length);

		// A second run changes nothing.
		const stored = JSON.stringify(after);
		const viewBefore = (await db.select().from(schema.build).where(eq(schema.build.id, b.id)))[0];
		await recheckStoredBuilds();
		expect(JSON.stringify(await rows(b.id))).toBe(stored);
		// … and touches nothing a reader cache watches.
		expect((await db.select().from(schema.build).where(eq(schema.build.id, b.id)))[0]).toEqual(viewBefore);
	});
});

describe('recheckAtStart (keyed on the check rules version)', () => {
	const tamper = async (buildId: string) => {
		const [row] = await rows(buildId);
		await db.update(schema.specBlock).set({ derived: { peakDcV: 1.23 }, checks: [] }).where(eq(schema.specBlock.id, row.id));
	};
	const derivedOf = async (buildId: string) => (await rows(buildId))[0].derived;
	let stored: number | null;
	beforeAll(async () => {
		stored = await appliedRulesVersion();
	});
	afterAll(async () => {
		// Leave the database as this file found it: the version the app's own start recorded (or none).
		await db.delete(schema.checkRulesApplied);
		if (stored !== null) await db.insert(schema.checkRulesApplied).values({ name: 'spec-checks', version: stored });
	});

	it('walks the builds once for a rules version, then touches no build until the version is bumped', async () => {
		const b = await testBuild(maker.id);
		expect((await saveSpecBlock(maker, b.id, { kind: 'supply', data: supplyBlock() })).ok).toBe(true);
		const fresh = await derivedOf(b.id);
		expect(fresh.peakDcV).not.toBe(1.23);

		// A database from before the table (no row): the first start walks and records the version.
		await db.delete(schema.checkRulesApplied);
		await tamper(b.id);
		const first = await recheckAtStart();
		expect(first.skipped).toBe(false);
		expect(first.builds).toBeGreaterThanOrEqual(1);
		expect(await derivedOf(b.id)).toEqual(fresh);
		expect(await appliedRulesVersion()).toBe(CHECK_RULES_VERSION);

		// A second start with the same version walks nothing: a stale row stays stale, the build row is not read for update.
		await tamper(b.id);
		const [buildBefore] = await db.select().from(schema.build).where(eq(schema.build.id, b.id));
		const second = await recheckAtStart();
		expect(second).toEqual({ builds: 0, skipped: true });
		expect((await derivedOf(b.id)).peakDcV).toBe(1.23);
		expect((await db.select().from(schema.build).where(eq(schema.build.id, b.id)))[0]).toEqual(buildBefore);

		// Bumping the version rechecks every build again and records the new version.
		const third = await recheckAtStart({ version: CHECK_RULES_VERSION + 1 });
		expect(third.skipped).toBe(false);
		expect(third.builds).toBeGreaterThanOrEqual(1);
		expect(await derivedOf(b.id)).toEqual(fresh);
		expect(await appliedRulesVersion()).toBe(CHECK_RULES_VERSION + 1);

		// RECHECK_ON_START=always walks although the version matches.
		await tamper(b.id);
		const forced = await recheckAtStart({ version: CHECK_RULES_VERSION + 1, always: true });
		expect(forced.skipped).toBe(false);
		expect(await derivedOf(b.id)).toEqual(fresh);
	});
});
