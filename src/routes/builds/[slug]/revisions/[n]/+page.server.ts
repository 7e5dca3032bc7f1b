import { error } from '@sveltejs/kit';
import { inArray } from 'drizzle-orm';
import { db } from '$lib/server/db';
import * as schema from '$lib/server/db/schema';
import { toPhotoView } from '$lib/server/photos';
import { getRevision, requireVisibleBuild } from '$lib/server/builds';
import type { PageServerLoad } from './$types';
import { actorOf } from '$lib/server/actor';

export const load: PageServerLoad = async ({ params, locals }) => {
	const b = await requireVisibleBuild(params.slug, actorOf(locals.user));
	const n = /^[1-9]\d{0,6}$/.test(params.n) ? Number(params.n) : NaN;
	if (!Number.isInteger(n)) error(404, 'Not found');
	const rev = await getRevision(b.id, n);
	if (!rev) error(404, 'Not found');
	const snap = rev.snapshot;
	// Photos that still exist; ones deleted since this revision are listed as gone.
	const ids = snap.steps.flatMap((s) => s.photoIds ?? []);
	const rows = ids.length ? await db.select().from(schema.photo).where(inArray(schema.photo.id, ids)) : [];
	const photos = new Map(rows.map((p) => [p.id, toPhotoView(p)]));
	return {
		build: { slug: b.slug, title: b.title, revision: b.revision },
		revision: { number: rev.number, summary: rev.summary, note: rev.note, createdAt: rev.createdAt, authorName: rev.authorName },
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
};
