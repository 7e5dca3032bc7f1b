// Integration tests against the real PostgreSQL of DATABASE_URL: lifecycle, revisions, steps, owner checks, derive.
import { describe, it, expect } from 'vitest';
import { and, asc, eq, sql } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { buildFields as fields, createTestUser, removeTestUsers, statusOf, uniqueTitle, useTestUsers } from '../testing/builds';
import {
	addStep,
	archive,
	createDraft,
	decodeCursor,
	deleteStep,
	derive,
	encodeCursor,
	getBuildDetail,
	listPublishedBuilds,
	listRevisions,
	getRevision,
	loadLineage,
	moveStep,
	pendingChanges,
	publish,
	publishRevision,
	markPendingChanges,
	stepVersion,
	requireVisibleBuild,
	updateBuild,
	updateStep
} from './index';
import type { BuildInput } from '$lib/schemas/build';
import { setBuildLocked } from '../moderation';

const { maker, other, admin, moderator } = useTestUsers({
	maker: ['maker', 'Owner'],
	other: ['maker', 'Other'],
	admin: ['admin', 'Admin'],
	moderator: ['moderator', 'Mod']
});

async function buildRow(id: string) {
	const [b] = await db.select().from(schema.build).where(eq(schema.build.id, id));
	return b;
}

async function stepTitles(buildId: string) {
	const rows = await db
		.select({ title: schema.buildStep.title, position: schema.buildStep.position })
		.from(schema.buildStep)
		.where(eq(schema.buildStep.buildId, buildId))
		.orderBy(asc(schema.buildStep.position));
	return rows;
}

describe('createDraft and slugs', () => {
	it('makes a readable slug from the title and numbers a clash', async () => {
		const title = uniqueTitle('Quiet Class A headphone amp');
		const a = await createDraft(maker.id, fields(title));
		const b = await createDraft(other.id, fields(title));
		expect(a.slug).toMatch(/^quiet-class-a-headphone-amp-[a-z0-9]+$/);
		expect(b.slug).toBe(`${a.slug}-2`);
		const row = await buildRow(a.id);
		expect(row).toMatchObject({ status: 'draft', ownerId: maker.id, revision: 0, title });
	});

	it('works inside the caller’s transaction and rolls back with it', async () => {
		const title = uniqueTitle('Rolled back');
		let id = '';
		await expect(
			db.transaction(async (tx) => {
				id = (await createDraft(maker.id, fields(title), tx)).id;
				await addStep(maker, id, { title: 'Solder', bodyMd: 'x' }, tx);
				throw new Error('abort');
			})
		).rejects.toThrow('abort');
		expect(id).not.toBe('');
		expect(await buildRow(id)).toBeUndefined();
	});

	it('refuses invalid fields', async () => {
		await expect(createDraft(maker.id, { ...fields(), title: 'x' })).rejects.toThrow();
		await expect(createDraft(maker.id, { ...fields(), category: 'toaster' as never })).rejects.toThrow();
	});

	it('lets a never-published draft’s slug follow its title, then keeps it once published', async () => {
		const d = await createDraft(maker.id, fields());
		const newTitle = uniqueTitle('Renamed supply');
		const r = await updateBuild(maker, d.id, fields(newTitle));
		expect(r.slug).toMatch(/^renamed-supply-/);
		await addStep(maker, d.id, { title: 'Wind', bodyMd: '' });
		await publish(maker, d.id);
		const r2 = await updateBuild(maker, d.id, fields(uniqueTitle('Another name')));
		expect(r2.slug).toBe(r.slug);
	});
});

describe('visibility', () => {
	it('shows drafts only to their maker and admins', async () => {
		const d = await createDraft(maker.id, fields());
		const slug = (await buildRow(d.id)).slug;
		await expect(requireVisibleBuild(slug, maker)).resolves.toMatchObject({ id: d.id });
		await expect(requireVisibleBuild(slug, admin)).resolves.toMatchObject({ id: d.id });
		expect(await statusOf(requireVisibleBuild(slug, other))).toBe(404);
		expect(await statusOf(requireVisibleBuild(slug, null))).toBe(404);
		expect(await statusOf(getBuildDetail(slug, null))).toBe(404);
	});
});

describe('publish, archive and revision numbering', () => {
	it('needs a step; edits collect as pending changes and the maker publishes them as ONE revision with a note', async () => {
		const d = await createDraft(maker.id, fields());
		expect(await statusOf(publish(maker, d.id))).toBe(422);

		// Draft saves make no revisions and no pending changes.
		const s1 = await addStep(maker, d.id, { title: 'Board', bodyMd: 'Fit the **ICs**.' });
		const s2 = await addStep(maker, d.id, { title: 'Chassis', bodyMd: 'Drill.' });
		await db.transaction((tx) => markPendingChanges(tx, d.id));
		expect(await buildRow(d.id)).toMatchObject({ revision: 0, pendingChangesAt: null });

		expect(await publish(maker, d.id)).toBe(1);
		let b = await buildRow(d.id);
		expect(b).toMatchObject({ status: 'published', revision: 1, pendingChangesAt: null });
		expect(b.publishedAt).toBeInstanceOf(Date);
		expect(await statusOf(publish(maker, d.id))).toBe(409);
		// Nothing to publish yet.
		expect(await statusOf(publishRevision(maker, d.id, 'nothing'))).toBe(409);

		// Five edits in a row: no revision each time, one set of pending changes.
		const r2 = await updateBuild(maker, d.id, { ...fields(), title: uniqueTitle('Chip amp rev B') });
		expect(r2.revision).toBeNull();
		await updateStep(maker, s1.id, { title: 'Board', bodyMd: 'Fit the ICs and the Zobel network.' });
		await updateStep(maker, s2.id, { title: 'Chassis and wiring', bodyMd: 'Drill.' });
		await addStep(maker, d.id, { title: 'Bring-up', bodyMd: 'Current-limited first start.' });
		await moveStep(maker, s2.id, 'up');
		b = await buildRow(d.id);
		expect(b.revision).toBe(1);
		expect(b.pendingChangesAt).toBeInstanceOf(Date);
		expect((await listRevisions(d.id)).map((r) => r.number)).toEqual([1]);
		const pending = await pendingChanges(d.id);
		expect(pending.changes).toEqual(['1 step added', '2 steps changed', 'steps reordered', 'title changed']);

		// Others cannot publish the maker's changes; an overlong note is refused.
		expect(await statusOf(publishRevision(other, d.id, 'mine now'))).toBe(403);
		expect(await statusOf(publishRevision(maker, d.id, 'x'.repeat(501)))).toBe(422);

		const rev = await publishRevision(maker, d.id, '  Zobel network added;\n bring-up step  ');
		expect(rev).toEqual({ number: 2, summary: '1 step added, 2 steps changed, steps reordered, title changed' });
		const revs = await listRevisions(d.id);
		expect(revs.map((r) => [r.number, r.note])).toEqual([
			[2, 'Zobel network added; bring-up step'],
			[1, '']
		]);
		b = await buildRow(d.id);
		expect(b).toMatchObject({ revision: 2, pendingChangesAt: null });

		// A save that changes nothing leaves nothing pending to publish.
		await updateStep(maker, s1.id, { title: 'Board', bodyMd: 'Fit the ICs and the Zobel network.' });
		expect((await pendingChanges(d.id)).changes).toEqual([]);
		expect(await statusOf(publishRevision(maker, d.id, ''))).toBe(409);

		// The snapshot of Rev A still has the old order and text; Rev B the new.
		const r1 = await getRevision(d.id, 1);
		expect(r1?.snapshot.steps.map((s) => s.title)).toEqual(['Board', 'Chassis']);
		expect(r1?.snapshot.steps[0].bodyHtml).toContain('<strong>ICs</strong>');
		const rB = await getRevision(d.id, 2);
		expect(rB?.snapshot.steps.map((s) => s.title)).toEqual(['Chassis and wiring', 'Board', 'Bring-up']);
	});

	it('asks for a change note once a reviewer signed the build off', async () => {
		const d = await createDraft(maker.id, fields());
		const s = await addStep(maker, d.id, { title: 'Only step', bodyMd: 'Text.' });
		await publish(maker, d.id);
		await db.insert(schema.review).values({ buildId: d.id, reviewerId: admin.id, revision: 1, verdict: 'safe', summaryMd: 'ok', summaryHtml: '<p>ok</p>' });
		await updateStep(maker, s.id, { title: 'Only step', bodyMd: 'Text, and a fuse.' });
		expect(await statusOf(publishRevision(maker, d.id, '   '))).toBe(422);
		expect((await buildRow(d.id)).revision).toBe(1);
		expect(await publishRevision(maker, d.id, 'Fuse added')).toMatchObject({ number: 2 });
	});

	it('refuses a step save against a step that changed since the editor loaded it (two tabs), keeping both texts', async () => {
		const d = await createDraft(maker.id, fields());
		const s = await addStep(maker, d.id, { title: 'Wiring', bodyMd: 'Start.' });
		const [loaded] = await db.select().from(schema.buildStep).where(eq(schema.buildStep.id, s.id));
		const v0 = stepVersion(loaded);
		const tabB = await updateStep(maker, s.id, { title: 'Wiring', bodyMd: 'Start. Twist the mains pair.' }, undefined, d.id, v0);
		expect(tabB.conflict).toBeUndefined();
		const tabA = await updateStep(admin, s.id, { title: 'Wiring', bodyMd: 'Start. Sleeve the fuse holder.' }, undefined, d.id, v0);
		expect(tabA.conflict).toMatchObject({ title: 'Wiring', bodyMd: 'Start. Twist the mains pair.' });
		const [now] = await db.select().from(schema.buildStep).where(eq(schema.buildStep.id, s.id));
		expect(now.bodyMd).toBe('Start. Twist the mains pair.');
		// Saving again from the stored version is a deliberate overwrite.
		const again = await updateStep(admin, s.id, { title: 'Wiring', bodyMd: 'Both: twist and sleeve.' }, undefined, d.id, tabA.conflict!.version);
		expect(again.conflict).toBeUndefined();
		expect('version' in again && again.version).not.toBe(tabA.conflict!.version);
	});

	it('archives without a revision and re-publishes with one only when something changed', async () => {
		const d = await createDraft(maker.id, fields());
		const s = await addStep(maker, d.id, { title: 'Only step', bodyMd: '' });
		await publish(maker, d.id);
		await archive(maker, d.id);
		expect(await buildRow(d.id)).toMatchObject({ status: 'archived', revision: 1 });
		expect(await statusOf(archive(maker, d.id))).toBe(409);

		expect(await publish(maker, d.id)).toBe(1);
		await archive(maker, d.id);
		await updateStep(maker, s.id, { title: 'Only step', bodyMd: 'Now with text.' });
		expect((await buildRow(d.id)).revision).toBe(1);
		expect(await publish(maker, d.id, undefined, 'Text for the step')).toBe(2);
		const [rev] = await listRevisions(d.id);
		expect(rev).toMatchObject({ number: 2, summary: '1 step changed', note: 'Text for the step' });
		expect((await buildRow(d.id)).pendingChangesAt).toBeNull();
	});
});

describe('steps', () => {
	it('stores Markdown with sanitized HTML, reorders, renumbers on delete and keeps search text current', async () => {
		const d = await createDraft(maker.id, fields());
		const a = await addStep(maker, d.id, { title: 'A', bodyMd: 'Wind the **toroid** <img src=x onerror=alert(1)>' });
		const b = await addStep(maker, d.id, { title: 'B', bodyMd: '[x](javascript:alert(1)) bleeder resistors' });
		const c = await addStep(maker, d.id, { title: 'C', bodyMd: '' });
		expect([a.position, b.position, c.position]).toEqual([0, 1, 2]);

		const [row] = await db.select().from(schema.buildStep).where(eq(schema.buildStep.id, a.id));
		expect(row.bodyMd).toContain('<img src=x onerror=alert(1)>');
		expect(row.bodyHtml).toContain('<strong>toroid</strong>');
		expect(row.bodyHtml).not.toMatch(/onerror|<img/);

		expect(await moveStep(maker, c.id, 'up')).toBe(1);
		expect(await moveStep(maker, a.id, 'up')).toBe(0); // already first: nothing moves
		expect((await stepTitles(d.id)).map((s) => s.title)).toEqual(['A', 'C', 'B']);
		await moveStep(maker, a.id, 'down');
		expect((await stepTitles(d.id)).map((s) => s.title)).toEqual(['C', 'A', 'B']);

		await deleteStep(maker, c.id);
		expect(await stepTitles(d.id)).toEqual([
			{ title: 'A', position: 0 },
			{ title: 'B', position: 1 }
		]);
		const built = await buildRow(d.id);
		expect(built.searchText).toContain('toroid');
		expect(built.searchText).toContain('bleeder resistors');

		const hits = await db
			.select({ id: schema.build.id })
			.from(schema.build)
			.where(and(eq(schema.build.id, d.id), eqTs('bleeder')));
		expect(hits).toHaveLength(1);
	});

	it('refuses a step id that belongs to another build', async () => {
		const d1 = await createDraft(maker.id, fields());
		const d2 = await createDraft(maker.id, fields());
		const s = await addStep(maker, d1.id, { title: 'A', bodyMd: '' });
		expect(await statusOf(updateStep(maker, s.id, { title: 'B', bodyMd: '' }, undefined, d2.id))).toBe(404);
	});
});

function eqTs(word: string) {
	return sql`${schema.build.search} @@ plainto_tsquery('english', ${word})`;
}

describe('who may change a build', () => {
	it('answers 404 on a draft to another maker and a moderator (it is absent to them), 403 once published, 401 when signed out', async () => {
		const d = await createDraft(maker.id, fields());
		const s = await addStep(maker, d.id, { title: 'Mine', bodyMd: '' });
		const step = { title: 'Hijacked', bodyMd: '' };
		const attempts = (who: typeof other | null) => [
			() => updateBuild(who as never, d.id, fields()),
			() => addStep(who as never, d.id, step),
			() => updateStep(who as never, s.id, step),
			() => moveStep(who as never, s.id, 'down'),
			() => deleteStep(who as never, s.id),
			() => publish(who as never, d.id)
		];
		// View before edit: the same answer as for a build that does not exist, so a draft's existence never leaks.
		for (const attempt of attempts(other)) expect(await statusOf(attempt())).toBe(404);
		for (const attempt of attempts(moderator)) expect(await statusOf(attempt())).toBe(404);
		for (const attempt of attempts(null)) expect(await statusOf(attempt())).toBe(401);

		await publish(maker, d.id);
		expect(await statusOf(archive(other, d.id))).toBe(403);
		expect(await statusOf(updateBuild(other, d.id, fields()))).toBe(403);
		expect((await stepTitles(d.id)).map((x) => x.title)).toEqual(['Mine']);
		expect((await buildRow(d.id)).status).toBe('published');
	});

	it('lets an admin edit any build', async () => {
		const d = await createDraft(maker.id, fields());
		await addStep(admin, d.id, { title: 'Added by an admin', bodyMd: '' });
		expect((await stepTitles(d.id)).map((x) => x.title)).toEqual(['Added by an admin']);
	});

	it('lets moderators lock a build (audited); its maker then cannot change it', async () => {
		const d = await createDraft(maker.id, fields());
		const s = await addStep(maker, d.id, { title: 'Step', bodyMd: '' });
		expect(await statusOf(setBuildLocked(other, d.id, true, 'no reason'))).toBe(403);
		expect(await statusOf(setBuildLocked(moderator, d.id, true, ''))).toBe(422);
		// A moderator cannot see another member's draft, so cannot lock it either.
		expect(await statusOf(setBuildLocked(moderator, d.id, true, 'Unsafe mains wiring advice under discussion'))).toBe(404);
		expect((await buildRow(d.id)).locked).toBe(false);
		await publish(maker, d.id);

		await setBuildLocked(moderator, d.id, true, 'Unsafe mains wiring advice under discussion');
		expect(await buildRow(d.id)).toMatchObject({ locked: true, lockedReason: 'Unsafe mains wiring advice under discussion' });
		expect(await statusOf(updateStep(maker, s.id, { title: 'Edited', bodyMd: '' }))).toBe(403);
		expect(await statusOf(updateBuild(maker, d.id, fields()))).toBe(403);

		await setBuildLocked(moderator, d.id, false, 'Resolved with the maker');
		await updateStep(maker, s.id, { title: 'Edited', bodyMd: '' });
		const audit = await db
			.select({ action: schema.auditEntry.action, reason: schema.auditEntry.reason, actorId: schema.auditEntry.actorId })
			.from(schema.auditEntry)
			.where(eq(schema.auditEntry.targetId, d.id))
			.orderBy(asc(schema.auditEntry.createdAt));
		expect(audit).toEqual([
			{ action: 'build.lock', reason: 'Unsafe mains wiring advice under discussion', actorId: moderator.id },
			{ action: 'build.unlock', reason: 'Resolved with the maker', actorId: moderator.id }
		]);
	});
});

describe('derive', () => {
	it('copies parts and spec blocks (not steps) into a draft of the deriver, in one transaction', async () => {
		const o = await createDraft(maker.id, fields());
		await addStep(maker, o.id, { title: 'Origin step', bodyMd: 'Private text' });
		await db.insert(schema.specBlock).values({
			buildId: o.id,
			kind: 'supply',
			title: 'Rails',
			data: { mainsVac: 230 },
			derived: { peakDcV: 31.4 },
			checks: [{ id: 'supply.no-fuse', level: 'danger', message: 'No fuse', values: {} }]
		});
		await db.insert(schema.partLine).values([
			{ buildId: o.id, position: 0, designators: 'R1', kind: 'resistor', valueText: '4k7', value: 4700, unit: 'ohm' },
			{ buildId: o.id, position: 1, designators: 'C1', kind: 'capacitor', valueText: '1u', value: 1e-6, unit: 'F', designValueText: '470n', designValue: 4.7e-7, substitutionReason: 'on hand', deviationPct: 6.4 }
		]);

		expect(await statusOf(derive(other, o.id))).toBe(404); // a draft cannot be derived (and looks absent)
		await publish(maker, o.id);
		expect(await statusOf(derive(null as never, o.id))).toBe(401);

		const child = await derive(other, o.id);
		const c = await buildRow(child.id);
		expect(c).toMatchObject({ ownerId: other.id, status: 'draft', derivedFromId: o.id, category: 'power-amp', mainsPowered: true });
		expect(c.title.endsWith('(my build)')).toBe(true);
		expect((await buildRow(o.id)).derivedCount).toBe(1);

		const parts = await db.select().from(schema.partLine).where(eq(schema.partLine.buildId, child.id)).orderBy(asc(schema.partLine.position));
		expect(parts.map((p) => [p.designators, p.valueText, p.designValueText, p.deviationPct])).toEqual([
			['R1', '4k7', null, null],
			['C1', '1u', '470n', 6.4]
		]);
		const blocks = await db.select().from(schema.specBlock).where(eq(schema.specBlock.buildId, child.id));
		expect(blocks).toHaveLength(1);
		expect(blocks[0]).toMatchObject({ kind: 'supply', data: { mainsVac: 230 }, derived: { peakDcV: 31.4 } });
		expect(await stepTitles(child.id)).toEqual([]);
		expect(c.searchText).toContain('4k7');

		// The origin lists the derived draft to its deriver only; readers see it once it is published.
		expect((await loadLineage({ id: o.id, derivedFromId: null }, other)).derivedBuilds.map((l) => l.slug)).toEqual([child.slug]);
		expect((await loadLineage({ id: o.id, derivedFromId: null }, null)).derivedBuilds).toEqual([]);
		const childLineage = await loadLineage(c, other);
		expect(childLineage.derivedFrom?.slug).toBe((await buildRow(o.id)).slug);

		// The deriver may change their draft; the origin's maker may not (to them the draft is absent).
		expect(await statusOf(addStep(maker, child.id, { title: 'x', bodyMd: '' }))).toBe(404);
		await addStep(other, child.id, { title: 'My own step', bodyMd: '' });
		await publish(other, child.id);
		expect((await loadLineage({ id: o.id, derivedFromId: null }, null)).derivedBuilds.map((l) => l.slug)).toEqual([child.slug]);
	});
	it('takes a title for the new draft, and its slug follows', async () => {
		const o = await createDraft(maker.id, fields());
		await addStep(maker, o.id, { title: 'S', bodyMd: '' });
		await publish(maker, o.id);
		const title = uniqueTitle('Bookshelf version');
		const d = await derive(other, o.id, undefined, { title });
		expect(d.slug).toMatch(/^bookshelf-version-/);
		expect(await buildRow(d.id)).toMatchObject({ title, derivedFromId: o.id });
		expect((await buildRow(o.id)).derivedCount).toBe(1);
	});

	it('a build based on a share-alike build keeps its licence; one based on a permissive build may change it', async () => {
		const sa = await createDraft(maker.id, fields());
		await addStep(maker, sa.id, { title: 'S', bodyMd: '' });
		await publish(maker, sa.id);
		const d = await derive(other, sa.id);
		const row = await buildRow(d.id);
		expect(row.licence).toBe('CC-BY-SA-4.0');
		const input = { title: row.title, summary: '', category: 'power-amp' as const, topology: 'class-ab-chip' as const, mainsPowered: true };
		expect(await statusOf(updateBuild(other, d.id, { ...input, licence: 'CC-BY-4.0' }))).toBe(422);
		expect(await statusOf(updateBuild(other, d.id, { ...input, licence: 'CC0-1.0' }))).toBe(422);
		expect((await buildRow(d.id)).licence).toBe('CC-BY-SA-4.0');
		await updateBuild(other, d.id, { ...input, licence: 'CC-BY-SA-4.0' });

		const by = await createDraft(maker.id, { ...fields(), licence: 'CC-BY-4.0' });
		await addStep(maker, by.id, { title: 'S', bodyMd: '' });
		await publish(maker, by.id);
		const d2 = await derive(other, by.id);
		await updateBuild(other, d2.id, { ...input, title: (await buildRow(d2.id)).title, licence: 'CC0-1.0' });
		expect((await buildRow(d2.id)).licence).toBe('CC0-1.0');
	});
});

describe('published list and detail', () => {
	it('pages newest first with an opaque keyset cursor, without repeats or gaps', async () => {
		const owner = await createTestUser('maker', 'Lister');
		try {
			const made: string[] = [];
			for (let i = 0; i < 5; i++) {
				const d = await createDraft(owner.id, fields(uniqueTitle(`List ${i}`)));
				await addStep(owner, d.id, { title: 'S', bodyMd: '' });
				await publish(owner, d.id);
				made.push(d.slug);
			}
			const seen: string[] = [];
			let cursor = null;
			for (let page = 0; page < 5; page++) {
				const { rows, next } = await listPublishedBuilds({ limit: 2, cursor, filters: { ownerId: owner.id } });
				seen.push(...rows.map((r) => r.slug));
				if (!next) break;
				const text = encodeCursor(next);
				expect(text).toMatch(/^[A-Za-z0-9_-]+$/);
				cursor = decodeCursor(text);
				expect(cursor).toEqual(next);
			}
			expect(seen).toEqual([...made].reverse());

			const detail = await getBuildDetail(made[0], null);
			expect(detail).toMatchObject({ slug: made[0], status: 'published', revision: 1, review: { label: 'unreviewed', verdict: null, currentRevision: 1 }, steps: [{ title: 'S', number: 1 }] });
			expect(detail.lineage).toEqual({ derivedFrom: null, derivedBuilds: [] });
		} finally {
			await removeTestUsers([owner.id]);
		}
	});

	it('refuses cursors it did not make', () => {
		expect(decodeCursor('not a cursor!')).toBeNull();
		expect(decodeCursor(Buffer.from('{"p":"yesterday","i":"x"}').toString('base64url'))).toBeNull();
		expect(decodeCursor(Buffer.from('[1,2]').toString('base64url'))).toBeNull();
		expect(decodeCursor('')).toBeNull();
	});
});
