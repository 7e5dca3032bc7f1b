/**
 * "I built this too" (PRODUCT.md §3): a member records that they built a published build — or their own build
 * based on it — with the figures they measured (a bring-up block and a measurements block, checked by the same
 * schemas and checks as any spec block) and a photo. The original shows how many built it and their figures
 * side by side. One record per member and build; recording again replaces the figures.
 */
import { error } from '@sveltejs/kit';
import { and, asc, eq, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { db } from './db';
import * as schema from './db/schema';
import type { Actor, Viewer } from './actor';
import { getBuildBySlug } from './builds/queries';
import { canView } from './builds/access';
import { slugFromInput } from './builds/compare';
import { validateSpec } from './specs';
import { findPhotoViews, processAndStorePhoto, deletePhoto } from './photos';
import { serializePhoto } from './builds/serialize';
import { blocksOfForm, fieldOfIssue, figuresOf, referenceFigures, type BuiltItForm } from '$lib/schemas/built-it';

export type StoredReportBlock = { kind: string; data: Record<string, unknown>; derived: Record<string, unknown>; checks: schema.StoredCheck[] };

/** The published build a member may record as built: 404 when they cannot see it, 409 for their own or an unpublished one. */
async function buildToRecord(actor: Actor, slug: string): Promise<schema.Build> {
	const b = await getBuildBySlug(slug);
	if (!b || !canView(actor, b)) error(404, 'Not found');
	if (b.status !== 'published') error(409, 'Only a published build can be recorded as built.');
	if (b.ownerId === actor.id) error(409, 'This is your own build: its bring-up and measurement blocks belong in the build itself.');
	return b;
}

/**
 * Record (or replace) that `actor` built the build at `slug`, with the figures of the form. Each block is checked
 * like any spec block; problems come back per form field and nothing is stored. `basedOn` names the member's own
 * published build based on this one (by link or short name). → { ok: true, id } | { ok: false, issues }.
 */
export async function recordBuiltIt(
	actor: Actor,
	slug: string,
	form: BuiltItForm
): Promise<{ ok: true; id: string; created: boolean } | { ok: false; issues: { path: string; message: string }[] }> {
	const b = await buildToRecord(actor, slug);
	const issues: { path: string; message: string }[] = [];
	let basedOnId: string | null = null;
	if (form.basedOn) {
		const s = slugFromInput(form.basedOn);
		const own = s ? await getBuildBySlug(s) : null;
		if (!own || own.ownerId !== actor.id || own.derivedFromId !== b.id || own.status !== 'published')
			issues.push({ path: 'basedOn', message: 'must be one of your published builds started from this one (leave it empty otherwise)' });
		else basedOnId = own.id;
	}
	const blocks: StoredReportBlock[] = [];
	for (const blk of blocksOfForm(form)) {
		const v = validateSpec(blk.kind, blk.data);
		if (!v.ok) for (const i of v.issues) issues.push({ path: fieldOfIssue(blk.kind, i.path), message: i.message });
		else blocks.push({ kind: v.kind, data: v.data, derived: v.derived, checks: v.checks });
	}
	if (issues.length) return { ok: false, issues };
	const [row] = await db
		.insert(schema.buildReport)
		.values({ buildId: b.id, userId: actor.id, basedOnId, note: form.note, blocks })
		.onConflictDoUpdate({
			target: [schema.buildReport.buildId, schema.buildReport.userId],
			set: { basedOnId, note: form.note, blocks, updatedAt: new Date() }
		})
		// xmax = 0 on the returned row: it was inserted, not updated (PostgreSQL's upsert idiom).
		.returning({ id: schema.buildReport.id, created: sql<boolean>`(xmax = 0)` });
	return { ok: true, id: row.id, created: row.created };
}

/** Remove the member's record of building it (and its photo). Harmless when there is none. */
export async function removeBuiltIt(actor: Actor, slug: string): Promise<void> {
	const b = await getBuildBySlug(slug);
	if (!b || !canView(actor, b)) error(404, 'Not found');
	const [row] = await db
		.delete(schema.buildReport)
		.where(and(eq(schema.buildReport.buildId, b.id), eq(schema.buildReport.userId, actor.id)))
		.returning({ photoId: schema.buildReport.photoId });
	if (row?.photoId) await deletePhoto(row.photoId);
}

/**
 * Add (or replace) the photo of the member's record: stored like a build photo of the original (public while it
 * is published), outside its steps and cover. 404 when the member has no record on this build.
 */
export async function setBuiltItPhoto(actor: Actor, slug: string, bytes: Uint8Array, alt: string): Promise<void> {
	const b = await buildToRecord(actor, slug);
	const [rec] = await db
		.select({ id: schema.buildReport.id, photoId: schema.buildReport.photoId })
		.from(schema.buildReport)
		.where(and(eq(schema.buildReport.buildId, b.id), eq(schema.buildReport.userId, actor.id)));
	if (!rec) error(404, 'Record that you built it first, then add your photo.');
	const photo = await processAndStorePhoto({ ownerId: actor.id, buildId: b.id, bytes, alt });
	await db.update(schema.buildReport).set({ photoId: photo.id, updatedAt: new Date() }).where(eq(schema.buildReport.id, rec.id));
	if (rec.photoId) await deletePhoto(rec.photoId);
}

const member = alias(schema.user, 'builder');
const basedOn = alias(schema.build, 'based_on');

/**
 * Who built `buildId`, oldest record first, as `viewer` may see them: each member's figures (rails, DC offset,
 * power at 1 % THD), checks, note, photo and the build of theirs based on it (only when visible).
 */
export async function listBuiltIt(buildId: string, viewer: Viewer) {
	const rows = await db
		.select({
			id: schema.buildReport.id,
			userId: schema.buildReport.userId,
			note: schema.buildReport.note,
			blocks: schema.buildReport.blocks,
			photoId: schema.buildReport.photoId,
			createdAt: schema.buildReport.createdAt,
			updatedAt: schema.buildReport.updatedAt,
			name: member.name,
			handle: member.handle,
			basedOnSlug: basedOn.slug,
			basedOnTitle: basedOn.title,
			basedOnStatus: basedOn.status,
			basedOnOwner: basedOn.ownerId
		})
		.from(schema.buildReport)
		.innerJoin(member, eq(member.id, schema.buildReport.userId))
		.leftJoin(basedOn, eq(basedOn.id, schema.buildReport.basedOnId))
		.where(eq(schema.buildReport.buildId, buildId))
		.orderBy(asc(schema.buildReport.createdAt), asc(schema.buildReport.id))
		.limit(500);
	const photos = await findPhotoViews(rows.flatMap((r) => (r.photoId ? [r.photoId] : [])));
	return rows.map((r) => {
		const blocks = (r.blocks ?? []) as StoredReportBlock[];
		const visibleBasedOn = r.basedOnSlug && r.basedOnStatus && canView(viewer, { ownerId: r.basedOnOwner!, status: r.basedOnStatus });
		return {
			id: r.id,
			mine: viewer?.id === r.userId,
			member: { name: r.name, handle: r.handle },
			note: r.note,
			blocks,
			figures: figuresOf(blocks),
			photo: r.photoId ? (photos.get(r.photoId) ?? null) : null,
			basedOn: visibleBasedOn ? { slug: r.basedOnSlug!, title: r.basedOnTitle! } : null,
			recordedAt: r.updatedAt.toISOString()
		};
	});
}

/** How many members recorded that they built it. */
export async function countBuiltIt(buildId: string): Promise<number> {
	const [r] = await db.select({ n: sql<number>`count(*)::int` }).from(schema.buildReport).where(eq(schema.buildReport.buildId, buildId));
	return r?.n ?? 0;
}

/**
 * The build page's "built by others" panel: the records, and the build's own figures to compare them with, from
 * the spec blocks the page shows (`specBlocks`: the published ones for readers).
 */
export async function builtItPanel(
	build: Pick<schema.Build, 'id'>,
	viewer: Viewer,
	specBlocks: readonly { kind: string; data: Record<string, unknown>; derived: Record<string, unknown> }[]
) {
	return { records: await listBuiltIt(build.id, viewer), reference: referenceFigures([...specBlocks]) };
}

/** A record as the JSON API shows it (`GET /api/v1/builds/{slug}/built-it`): numbers in SI, blocks as stored. */
export function serializeBuiltIt(r: Awaited<ReturnType<typeof listBuiltIt>>[number]) {
	return {
		id: r.id,
		member: r.member,
		mine: r.mine,
		note: r.note,
		basedOn: r.basedOn,
		photo: r.photo ? serializePhoto(r.photo) : null,
		figures: r.figures,
		blocks: r.blocks.map((b) => ({ kind: b.kind, data: b.data, derived: b.derived, checks: b.checks })),
		recordedAt: r.recordedAt
	};
}
