// Integration tests against the real PostgreSQL of DATABASE_URL: the find index (find-index.ts) — filled from the
// published revision in the transaction that records it, never from pending changes — the list filters and the
// builds API's new query parameters, and EXPLAIN showing the two named queries (find.figures, find.part) on indexes.
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { createTestUser, removeTestUsers } from '../testing/builds';
import { AMP, SUPPLY, testBuild } from '../testing/parts';
import { saveSpecBlock } from '../specs';
import { savePartsList } from '../parts';
import { addStep, publish, publishRevision } from './index';
import { queryBuilds } from './list';
import { figureCondition, partCondition, refreshFindIndex } from './find-index';
import { listQuerySchema } from '$lib/schemas/list';
import { emptyDraft, type PartLineDraft } from '$lib/parts';
import { GET as listBuildsApi } from '../../../routes/api/v1/builds/+server';

type TestUser = Awaited<ReturnType<typeof createTestUser>>;
let maker: TestUser;
const draft = (over: Partial<PartLineDraft>): PartLineDraft => ({ ...emptyDraft(), ...over });

/** Slugs the list query finds for the query string `qs`, limited to this test's maker. */
async function found(qs: Record<string, string>): Promise<string[]> {
	const q = listQuerySchema.parse({ ...qs, maker: maker.handle, limit: '100' });
	const r = await queryBuilds(q);
	if (!r.ok) throw new Error(r.message);
	return r.rows.map((x) => x.slug).sort();
}

async function api(qs: Record<string, string>) {
	const url = new URL(`http://localhost/api/v1/builds?${new URLSearchParams(qs)}`);
	const res = await listBuildsApi({ url, request: new Request(url), locals: { user: null, session: null } } as never);
	return { status: res.status, body: await res.json() };
}

/** A draft with the given blocks and parts, published when asked. */
async function buildWith(blocks: { kind: string; data: Record<string, unknown> }[], parts: PartLineDraft[], published = true) {
	const b = await testBuild(maker.id);
	for (const block of blocks) {
		const r = await saveSpecBlock(maker, b.id, block);
		if (!r.ok) throw new Error(JSON.stringify(r.issues));
	}
	if (parts.length) {
		const r = await savePartsList(maker, b.id, parts);
		if (!r.ok) throw new Error(JSON.stringify(r));
	}
	if (published) {
		await addStep(maker, b.id, { title: 'Boards', bodyMd: 'Populate the boards.' });
		await publish(maker, b.id);
	}
	return b;
}

let thirty: schema.Build, fifteen: schema.Build, single: schema.Build, supplyOnly: schema.Build, unpublished: schema.Build;

beforeAll(async () => {
	maker = await createTestUser('maker', 'Finder');
	// ±30 V into 4 Ω, claimed 50 W; 0R22 emitter resistors and a TO-220 IC.
	thirty = await buildWith(
		[{ kind: 'amplifier', data: { ...AMP, railV: 30, loadOhm: 4, device: { ...AMP.device, minLoadOhm: 4 }, claimed: { powerW: 50, thdPct: 1 } } }],
		[
			draft({ designators: 'R1, R2', quantity: '2', kind: 'resistor', value: '0R22', ratingW: '5' }),
			draft({ designators: 'U1', kind: 'ic', value: '5-pin monolithic power amplifier IC', package: 'TO-220' })
		]
	);
	// ±15 V into 8 Ω, no claimed power: the index keeps what the rails allow; 4.7k written "4.7k".
	fifteen = await buildWith(
		[{ kind: 'amplifier', data: { ...AMP, railV: 15, loadOhm: 8, claimed: null } }],
		[draft({ designators: 'R3', kind: 'resistor', value: '4.7k', package: 'Axial' })]
	);
	// A single 48 V supply = ±24 V each side.
	single = await buildWith([{ kind: 'amplifier', data: { ...AMP, supply: 'single', railV: 48, loadOhm: 8, claimed: null } }], []);
	// A supply block alone: its loaded rail per side.
	supplyOnly = await buildWith([{ kind: 'supply', data: SUPPLY }], [draft({ designators: 'R9', kind: 'resistor', value: '220mΩ' })]);
	// A draft with matching numbers is never listed.
	unpublished = await buildWith([{ kind: 'amplifier', data: { ...AMP, railV: 30, loadOhm: 4, device: { ...AMP.device, minLoadOhm: 4 } } }], [], false);
});
afterAll(() => removeTestUsers([maker.id]));

describe('find index rows', () => {
	it('holds one row per amplifier/supply block of the published revision, rails per side', async () => {
		const rows = await db.select().from(schema.publishedFigure).where(eq(schema.publishedFigure.buildId, single.id));
		// A single 48 V supply swings ±24 V about its midpoint: half the total per side (API.md: railV is the whole supply for "single").
		expect(rows).toEqual([expect.objectContaining({ kind: 'amplifier', railV: 24, loadOhm: 8 })]);
		// Rail-limited power with no claim: (V − dropout)²/(2R) per API.md's amplifier formula, hand calculation:
		// split equivalent ±24 V, dropout 3 V → (24 − 3)² / (2·8) = 441/16 = 27.5625 W.
		expect(rows[0].powerW).toBeCloseTo(27.5625, 3);
		const [s] = await db.select().from(schema.publishedFigure).where(eq(schema.publishedFigure.buildId, supplyOnly.id));
		// Bridge-split supply, 20 V secondaries, 0.7 V drop: peak √2·20 − 0.7 = 27.584 V; textbook full-wave ripple
		// I/(2fC) = 1.5 / (2·50·0.01) = 1.5 Vpp; loaded rail = peak − ripple/2 = 26.834 V per side (hand calculation).
		expect(s).toMatchObject({ kind: 'supply', loadOhm: null, powerW: null });
		expect(s.railV!).toBeCloseTo(20 * Math.SQRT2 - 0.7 - 1.5 / 2, 1);
		expect(await db.select().from(schema.publishedFigure).where(eq(schema.publishedFigure.buildId, unpublished.id))).toEqual([]);
	});

	it('keeps parts values in SI and texts as keys', async () => {
		const rows = await db.select().from(schema.publishedPart).where(eq(schema.publishedPart.buildId, thirty.id));
		expect(rows.map((r) => [r.kind, r.value, r.valueKey, r.packageKey])).toEqual([
			['resistor', 0.22, '0r22', ''],
			['ic', null, '5-pin monolithic power amplifier ic', 'to-220']
		]);
	});
});

describe('find by numbers (list query)', () => {
	it('filters by rail range each side and load on the same block', async () => {
		expect(await found({ railMinV: '28', railMaxV: '32' })).toEqual([thirty.slug]);
		expect(await found({ railMinV: '28', railMaxV: '32', loadOhm: '4' })).toEqual([thirty.slug]);
		expect(await found({ railMinV: '28', railMaxV: '32', loadOhm: '8' })).toEqual([]);
		expect(await found({ railMinV: '20', railMaxV: '30' })).toEqual([single.slug, supplyOnly.slug, thirty.slug].sort());
		expect(await found({ loadOhm: '8' })).toEqual([fifteen.slug, single.slug].sort());
		expect(await found({ railMaxV: '16' })).toEqual([fifteen.slug]);
	});

	it('filters by output power (claimed, else what the rails allow)', async () => {
		// ±15 V, 3 V dropout, 8 Ω: (15 − 3)²/(2·8) = 9 W (hand calculation, API.md formula).
		expect(await found({ powerMaxW: '10' })).toEqual([fifteen.slug]);
		expect(await found({ powerMinW: '40', powerMaxW: '60' })).toEqual([thirty.slug]);
		expect(await found({ powerMinW: '20' })).toEqual([single.slug, thirty.slug].sort());
	});

	it('finds builds using a part by its normalised value (IEC 60062 RKM code 0R22 = 0.22 Ω = 220 mΩ)', async () => {
		const both = [supplyOnly.slug, thirty.slug].sort();
		expect(await found({ partKind: 'resistor', partValue: '0R22' })).toEqual(both);
		expect(await found({ partKind: 'resistor', partValue: '0.22' })).toEqual(both);
		expect(await found({ partKind: 'resistor', partValue: '220m' })).toEqual(both);
		expect(await found({ partKind: 'resistor', partValue: '4k7' })).toEqual([fifteen.slug]);
		expect(await found({ partKind: 'resistor', partValue: '0R47' })).toEqual([]);
		// Same value, other kind: not a match.
		expect(await found({ partKind: 'capacitor', partValue: '220m' })).toEqual([]);
	});

	it('finds builds by package and by the value text of kinds without an SI value, ignoring case', async () => {
		expect(await found({ partPackage: 'to-220' })).toEqual([thirty.slug]);
		expect(await found({ partKind: 'resistor', partPackage: 'AXIAL' })).toEqual([fifteen.slug]);
		expect(await found({ partKind: 'ic', partValue: '5-pin  MONOLITHIC power amplifier IC' })).toEqual([thirty.slug]);
		expect(await found({ partKind: 'resistor', partPackage: 'to-220' })).toEqual([]);
	});

	it('follows published revisions only: pending changes are not found until the maker publishes them', async () => {
		const [blk] = await db.select().from(schema.specBlock).where(eq(schema.specBlock.buildId, fifteen.id));
		const r = await saveSpecBlock(maker, fifteen.id, { id: blk.id, kind: 'amplifier', data: { ...AMP, railV: 40, loadOhm: 8, claimed: null } });
		expect(r.ok).toBe(true);
		expect(await found({ railMinV: '39', railMaxV: '41' })).toEqual([]);
		expect(await found({ railMaxV: '16' })).toEqual([fifteen.slug]);
		await publishRevision(maker, fifteen.id, 'Higher rails');
		expect(await found({ railMinV: '39', railMaxV: '41' })).toEqual([fifteen.slug]);
		expect(await found({ railMaxV: '16' })).toEqual([]);
	});

	it('rebuilds the same rows for every build at once (refreshFindIndex(db, null))', async () => {
		const before = await db.select().from(schema.publishedPart).where(eq(schema.publishedPart.buildId, thirty.id));
		await db.delete(schema.publishedPart).where(eq(schema.publishedPart.buildId, thirty.id));
		await db.transaction((tx) => refreshFindIndex(tx, null));
		const after = await db.select().from(schema.publishedPart).where(eq(schema.publishedPart.buildId, thirty.id));
		expect(after).toEqual(before);
	});
});

describe('GET /api/v1/builds find parameters', () => {
	it('answers the matching builds', async () => {
		const r = await api({ maker: maker.handle, railMinV: '28', railMaxV: '32', loadOhm: '4' });
		expect(r.status).toBe(200);
		expect(r.body.items.map((i: { slug: string }) => i.slug)).toEqual([thirty.slug]);
	});

	it.each([
		[{ railMinV: 'thirty' }, 'railMinV', 'must be a number of volts (V), e.g. 30'],
		[{ railMinV: '40', railMaxV: '30' }, 'railMinV', 'must not be above railMaxV (40 V > 30 V)'],
		[{ railMaxV: '5000' }, 'railMaxV', 'must be at most 1000 V'],
		[{ loadOhm: '0' }, 'loadOhm', 'must be greater than 0 Ω'],
		[{ powerMinW: '-1' }, 'powerMinW', 'must be 0 W or more'],
		[{ partValue: '0R22' }, 'partValue', 'needs partKind: say what kind of part the value is for (resistor, capacitor, …)'],
		[{ partKind: 'valve' }, 'partKind', 'must be one of'],
		[{ partKind: 'resistor', partValue: 'banana' }, 'partValue', 'cannot be read as a resistor value']
	])('refuses %j with a 400 sentence at its field', async (qs, path, message) => {
		const r = await api(qs as Record<string, string>);
		expect(r.status).toBe(400);
		expect(r.body.error.code).toBe('invalid');
		expect(r.body.error.issues).toEqual([expect.objectContaining({ path, message: expect.stringContaining(message) })]);
	});
});

describe('EXPLAIN: the named find queries use their indexes', () => {
	/**
	 * 20,000 published builds with one figure and three parts lines each, inside a transaction that is rolled back
	 * (ANALYZE's statistics go with it), so no other test sees them.
	 */
	async function plan(q: (tx: typeof db) => Promise<string[]>): Promise<string> {
		let text = '';
		await db
			.transaction(async (tx) => {
				// A bulk load on a shared, loaded machine: no statement time limit inside this rolled-back transaction.
				await tx.execute(sql`set local statement_timeout = 0`);
				await tx.execute(sql`
					insert into build (id, slug, owner_id, title, category, topology, status, revision, published_at)
					select md5('explain-' || n)::uuid, 'explain-' || n, ${maker.id}, 'Explain ' || n, 'power-amp', 'class-ab-chip', 'published', 1,
					       now() - n * interval '1 minute'
					from generate_series(1, 20000) n`);
				await tx.execute(sql`
					insert into published_figure (build_id, block, kind, rail_v, load_ohm, power_w)
					select md5('explain-' || n)::uuid, 0, 'amplifier', 10 + mod(n, 600) / 10.0, (array[4, 8, 16, 32])[1 + mod(n, 4)], mod(n, 300)
					from generate_series(1, 20000) n`);
				await tx.execute(sql`
					insert into published_part (build_id, line, kind, value, value_key, package_key)
					select md5('explain-' || n)::uuid, p, 'resistor', (1 + mod(n * 7 + p, 997)) * 10.0, 'r', (array['axial', 'to-220', 'smd'])[1 + mod(n + p, 3)]
					from generate_series(1, 20000) n, generate_series(0, 2) p`);
				await tx.execute(sql`analyze build, published_figure, published_part`);
				text = (await q(tx as unknown as typeof db)).join('\n');
				tx.rollback();
			})
			.catch((e) => {
				if (!/rollback/i.test(String(e?.message ?? e))) throw e;
			});
		return text;
	}
	const explain = async (tx: typeof db, cond: ReturnType<typeof figureCondition>) => {
		const rows = await tx.execute<{ 'QUERY PLAN': string }>(
			sql`explain select b.id from build b where b.status = 'published' and ${cond} order by b.published_at desc, b.id desc limit 25`
		);
		return rows.map((r) => r['QUERY PLAN']);
	};

	it('find.figures (rail range and load) reads published_figure through an index', async () => {
		const text = await plan((tx) => explain(tx, figureCondition(sql`b.id`, { railMinV: 28, railMaxV: 28.5, loadOhm: 4 })));
		expect(text).toMatch(/published_figure_(rail|load)_idx|published_figure_pkey/);
		expect(text).not.toMatch(/Seq Scan on published_figure/);
	}, 240_000);

	it('find.part (kind and value) reads published_part through an index', async () => {
		const text = await plan((tx) => explain(tx, partCondition(sql`b.id`, { kind: 'resistor', value: 4700 })));
		expect(text).toMatch(/published_part_value_idx|published_part_pkey/);
		expect(text).not.toMatch(/Seq Scan on published_part/);
	}, 240_000);
});
