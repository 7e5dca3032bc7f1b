/** Reads for build pages: one build with its content and lineage, checked against who is looking. */
import { error } from '@sveltejs/kit';
import { and, asc, desc, eq, ne, or } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import * as schema from '../db/schema';
import { db } from '../db';
import { toPhotoView } from '../photos';
import type { Viewer } from '../actor';
import { assertCanView, canView } from './access';
import { isSlugShaped } from './slug';
import { serializeBuildDetail } from './serialize';
import { getReviewState } from '../reviews/state';
import type { DbLike } from '../db/tx';
import { loadPublishedContent, seesLiveContent } from './published';

/** The build row with this slug, or null (no visibility check: callers decide). */
export async function getBuildBySlug(slug: string, dbx: DbLike = db): Promise<schema.Build | null> {
	if (!isSlugShaped(slug)) return null;
	const [row] = await dbx.select().from(schema.build).where(eq(schema.build.slug, slug));
	return row ?? null;
}

/** What the reader cache needs of the build with this slug (id, status, view version): one small indexed read. */
export async function getBuildHead(slug: string, dbx: DbLike = db) {
	if (!isSlugShaped(slug)) return null;
	const b = schema.build;
	const [row] = await dbx.select({ id: b.id, status: b.status, viewVersion: b.viewVersion, viewChangedAt: b.viewChangedAt }).from(b).where(eq(b.slug, slug));
	return row ?? null;
}

/** The build with this slug if `viewer` may see it; 404 otherwise (drafts look absent to others). */
export async function requireVisibleBuild(slug: string, viewer: Viewer, dbx: DbLike = db): Promise<schema.Build> {
	const b = await getBuildBySlug(slug, dbx);
	if (!b) error(404, 'Not found');
	assertCanView(viewer, b);
	return b;
}

/** A build's maker as readers see them. */
export async function getMaker(userId: string, dbx: DbLike = db) {
	const [u] = await dbx
		.select({ id: schema.user.id, name: schema.user.name, handle: schema.user.handle })
		.from(schema.user)
		.where(eq(schema.user.id, userId));
	return u ?? { id: userId, name: 'Former member', handle: null };
}

export type PhotoOut = ReturnType<typeof toPhotoView>;

/** Steps (with photos), cover, spec blocks and parts list of a build, each in display order. */
export async function loadBuildContent(b: Pick<schema.Build, 'id' | 'coverPhotoId'>, dbx: DbLike = db) {
	const [steps, photos, specBlocks, parts] = await Promise.all([
		dbx.select().from(schema.buildStep).where(eq(schema.buildStep.buildId, b.id)).orderBy(asc(schema.buildStep.position), asc(schema.buildStep.createdAt)),
		dbx.select().from(schema.photo).where(eq(schema.photo.buildId, b.id)).orderBy(asc(schema.photo.position), asc(schema.photo.createdAt)),
		dbx.select().from(schema.specBlock).where(eq(schema.specBlock.buildId, b.id)).orderBy(asc(schema.specBlock.position), asc(schema.specBlock.createdAt)),
		dbx.select().from(schema.partLine).where(eq(schema.partLine.buildId, b.id)).orderBy(asc(schema.partLine.position))
	]);
	const coverRow = b.coverPhotoId ? photos.find((p) => p.id === b.coverPhotoId) : undefined;
	return {
		cover: coverRow ? toPhotoView(coverRow) : null,
		steps: steps.map((s) => ({
			...s,
			photos: photos.filter((p) => p.stepId === s.id).map(toPhotoView)
		})),
		specBlocks,
		parts
	};
}

/** What loadBuildContent reads. */
export type BuildContent = Awaited<ReturnType<typeof loadBuildContent>>;

export interface LineageLink {
	slug: string;
	title: string;
	status: string;
	/** Its licence (SPDX id): the terms a build based on it follows and credits. */
	licence: string;
	makerName: string;
	makerHandle: string | null;
}

/** Where a build came from and the builds derived from it. */
export interface Lineage {
	derivedFrom: LineageLink | null;
	derivedBuilds: LineageLink[];
}

/**
 * Where a build came from and the builds derived from it, limited to what `viewer` may see:
 * published and archived builds, plus the viewer's own drafts.
 */
export async function loadLineage(
	b: Pick<schema.Build, 'id' | 'derivedFromId'>,
	viewer: Viewer,
	dbx: DbLike = db
): Promise<Lineage> {
	const maker = alias(schema.user, 'maker');
	const cols = {
		slug: schema.build.slug,
		title: schema.build.title,
		status: schema.build.status,
		licence: schema.build.licence,
		ownerId: schema.build.ownerId,
		makerName: maker.name,
		makerHandle: maker.handle
	};
	let derivedFrom: LineageLink | null = null;
	if (b.derivedFromId) {
		const [o] = await dbx
			.select(cols)
			.from(schema.build)
			.innerJoin(maker, eq(maker.id, schema.build.ownerId))
			.where(eq(schema.build.id, b.derivedFromId));
		if (o && canView(viewer, o)) derivedFrom = strip(o);
	}
	const children = await dbx
		.select(cols)
		.from(schema.build)
		.innerJoin(maker, eq(maker.id, schema.build.ownerId))
		.where(
			and(
				eq(schema.build.derivedFromId, b.id),
				viewer ? or(ne(schema.build.status, 'draft'), eq(schema.build.ownerId, viewer.id)) : ne(schema.build.status, 'draft')
			)
		)
		.orderBy(desc(schema.build.publishedAt), desc(schema.build.createdAt))
		.limit(100);
	return { derivedFrom, derivedBuilds: children.map(strip) };
}

function strip(r: LineageLink & { ownerId: string }): LineageLink {
	return { slug: r.slug, title: r.title, status: r.status, licence: r.licence, makerName: r.makerName, makerHandle: r.makerHandle };
}

/** Everything the public build page shows, or 404 when `viewer` may not see the build. */
export async function getBuildPage(slug: string, viewer: Viewer, row?: schema.Build) {
	const live = row ?? (await requireVisibleBuild(slug, viewer));
	if (row) assertCanView(viewer, row);
	const [maker, { build: b, content }, lineage] = await Promise.all([getMaker(live.ownerId), contentFor(live, viewer), loadLineage(live, viewer)]);
	return { build: b, maker, ...content, lineage };
}

/**
 * The build and content `viewer` may see: live for its maker and whoever may edit it, the latest
 * published revision for everyone else (./published).
 */
export async function contentFor(b: schema.Build, viewer: Viewer, dbx: DbLike = db): Promise<{ build: schema.Build; content: BuildContent }> {
	if (!seesLiveContent(viewer, b)) {
		const published = await loadPublishedContent(b, dbx);
		if (published) return published;
	}
	return { build: b, content: await loadBuildContent(b, dbx) };
}

/**
 * GET /api/v1/builds/:slug — a build readers may see (published or archived; drafts only for their
 * maker and admins; 404 otherwise), read and serialized (./serialize).
 */
export async function getBuildDetail(slug: string, viewer: Viewer, dbx: DbLike = db) {
	const live = await requireVisibleBuild(slug, viewer, dbx);
	const [maker, { build, content }, lineage, review] = await Promise.all([
		getMaker(live.ownerId, dbx),
		contentFor(live, viewer, dbx),
		loadLineage(live, viewer, dbx),
		getReviewState(live.id)
	]);
	return serializeBuildDetail({ build, maker, content, lineage, review });
}

/** A maker's own builds (all states), newest change first — for their dashboard and the edit pages. */
export async function listOwnBuilds(ownerId: string, dbx: DbLike = db) {
	return dbx
		.select({
			slug: schema.build.slug,
			title: schema.build.title,
			id: schema.build.id,
			status: schema.build.status,
			revision: schema.build.revision,
			locked: schema.build.locked,
			pendingChangesAt: schema.build.pendingChangesAt,
			derivedFromId: schema.build.derivedFromId,
			updatedAt: schema.build.updatedAt
		})
		.from(schema.build)
		.where(eq(schema.build.ownerId, ownerId))
		.orderBy(desc(schema.build.updatedAt));
}
