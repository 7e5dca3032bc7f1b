/**
 * Revisions r1, r2, …: every save of a published build freezes a snapshot (build fields, steps, spec
 * blocks, parts) with a summary of what changed since the previous one. A verdict belongs to one revision.
 */
import { and, asc, desc, eq, isNotNull } from 'drizzle-orm';
import * as schema from '../db/schema';
import type { Tx } from '../db';
import { db } from '../db';
import { diffSnapshots, summarize, type BuildSnapshot } from './snapshot';
import { findPhotoViews } from '../photos';
import type { DbLike } from '../db/tx';

/** Read the build's current content into a snapshot (in the caller's transaction, to see its writes). */
export async function takeSnapshot(tx: DbLike, buildId: string): Promise<BuildSnapshot> {
	const [b] = await tx.select().from(schema.build).where(eq(schema.build.id, buildId));
	if (!b) throw new Error(`build ${buildId} does not exist`);
	const [steps, photos, specBlocks, parts] = await Promise.all([
		tx.select().from(schema.buildStep).where(eq(schema.buildStep.buildId, buildId)).orderBy(asc(schema.buildStep.position), asc(schema.buildStep.createdAt)),
		tx
			.select({ id: schema.photo.id, stepId: schema.photo.stepId })
			.from(schema.photo)
			.where(and(eq(schema.photo.buildId, buildId), isNotNull(schema.photo.stepId)))
			.orderBy(asc(schema.photo.position), asc(schema.photo.createdAt)),
		tx.select().from(schema.specBlock).where(eq(schema.specBlock.buildId, buildId)).orderBy(asc(schema.specBlock.position), asc(schema.specBlock.createdAt)),
		tx.select().from(schema.partLine).where(eq(schema.partLine.buildId, buildId)).orderBy(asc(schema.partLine.position))
	]);
	return {
		version: 1,
		build: {
			title: b.title,
			summary: b.summary,
			category: b.category,
			topology: b.topology,
			mainsPowered: b.mainsPowered,
			licence: b.licence,
			coverPhotoId: b.coverPhotoId
		},
		steps: steps.map((s) => ({
			id: s.id,
			title: s.title,
			bodyMd: s.bodyMd,
			bodyHtml: s.bodyHtml,
			photoIds: photos.filter((p) => p.stepId === s.id).map((p) => p.id)
		})),
		specBlocks: specBlocks.map((s) => ({
			id: s.id,
			kind: s.kind,
			title: s.title,
			data: s.data,
			derived: s.derived,
			checks: s.checks
		})),
		parts: parts.map((p) => ({
			id: p.id,
			designators: p.designators,
			quantity: p.quantity,
			kind: p.kind,
			valueText: p.valueText,
			value: p.value,
			unit: p.unit,
			tolerancePct: p.tolerancePct,
			ratingV: p.ratingV,
			ratingW: p.ratingW,
			package: p.package,
			notes: p.notes,
			designValueText: p.designValueText,
			designValue: p.designValue,
			substitutionReason: p.substitutionReason,
			deviationPct: p.deviationPct,
			checks: p.checks
		}))
	};
}

/**
 * Record a revision of a *published* build after a save, in the caller's transaction: bumps
 * `build.revision` and stores the snapshot with its diff summary. Does nothing (returns null) for drafts
 * and archived builds, and when nothing a reader would see changed since the last revision, so an
 * idle "Save" does not make a reviewed revision look outdated. Parts and spec-block editors call this
 * after their own saves. `note`, when given, is stored as the summary instead of the computed one.
 * → { number: 3, summary: '1 step changed, parts: 1 added' }
 */
export async function recordRevision(
	tx: Tx,
	buildId: string,
	authorId: string | null,
	note?: string
): Promise<{ number: number; summary: string } | null> {
	// Lock the build row: two saves at once must not both take the same number.
	const [b] = await tx.select().from(schema.build).where(eq(schema.build.id, buildId)).for('update');
	if (!b || b.status !== 'published') return null;
	const snapshot = await takeSnapshot(tx, buildId);
	const [last] = await tx
		.select()
		.from(schema.buildRevision)
		.where(eq(schema.buildRevision.buildId, buildId))
		.orderBy(desc(schema.buildRevision.number))
		.limit(1);
	const prev = (last?.snapshot as unknown as BuildSnapshot | undefined) ?? null;
	if (prev && diffSnapshots(prev, snapshot).length === 0) return null;
	const number = Math.max(b.revision, last?.number ?? 0) + 1;
	const summary = note?.trim() || summarize(prev, snapshot);
	await tx.insert(schema.buildRevision).values({
		buildId,
		number,
		authorId,
		summary,
		snapshot: snapshot as unknown as Record<string, unknown>
	});
	await tx.update(schema.build).set({ revision: number, updatedAt: new Date() }).where(eq(schema.build.id, buildId));
	return { number, summary };
}

/** Revisions of a build, newest first, without their snapshots (for the revisions page). */
export async function listRevisions(buildId: string, dbx: DbLike = db) {
	return dbx
		.select({
			number: schema.buildRevision.number,
			summary: schema.buildRevision.summary,
			createdAt: schema.buildRevision.createdAt,
			authorName: schema.user.name,
			authorHandle: schema.user.handle
		})
		.from(schema.buildRevision)
		.leftJoin(schema.user, eq(schema.user.id, schema.buildRevision.authorId))
		.where(eq(schema.buildRevision.buildId, buildId))
		.orderBy(desc(schema.buildRevision.number));
}

/** One revision with its snapshot, or null. */
export async function getRevision(buildId: string, number: number, dbx: DbLike = db) {
	const [row] = await dbx
		.select({
			number: schema.buildRevision.number,
			summary: schema.buildRevision.summary,
			createdAt: schema.buildRevision.createdAt,
			snapshot: schema.buildRevision.snapshot,
			authorName: schema.user.name,
			authorHandle: schema.user.handle
		})
		.from(schema.buildRevision)
		.leftJoin(schema.user, eq(schema.user.id, schema.buildRevision.authorId))
		.where(and(eq(schema.buildRevision.buildId, buildId), eq(schema.buildRevision.number, number)));
	if (!row) return null;
	return { ...row, snapshot: row.snapshot as unknown as BuildSnapshot };
}

/**
 * One revision as its page shows it: the snapshot's steps with the photos that still exist (ones deleted
 * since are counted as gone), its spec blocks and parts list. null when the build has no such revision.
 */
export async function getRevisionView(buildId: string, number: number, dbx: DbLike = db) {
	const rev = await getRevision(buildId, number, dbx);
	if (!rev) return null;
	const snap = rev.snapshot;
	const photos = await findPhotoViews(snap.steps.flatMap((s) => s.photoIds ?? []), dbx);
	return {
		revision: { number: rev.number, summary: rev.summary, createdAt: rev.createdAt, authorName: rev.authorName },
		snapshot: {
			build: snap.build,
			steps: snap.steps.map((s) => ({
				id: s.id,
				title: s.title,
				bodyHtml: s.bodyHtml,
				photos: (s.photoIds ?? []).map((id) => photos.get(id)).filter((p) => !!p),
				photosGone: (s.photoIds ?? []).filter((id) => !photos.has(id)).length
			})),
			specBlocks: snap.specBlocks,
			parts: snap.parts.map((p, i) => ({ ...p, position: i, checks: (p.checks ?? []) as schema.StoredCheck[] }))
		}
	};
}
