/**
 * Compare any two builds a viewer may see (PRODUCT.md "compare"): parts lists and spec blocks side by side.
 * A draft is compared only for those who may see it (its maker, admins); for anyone else it is absent (404),
 * as everywhere. The other build is named by its slug or by a link to it (`/builds/<slug>` or a full URL).
 */
import { error } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import * as schema from '../db/schema';
import { db } from '../db';
import type { Viewer } from '../actor';
import { canView } from './access';
import { getMaker, requireVisibleBuild } from './queries';
import { listPartLines } from '../parts';
import { listSpecBlocks } from '../specs';
import { loadPublishedContent, seesLiveContent } from './published';

/** The slug in what a reader typed to name a build: "my-amp", "/builds/my-amp", "https://…/builds/my-amp/compare". null when none. */
export function slugFromInput(text: string): string | null {
	const t = text.trim();
	if (t.length === 0 || t.length > 500) return null;
	const m = /\/builds\/([a-z0-9][a-z0-9-]*)/i.exec(t) ?? /^([a-z0-9][a-z0-9-]*)$/i.exec(t);
	return m ? m[1].toLowerCase() : null;
}

/**
 * What one side of a comparison shows: the build, its maker, its parts list and spec blocks in display order —
 * as last published for readers, live for those who may edit it (as on the build page, ./published).
 */
async function side(b: schema.Build, viewer: Viewer) {
	const published = seesLiveContent(viewer, b) ? null : await loadPublishedContent(b);
	const [maker, parts, specBlocks] = await Promise.all([
		getMaker(b.ownerId),
		published ? published.content.parts : listPartLines(b.id),
		published ? published.content.specBlocks : listSpecBlocks(b.id)
	]);
	return {
		build: { slug: b.slug, title: b.title, status: b.status, revision: b.revision, topology: b.topology, mainsPowered: b.mainsPowered },
		maker: { name: maker.name, handle: maker.handle },
		parts,
		specBlocks: specBlocks.map((s) => ({ id: s.id, kind: s.kind, title: s.title, data: s.data, derived: s.derived, checks: s.checks }))
	};
}

export type CompareSide = Awaited<ReturnType<typeof side>>;

/**
 * Two builds side by side: `slug` (404 unless `viewer` may see it) against `withSlug`, or — without one — the
 * build it is based on (null when it is not based on one, or that build is no longer visible). 404 for a
 * `withSlug` the viewer may not see; 400 when both name the same build.
 */
export async function compareBuilds(slug: string, withSlug: string | null, viewer: Viewer) {
	const a = await requireVisibleBuild(slug, viewer);
	let b: schema.Build | null = null;
	let basedOn = false;
	if (withSlug) {
		b = await requireVisibleBuild(withSlug, viewer);
		if (b.id === a.id) error(400, 'That is the same build: choose another one to compare with.');
		basedOn = a.derivedFromId === b.id;
	} else if (a.derivedFromId) {
		const [origin] = await db.select().from(schema.build).where(eq(schema.build.id, a.derivedFromId));
		if (origin && canView(viewer, origin)) {
			b = origin;
			basedOn = true;
		}
	}
	const [left, right] = await Promise.all([side(a, viewer), b ? side(b, viewer) : Promise.resolve(null)]);
	return { left, right, basedOn };
}
