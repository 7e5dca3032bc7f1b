/**
 * Revisions Rev A, Rev B, … (numbers 1, 2, …; letters by $lib/revision-label): edits to a published build
 * collect as pending changes; the maker publishes them as one revision with a short change note. Each
 * revision freezes a snapshot (build fields, steps, spec blocks, parts) with a summary of what changed
 * since the previous one. A verdict belongs to one revision.
 */
import { error } from '@sveltejs/kit';
import { and, asc, desc, eq, gt, isNotNull, ne, sql } from 'drizzle-orm';
import * as schema from '../db/schema';
import type { Tx } from '../db';
import { db } from '../db';
import { diffSnapshots, partLineOfSnapshot, snapshotPart, snapshotSpecBlock, summarize, type BuildSnapshot } from './snapshot';
import { findPhotoViews } from '../photos';
import { inTx, type DbLike } from '../db/tx';
import type { Actor } from '../actor';
import { assertCanEdit } from './access';
import { revisionLabel } from '$lib/revision-label';
import { refreshFindIndex } from './find-index';
import { markRemovedPhotos, placedPhotoIds } from './steps';

/** Read the build's current content into a snapshot (in the caller's transaction, to see its writes). */
export async function takeSnapshot(tx: DbLike, buildId: string): Promise<BuildSnapshot> {
	const [b] = await tx.select().from(schema.build).where(eq(schema.build.id, buildId));
	if (!b) throw new Error(`build ${buildId} does not exist`);
	const [steps, photos, specBlocks, parts, attachments] = await Promise.all([
		tx.select().from(schema.buildStep).where(eq(schema.buildStep.buildId, buildId)).orderBy(asc(schema.buildStep.position), asc(schema.buildStep.createdAt)),
		tx
			.select({ id: schema.photo.id, stepId: schema.photo.stepId })
			.from(schema.photo)
			.where(and(eq(schema.photo.buildId, buildId), isNotNull(schema.photo.stepId)))
			.orderBy(asc(schema.photo.position), asc(schema.photo.createdAt)),
		tx.select().from(schema.specBlock).where(eq(schema.specBlock.buildId, buildId)).orderBy(asc(schema.specBlock.position), asc(schema.specBlock.createdAt)),
		tx.select().from(schema.partLine).where(eq(schema.partLine.buildId, buildId)).orderBy(asc(schema.partLine.position)),
		tx
			.select({ id: schema.buildAttachment.id, name: schema.buildAttachment.name, kind: schema.buildAttachment.kind })
			.from(schema.buildAttachment)
			.where(eq(schema.buildAttachment.buildId, buildId))
			.orderBy(asc(schema.buildAttachment.position), asc(schema.buildAttachment.createdAt))
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
		specBlocks: specBlocks.map(snapshotSpecBlock),
		parts: parts.map(snapshotPart),
		attachments
	};
}

/** Longest change note a maker can give a revision. */
export const REVISION_NOTE_MAX = 500;

/** Mark a published or archived build as having changes not yet published as a revision (keeps the first time). */
export async function markPendingChanges(tx: Tx, buildId: string): Promise<void> {
	await tx
		.update(schema.build)
		.set({ pendingChangesAt: sql`coalesce(${schema.build.pendingChangesAt}, now())` })
		.where(and(eq(schema.build.id, buildId), gt(schema.build.revision, 0), ne(schema.build.status, 'draft')));
}

/** The latest revision row of a build (with its snapshot), or undefined. */
async function latestRevision(tx: DbLike, buildId: string) {
	const [last] = await tx
		.select()
		.from(schema.buildRevision)
		.where(eq(schema.buildRevision.buildId, buildId))
		.orderBy(desc(schema.buildRevision.number))
		.limit(1);
	return last;
}

/**
 * Freeze the build's content as its next revision, in the caller's transaction (the build row is locked
 * here: two publications at once cannot take the same number). Nothing is recorded (→ null) when nothing a
 * reader would see changed since the latest revision. Clears the pending changes either way; rewrites the find index (find-index.ts) from the new revision.
 * → { number: 3, summary: '1 step changed, parts: 1 added' }
 */
export async function createRevision(
	tx: Tx,
	buildId: string,
	authorId: string | null,
	note = ''
): Promise<{ number: number; summary: string } | null> {
	const [b] = await tx.select().from(schema.build).where(eq(schema.build.id, buildId)).for('update');
	if (!b) throw new Error(`build ${buildId} does not exist`);
	const snapshot = await takeSnapshot(tx, buildId);
	const last = await latestRevision(tx, buildId);
	const prev = (last?.snapshot as unknown as BuildSnapshot | undefined) ?? null;
	await tx.update(schema.build).set({ pendingChangesAt: null }).where(eq(schema.build.id, buildId));
	if (prev && diffSnapshots(prev, snapshot).length === 0) return null;
	const number = Math.max(b.revision, last?.number ?? 0) + 1;
	const summary = summarize(prev, snapshot);
	await tx.insert(schema.buildRevision).values({
		buildId,
		number,
		authorId,
		summary,
		note: note.trim(),
		snapshot: snapshot as unknown as Record<string, unknown>
	});
	await tx.update(schema.build).set({ revision: number, updatedAt: new Date() }).where(eq(schema.build.id, buildId));
	await refreshFindIndex(tx, buildId);
	return { number, summary };
}

/**
 * What changed since the latest revision and is not yet published as one: the phrases of diffSnapshots
 * (empty when an edit was undone), the latest revision number and since when changes are pending.
 */
export async function pendingChanges(
	buildId: string,
	dbx: DbLike = db
): Promise<{ revision: number; since: Date | null; changes: string[] }> {
	const [b] = await dbx
		.select({ revision: schema.build.revision, since: schema.build.pendingChangesAt })
		.from(schema.build)
		.where(eq(schema.build.id, buildId));
	if (!b || b.revision === 0) return { revision: b?.revision ?? 0, since: null, changes: [] };
	const last = await latestRevision(dbx, buildId);
	if (!last) return { revision: b.revision, since: b.since, changes: [] };
	const changes = diffSnapshots(last.snapshot as unknown as BuildSnapshot, await takeSnapshot(dbx, buildId));
	return { revision: b.revision, since: b.since, changes };
}

/** True when a reviewer has ever signed the build off (its revisions then need a change note). */
export async function wasSignedOff(buildId: string, dbx: DbLike = db): Promise<boolean> {
	const [row] = await dbx
		.select({ id: schema.review.id })
		.from(schema.review)
		.where(and(eq(schema.review.buildId, buildId), eq(schema.review.verdict, 'safe')))
		.limit(1);
	return !!row;
}

/**
 * Publish a published build's pending changes as ONE new revision with the maker's change note (owner or
 * admin; not while locked). The note is required once a reviewer has signed the build off, so readers and
 * reviewers see what changed since. 409 when nothing changed since the latest revision; 422 for a missing
 * or overlong note. → { number, summary }
 */
export async function publishRevision(actor: Actor, buildId: string, noteText: string, tx?: Tx): Promise<{ number: number; summary: string }> {
	const note = noteText.replace(/\s+/g, ' ').trim();
	if (note.length > REVISION_NOTE_MAX) error(422, `Keep the change note under ${REVISION_NOTE_MAX} characters.`);
	return inTx(tx, async (t) => {
		const [b] = await t.select().from(schema.build).where(eq(schema.build.id, buildId)).for('update');
		if (!b) error(404, 'Not found');
		assertCanEdit(actor, b);
		if (b.status !== 'published') error(409, 'Only a published build gets revisions: publish it first.');
		if (note === '' && (await wasSignedOff(buildId, t)))
			error(422, 'Say in a few words what changed: a reviewer signed this build off, and they and readers need to know what is different now.');
		const rev = await createRevision(t, buildId, actor.id, note);
		if (!rev) error(409, `Nothing has changed since ${revisionLabel(b.revision)}: there is nothing to publish.`);
		return rev;
	});
}

/** Revisions of a build, newest first, without their snapshots (for the revisions page). */
export async function listRevisions(buildId: string, dbx: DbLike = db) {
	return dbx
		.select({
			number: schema.buildRevision.number,
			summary: schema.buildRevision.summary,
			note: schema.buildRevision.note,
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
			note: schema.buildRevision.note,
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
	const photos = await findPhotoViews(snap.steps.flatMap((s) => [...(s.photoIds ?? []), ...placedPhotoIds(s.bodyHtml)]), dbx);
	return {
		revision: { number: rev.number, summary: rev.summary, note: rev.note, createdAt: rev.createdAt, authorName: rev.authorName },
		snapshot: {
			build: snap.build,
			steps: snap.steps.map((s) => ({
				id: s.id,
				title: s.title,
				bodyHtml: markRemovedPhotos(s.bodyHtml, (id) => photos.has(id)),
				photos: (s.photoIds ?? []).map((id) => photos.get(id)).filter((p) => !!p),
				photosGone: (s.photoIds ?? []).filter((id) => !photos.has(id)).length
			})),
			specBlocks: snap.specBlocks,
			parts: snap.parts.map((p, i) => ({ ...partLineOfSnapshot(p), position: i, checks: (p.checks ?? []) as schema.StoredCheck[] }))
		}
	};
}
