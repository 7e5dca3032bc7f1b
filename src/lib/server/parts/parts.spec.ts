// Integration tests against the real PostgreSQL of DATABASE_URL: saving parts lists, CSV import, checks that
// need the spec blocks, revisions, owner checks and the parts.csv API route.
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { asc, eq, sql } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { createTestUser, removeTestUsers } from '../testing/builds';
import { AMP, SUPPLY, statusOf, testBuild } from '../testing/parts';
import { setBuildLocked } from '../moderation';
import { deleteSpecBlock, saveSpecBlock } from '../specs';
import { editorRowsOf, importPartsCsv, listPartLines, partsToCsv, savePartsList } from './index';
import { pendingChanges, publishRevision } from '../builds';
import { emptyDraft, type PartLineDraft } from '$lib/parts';
import { searchQuery } from '../search';
import { GET as getPartsCsv } from '../../../routes/api/v1/builds/[slug]/parts.csv/+server';

type TestUser = Awaited<ReturnType<typeof createTestUser>>;
let maker: TestUser, other: TestUser, admin: TestUser, moderator: TestUser;

beforeAll(async () => {
	maker = await createTestUser('maker', 'Parts owner');
	other = await createTestUser('maker', 'Parts other');
	admin = await createTestUser('admin', 'Parts admin');
	moderator = await createTestUser('moderator', 'Parts mod');
});
afterAll(async () => {
	await removeTestUsers([maker.id, other.id, admin.id, moderator.id]);
});

const draft = (over: Partial<PartLineDraft>): PartLineDraft => ({ ...emptyDraft(), ...over });
const LIST = [
	draft({ designators: 'R1, R2', quantity: '2', kind: 'resistor', value: '4k7', tolerance: '1', ratingW: '1/4' }),
	draft({ designators: 'C3', kind: 'capacitor', value: '2×1u series', designValue: '0.47u', tolerance: '10', ratingV: '63', reason: 'two 1 µF film caps on hand' }),
	draft({ designators: 'U1', kind: 'ic', value: '5-pin monolithic power amplifier IC', package: 'TO-220' })
];

async function stored(buildId: string) {
	return db.select().from(schema.partLine).where(eq(schema.partLine.buildId, buildId)).orderBy(asc(schema.partLine.position));
}

describe('the costed parts list in PostgreSQL', () => {
	it('stores prices exactly (numeric), AC ratings and per-channel flags; the CSV round trip keeps them; AC is left out of the DC cross checks', async () => {
		const b = await testBuild(maker.id);
		await saveSpecBlock(maker, b.id, { kind: 'supply', data: SUPPLY });
		const costed = [
			draft({ designators: 'R1, R2', quantity: '2', value: '0R22', unitPrice: '0.0125', currency: 'eur', perChannel: 'yes', mpn: 'WW5', supplier: 'Bench "B", Ltd' }),
			// 25 V AC: as DC it would be below the supply's ≈ 33.5 V off-load rail and raise cross.cap-below-rail.
			draft({ designators: 'CX1', kind: 'capacitor', value: '100n', ratingV: '25 V AC', unitPrice: '0.1', currency: 'EUR' })
		];
		const r = await savePartsList(maker, b.id, costed);
		expect(r.ok).toBe(true);
		const rows = await stored(b.id);
		// numeric(14,4) comes back as the exact decimal text, not a float.
		expect(rows[0]).toMatchObject({ unitPrice: '0.0125', currency: 'EUR', perChannel: true, mpn: 'WW5', supplier: 'Bench "B", Ltd' });
		expect(rows[1]).toMatchObject({ ratingV: 25, ratingVAc: true, unitPrice: '0.1000' });
		const ids = rows[1].checks.map((c) => c.id);
		expect(ids).toContain('part.ac-rating');
		expect(ids).not.toContain('cross.cap-below-rail');
		// The same part rated 25 V DC does get the cross check: the AC flag is what keeps it out.
		await savePartsList(maker, b.id, [{ ...costed[1], ratingV: '25' }]);
		expect((await stored(b.id))[0].checks.map((c) => c.id)).toContain('cross.cap-below-rail');

		await savePartsList(maker, b.id, costed);
		const csv = partsToCsv(await stored(b.id));
		const again = await importPartsCsv(maker, b.id, csv, 'replace');
		expect(again.ok).toBe(true);
		expect(partsToCsv(await stored(b.id))).toBe(csv);
	});

	it('refuses a negative price or a currency that is not a code at the database too (check constraint), not only in the form', async () => {
		const b = await testBuild(maker.id);
		await expect(
			db.insert(schema.partLine).values({ buildId: b.id, position: 0, kind: 'resistor', unitPrice: '-1', currency: 'EUR' })
		).rejects.toThrow();
		await expect(db.insert(schema.partLine).values({ buildId: b.id, position: 0, kind: 'resistor', unitPrice: '1', currency: 'euro' })).rejects.toThrow();
	});
});

describe('savePartsList', () => {
	it('stores normalised lines in order, with the substitution deviation', async () => {
		const b = await testBuild(maker.id);
		const r = await savePartsList(maker, b.id, LIST);
		expect(r).toMatchObject({ ok: true, count: 3, revision: null });
		const rows = await stored(b.id);
		expect(rows.map((x) => [x.position, x.designators, x.kind])).toEqual([
			[0, 'R1, R2', 'resistor'],
			[1, 'C3', 'capacitor'],
			[2, 'U1', 'ic']
		]);
		expect(rows[0]).toMatchObject({ value: 4700, unit: 'ohm', tolerancePct: 1, ratingW: 0.25, valueText: '4k7' });
		expect(rows[1].value).toBeCloseTo(5e-7, 15);
		expect(rows[1].deviationPct).toBeCloseTo(6.383, 3);
		expect(rows[1]).toMatchObject({ designValueText: '0.47u', substitutionReason: 'two 1 µF film caps on hand' });
		expect(rows[2]).toMatchObject({ value: null, unit: null, valueText: '5-pin monolithic power amplifier IC' });
		const [bb] = await db.select({ searchText: schema.build.searchText }).from(schema.build).where(eq(schema.build.id, b.id));
		expect(bb.searchText).toContain('2×1u series');
	});

	it('refuses a list with a bad line, naming the line, and keeps the stored list as it was', async () => {
		const b = await testBuild(maker.id);
		await savePartsList(maker, b.id, LIST);
		const before = await stored(b.id);
		const r = await savePartsList(maker, b.id, [...LIST, draft({ designators: 'C9', kind: 'capacitor', value: '10 bananas' })]);
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.errors).toEqual([expect.objectContaining({ line: 4, field: 'value' })]);
		expect(await stored(b.id)).toEqual(before);
	});

	it('skips blank editor rows but keeps the line numbers of the others', async () => {
		const b = await testBuild(maker.id);
		const r = await savePartsList(maker, b.id, [LIST[0], emptyDraft(), draft({ designators: 'R5', kind: 'resistor', value: '' })]);
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.errors.map((e) => e.line)).toEqual([3]);
	});

	it('lets only the maker (or an admin) save; another maker gets 403 and nothing changes; a lock stops the maker', async () => {
		// Published: a draft would be absent (404) to the others, and a moderator could not lock it.
		const b = await testBuild(maker.id, { published: true });
		await savePartsList(maker, b.id, LIST);
		const before = await stored(b.id);
		expect(await statusOf(savePartsList(other, b.id, [LIST[0]]))).toBe(403);
		expect(await statusOf(savePartsList(moderator, b.id, [LIST[0]]))).toBe(403);
		expect(await stored(b.id)).toEqual(before);
		expect((await savePartsList(admin, b.id, [LIST[0]])).ok).toBe(true);
		await setBuildLocked(moderator, b.id, true, 'mains wiring under discussion');
		expect(await statusOf(savePartsList(maker, b.id, LIST))).toBe(403);
		expect(await stored(b.id)).toHaveLength(1);
	});

	it('on a published build, a changed list joins the pending changes instead of making a revision', async () => {
		const b = await testBuild(maker.id, { published: true });
		const r1 = await savePartsList(maker, b.id, LIST);
		expect(r1.ok && r1.revision).toBe(null);
		const revs = await db.select().from(schema.buildRevision).where(eq(schema.buildRevision.buildId, b.id));
		expect(revs.map((r) => r.number)).toEqual([1]);
		const [row] = await db.select().from(schema.build).where(eq(schema.build.id, b.id));
		expect(row.revision).toBe(1);
		expect(row.pendingChangesAt).toBeInstanceOf(Date);
		expect((await pendingChanges(b.id)).changes).toEqual(['parts: 3 added']);
	});
});

describe('no lost lines', () => {
	it('refuses a save against a list that changed since the editor loaded it (another tab), and stores nothing', async () => {
		const b = await testBuild(maker.id);
		await savePartsList(maker, b.id, LIST);
		const tabA = editorRowsOf(await listPartLines(b.id));
		const tabB = editorRowsOf(await listPartLines(b.id));
		// Tab B adds a line and saves first.
		const r6 = draft({ designators: 'R6', kind: 'resistor', value: '0R22', ratingW: '5' });
		const savedB = await savePartsList(maker, b.id, [...tabB.rows, r6], { ids: tabB.ids, expectedVersion: tabB.version });
		expect(savedB.ok).toBe(true);
		// Tab A changes one quantity from its older list: refused, with the stored list (4 lines) to show.
		const rowsA = tabA.rows.map((r, i) => (i === 0 ? { ...r, quantity: '3' } : r));
		const savedA = await savePartsList(maker, b.id, rowsA, { ids: tabA.ids, expectedVersion: tabA.version });
		expect(savedA.ok).toBe(false);
		expect(!savedA.ok && savedA.conflict?.rows.map((r) => r.designators)).toEqual(['R1, R2', 'C3', 'U1', 'R6']);
		expect((await stored(b.id)).map((r) => [r.designators, r.quantity])).toEqual([
			['R1, R2', 2],
			['C3', 1],
			['U1', 1],
			['R6', 1]
		]);
		// Saving again from the stored version replaces the list on purpose.
		if (!savedA.ok && savedA.conflict) {
			const again = await savePartsList(maker, b.id, rowsA, { ids: tabA.ids, expectedVersion: savedA.conflict.version });
			expect(again.ok).toBe(true);
		}
	});

	it('after a CSV import (add to the end), an edit from the refreshed editor keeps every line; from the old editor it is refused', async () => {
		const b = await testBuild(maker.id);
		await savePartsList(maker, b.id, LIST);
		const before = editorRowsOf(await listPartLines(b.id));
		const imported = await importPartsCsv(maker, b.id, ['designators,quantity,kind,value', 'C20,4,capacitor,10000u'].join('\n'), 'append');
		expect(imported).toMatchObject({ ok: true, count: 1, total: 4 });
		// The editor as it was before the import: its save would drop C20, so it is refused.
		const stale = await savePartsList(
			maker,
			b.id,
			before.rows.map((r, i) => (i === 2 ? { ...r, quantity: '2' } : r)),
			{ ids: before.ids, expectedVersion: before.version }
		);
		expect(stale.ok === false && !!stale.conflict).toBe(true);
		expect((await stored(b.id)).map((r) => r.designators)).toEqual(['R1, R2', 'C3', 'U1', 'C20']);
		// The editor after the import (what the page now shows): the edit keeps all four lines.
		const after = imported.ok ? editorRowsOf(await listPartLines(b.id)) : before;
		expect(imported.ok && imported.version).toBe(after.version);
		const ok = await savePartsList(maker, b.id, after.rows.map((r, i) => (i === 2 ? { ...r, quantity: '2' } : r)), { ids: after.ids, expectedVersion: after.version });
		expect(ok).toMatchObject({ ok: true, count: 4 });
		expect((await stored(b.id)).map((r) => [r.designators, r.quantity])).toEqual([
			['R1, R2', 2],
			['C3', 1],
			['U1', 2],
			['C20', 4]
		]);
	});

	it('keeps the ids of lines posted with their id, also without designators or with repeated ones (hazard tags keep their targets)', async () => {
		const b = await testBuild(maker.id);
		const noDes = [
			draft({ designators: '', kind: 'hardware', value: '', notes: 'M3 screws' }),
			draft({ designators: '', kind: 'hardware', value: '', notes: 'mica insulators' }),
			draft({ designators: 'C1', kind: 'capacitor', value: '100n' }),
			draft({ designators: 'C1', kind: 'capacitor', value: '220n' })
		];
		await savePartsList(maker, b.id, noDes);
		const first = editorRowsOf(await listPartLines(b.id));
		// Swap the two unnamed lines, edit one, drop the second C1, and add a new line.
		const rows = [{ ...first.rows[1], notes: 'mica insulators, 2 spare' }, first.rows[0], first.rows[2], draft({ designators: 'R9', kind: 'resistor', value: '4k7' })];
		const ids = [first.ids[1], first.ids[0], first.ids[2], ''];
		const r = await savePartsList(maker, b.id, rows, { ids, expectedVersion: first.version });
		expect(r.ok).toBe(true);
		const now = await stored(b.id);
		expect(now.map((l) => l.id).slice(0, 3)).toEqual([first.ids[1], first.ids[0], first.ids[2]]);
		expect(first.ids).not.toContain(now[3].id);
		expect(now[0].notes).toBe('mica insulators, 2 spare');
		// An id of another build's line is not taken over.
		const other = await testBuild(maker.id);
		await savePartsList(maker, other.id, [draft({ designators: 'Q1', kind: 'transistor', value: '' })], { ids: [now[0].id] });
		expect((await stored(other.id))[0].id).not.toBe(now[0].id);
	});
});

describe('checks that need the spec blocks', () => {
	it('escalates a lowered rating to danger once a supply block puts the rail between the two ratings, and back when it goes', async () => {
		const b = await testBuild(maker.id);
		const sub = draft({ designators: 'C5', kind: 'capacitor', value: '100u', ratingV: '25', designValue: '100u/35V', reason: 'on hand' });
		await savePartsList(maker, b.id, [sub]);
		const level = async () => (await stored(b.id))[0].checks.find((c) => c.id === 'part.rating-below-rail')?.level;
		expect(await level()).toBe('caution');

		const s = await saveSpecBlock(maker, b.id, { kind: 'supply', data: SUPPLY });
		expect(s.ok).toBe(true);
		// Off load at +10 % mains with 10 % regulation assumed: 20 · √2 · 1.1 · 1.1 − 0.7 = 33.52 V (hand),
		// between 25 V (fitted) and 35 V (design).
		expect(await level()).toBe('danger');
		const line = (await stored(b.id))[0];
		expect(line.checks.find((c) => c.id === 'cross.cap-below-rail')).toMatchObject({ level: 'danger', values: { designators: 'C5', ratingV: 25 } });
		expect(Math.abs((line.checks.find((c) => c.id === 'part.rating-below-rail')!.values.railV as number) - 33.52)).toBeLessThan(0.01);

		if (s.ok) await deleteSpecBlock(maker, b.id, s.id);
		expect(await level()).toBe('caution');
		expect((await stored(b.id))[0].checks.some((c) => c.id.startsWith('cross.'))).toBe(false);
	});
});

describe('importPartsCsv', () => {
	const header = 'designators,quantity,kind,value,tolerance_pct,rating_v,notes,design_value,substitution_reason';
	const good = [header, '"R1, R2",2,resistor,4k7,1,,"metal film, ""low noise""",,', 'C3,1,capacitor,2×1u series,10,63,,0.47u,on hand'];

	it('saves nothing while one line is bad and reports that line; saves once it is fixed', async () => {
		const b = await testBuild(maker.id);
		const bad = await importPartsCsv(maker, b.id, [...good, 'C4,1,capacitor,lots,,,,,'].join('\r\n'));
		expect(bad.ok).toBe(false);
		if (!bad.ok) {
			expect(bad.preview.rows.find((r) => r.errors.length)?.errors[0]).toMatchObject({ line: 4, field: 'value' });
		}
		expect(await stored(b.id)).toEqual([]);
		const fixed = await importPartsCsv(maker, b.id, [...good, 'C4,1,capacitor,10n,,,,,'].join('\r\n'));
		expect(fixed).toMatchObject({ ok: true, count: 3 });
		const rows = await stored(b.id);
		expect(rows.map((r) => r.designators)).toEqual(['R1, R2', 'C3', 'C4']);
		expect(rows[0].notes).toBe('metal film, "low noise"');
	});

	it('appends to the list when asked, and refuses another maker', async () => {
		const b = await testBuild(maker.id);
		await savePartsList(maker, b.id, [LIST[2]]);
		const r = await importPartsCsv(maker, b.id, good.join('\n'), 'append');
		expect(r).toMatchObject({ ok: true, count: 2, total: 3 });
		expect((await stored(b.id)).map((x) => x.designators)).toEqual(['U1', 'R1, R2', 'C3']);
		// The build is a draft: to another maker it is absent.
		expect(await statusOf(importPartsCsv(other, b.id, good.join('\n')))).toBe(404);
	});

	it('export → import into another build gives the same lines', async () => {
		const a = await testBuild(maker.id);
		await savePartsList(maker, a.id, [...LIST, draft({ designators: 'R9', kind: 'jumper', designValue: '2R2', notes: 'line one\nline two', reason: 'stable without it' })]);
		const csv = partsToCsv(await listPartLines(a.id));
		const b = await testBuild(maker.id);
		expect((await importPartsCsv(maker, b.id, csv)).ok).toBe(true);
		const strip = (rows: schema.PartLine[]) => rows.map(({ id: _id, buildId: _b, ...rest }) => rest);
		expect(strip(await stored(b.id))).toEqual(strip(await stored(a.id)));
	});
});

describe('GET /api/v1/builds/:slug/parts.csv', () => {
	function call(slug: string, user: TestUser | null) {
		return getPartsCsv({
			params: { slug },
			locals: { user: user ? { ...user, suspendedAt: null } : null, session: null }
		} as unknown as Parameters<typeof getPartsCsv>[0]);
	}

	it('serves a draft’s list to its maker only; others get the 404 envelope', async () => {
		const b = await testBuild(maker.id);
		await savePartsList(maker, b.id, LIST);
		const res = await call(b.slug, maker);
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toBe('text/csv; charset=utf-8');
		expect(res.headers.get('content-disposition')).toBe(`attachment; filename="${b.slug}-parts.csv"`);
		const text = await res.text();
		expect(text.split('\r\n')).toHaveLength(5);
		expect(text).toContain('C3,1,capacitor,2×1u series');
		for (const who of [other, null]) {
			const r = await call(b.slug, who);
			expect(r.status).toBe(404);
			expect((await r.json()).error.code).toBe('not_found');
		}
	});

	it('serves a published build’s list to everyone as published; pending changes only to its maker; 404 for an unknown slug', async () => {
		const b = await testBuild(maker.id, { published: true });
		await savePartsList(maker, b.id, LIST);
		await publishRevision(maker, b.id, 'parts list');
		const r = await call(b.slug, null);
		expect(r.status).toBe(200);
		expect(await r.text()).toContain('"R1, R2",2,resistor,4k7');
		// A change not yet published: readers keep the published list, the maker sees the change.
		await savePartsList(maker, b.id, [{ ...LIST[0], value: '10k' }, LIST[1], LIST[2]]);
		const reader = await (await call(b.slug, other)).text();
		expect(reader).toContain('"R1, R2",2,resistor,4k7');
		expect(reader).not.toContain(',10k,');
		expect(await (await call(b.slug, maker)).text()).toContain('"R1, R2",2,resistor,10k');
		expect((await call('no-such-build-anywhere', null)).status).toBe(404);
	});
});

describe('the micro sign in stored values and in search', () => {
	const MICRO = '\u00b5';
	const MU = '\u03bc';
	it('stores a value typed with the Greek mu with the micro sign, and search finds either spelling', async () => {
		const b = await testBuild(maker.id);
		const r = await savePartsList(maker, b.id, [
			draft({ designators: 'C9', kind: 'capacitor', value: `4${MU}7`, notes: `bypass beside the 10000${MU}F reservoir` })
		]);
		expect(r.ok).toBe(true);
		const [row] = await stored(b.id);
		expect(row.valueText).toBe(`4${MICRO}7`);
		expect(row.notes).toBe(`bypass beside the 10000${MU}F reservoir`);
		const found = async (q: string, query = searchQuery(q)) => {
			const [x] = await db.select({ hit: sql<boolean>`${schema.build.search} @@ ${query}` }).from(schema.build).where(eq(schema.build.id, b.id));
			return x.hit;
		};
		// The value (stored with µ) and the notes (kept as written, with μ) are found by both spellings.
		for (const q of [`4${MICRO}7`, `4${MU}7`, `10000${MICRO}F`, `10000${MU}F`]) expect(await found(q), q).toBe(true);
		// Control: the two characters are different words to PostgreSQL's parser, so one spelling alone misses the other.
		expect(await found(`10000${MICRO}F`, sql`websearch_to_tsquery('english', ${`10000${MICRO}F`})`)).toBe(false);
		expect(await found(`22${MICRO}F`)).toBe(false);
	});
});
