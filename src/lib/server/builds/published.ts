/**
 * What a reader sees of a build: its PUBLISHED snapshot (the latest revision), never the maker's pending
 * changes. Only the maker and admins (who may edit it) see the live content. The snapshot is turned into
 * the same shape loadBuildContent reads, so pages and the API serialize it the same way.
 */
import { and, eq } from 'drizzle-orm';
import * as schema from '../db/schema';
import { db } from '../db';
import type { DbLike } from '../db/tx';
import type { Viewer } from '../actor';
import { canEdit, isOwner } from './access';
import { findPhotoViews } from '../photos';
import { markRemovedPhotos, placedPhotoIds } from './steps';
import { partLineOfSnapshot, type BuildSnapshot } from './snapshot';
import type { BuildContent } from './queries';

/** True when `viewer` sees the live content of `b` (its maker or whoever may edit it); readers see the published snapshot. */
export function seesLiveContent(viewer: Viewer, b: Pick<schema.Build, 'ownerId' | 'status' | 'locked' | 'lockedReason' | 'revision'>): boolean {
	return b.status === 'draft' || b.revision === 0 || isOwner(viewer, b) || canEdit(viewer, b);
}

/**
 * The build as of its latest revision: the build row with the snapshot's fields (title, summary, …,
 * cover) and the snapshot's steps (with the photos that still exist), spec blocks and parts list, in
 * loadBuildContent's shape. null when the build has no revision row (then the caller shows live content).
 */
export async function loadPublishedContent(b: schema.Build, dbx: DbLike = db): Promise<{ build: schema.Build; content: BuildContent } | null> {
	const [rev] = await dbx
		.select({ snapshot: schema.buildRevision.snapshot, createdAt: schema.buildRevision.createdAt })
		.from(schema.buildRevision)
		.where(and(eq(schema.buildRevision.buildId, b.id), eq(schema.buildRevision.number, b.revision)));
	if (!rev) return null;
	const snap = rev.snapshot as unknown as BuildSnapshot;
	const coverId = snap.build.coverPhotoId ?? null;
	const placed = snap.steps.flatMap((s) => placedPhotoIds(s.bodyHtml));
	const photos = await findPhotoViews([...(coverId ? [coverId] : []), ...snap.steps.flatMap((s) => s.photoIds ?? []), ...placed], dbx);
	const at = rev.createdAt;
	const build: schema.Build = {
		...b,
		title: snap.build.title,
		summary: snap.build.summary,
		category: snap.build.category,
		topology: snap.build.topology,
		mainsPowered: snap.build.mainsPowered,
		licence: snap.build.licence,
		coverPhotoId: coverId
	};
	return {
		build,
		content: {
			cover: coverId ? (photos.get(coverId) ?? null) : null,
			steps: snap.steps.map((s, i) => ({
				id: s.id,
				buildId: b.id,
				position: i,
				title: s.title,
				bodyMd: s.bodyMd,
				// Photos placed in the text and deleted since read as a sentence, not a broken image.
				bodyHtml: markRemovedPhotos(s.bodyHtml, (id) => photos.has(id)),
				createdAt: at,
				updatedAt: at,
				photos: (s.photoIds ?? []).map((id) => photos.get(id)).filter((p) => !!p)
			})),
			specBlocks: snap.specBlocks.map((s, i) => ({
				id: s.id,
				buildId: b.id,
				kind: s.kind,
				title: s.title,
				data: s.data,
				derived: s.derived,
				checks: (s.checks ?? []) as schema.StoredCheck[],
				position: i,
				createdAt: at,
				updatedAt: at
			})),
			// Fields a snapshot predates get their defaults (snapshot.ts partLineOfSnapshot).
			parts: snap.parts.map((p, i) => ({ ...partLineOfSnapshot(p), buildId: b.id, position: i, checks: (p.checks ?? []) as schema.StoredCheck[] }))
		}
	};
}
