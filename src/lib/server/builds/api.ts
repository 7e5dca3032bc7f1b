/**
 * The builds read API (/api/v1/builds): query logic and JSON serializers. Pages reuse the list query.
 * Filters (category, review state, mains, full-text q) plug in through `ListOptions.where`.
 */
import { and, desc, eq, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { z } from 'zod';
import * as schema from '../db/schema';
import { db } from '../db';
import { photoUrl } from '../photos';
import { CATEGORY_LABELS, TOPOLOGY_LABELS, labelOf } from '$lib/labels';
import type { Viewer } from './access';
import { getMaker, loadBuildContent, loadLineage, requireVisibleBuild, type LineageLink } from './queries';
import type { DbLike } from './tx';

export const LIST_LIMIT_DEFAULT = 20;
export const LIST_LIMIT_MAX = 100;

/** Query string of GET /api/v1/builds (filters are added by their own schema). */
export const listQuerySchema = z.object({
	cursor: z.string().max(200).optional(),
	limit: z.coerce
		.number({ error: 'must be a whole number' })
		.int('must be a whole number')
		.min(1, 'must be at least 1')
		.max(LIST_LIMIT_MAX, `must be at most ${LIST_LIMIT_MAX}`)
		.default(LIST_LIMIT_DEFAULT)
});

/** Position after the last item of a page: the newest-first keyset (published_at, id). */
export interface ListCursor {
	/** published_at to the microsecond, as PostgreSQL prints it: '2026-03-01T10:22:03.123456'. */
	publishedAt: string;
	id: string;
}

const CURSOR_TS = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{6}$/;
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Opaque cursor text: base64url of a small JSON object. */
export function encodeCursor(c: ListCursor): string {
	return Buffer.from(JSON.stringify({ p: c.publishedAt, i: c.id }), 'utf8').toString('base64url');
}

/** Read a cursor made by encodeCursor; null when it is not one (the route answers 400). */
export function decodeCursor(text: string): ListCursor | null {
	if (!/^[A-Za-z0-9_-]{1,200}$/.test(text)) return null;
	try {
		const v = JSON.parse(Buffer.from(text, 'base64url').toString('utf8')) as { p?: unknown; i?: unknown };
		if (typeof v?.p !== 'string' || typeof v?.i !== 'string') return null;
		if (!CURSOR_TS.test(v.p) || !UUID.test(v.i) || Number.isNaN(Date.parse(`${v.p.slice(0, 23)}Z`))) return null;
		return { publishedAt: v.p, id: v.i.toLowerCase() };
	} catch {
		return null;
	}
}

export interface ListOptions {
	limit?: number;
	cursor?: ListCursor | null;
	/** Extra conditions (filters); ANDed with "published". */
	where?: (SQL | undefined)[];
}

const maker = alias(schema.user, 'maker');
const cover = alias(schema.photo, 'cover');
const origin = alias(schema.build, 'origin');

/** Columns every list row carries (also used by other list queries: home, search, profiles). */
export const listColumns = {
	id: schema.build.id,
	slug: schema.build.slug,
	title: schema.build.title,
	summary: schema.build.summary,
	category: schema.build.category,
	topology: schema.build.topology,
	mainsPowered: schema.build.mainsPowered,
	licence: schema.build.licence,
	status: schema.build.status,
	revision: schema.build.revision,
	derivedCount: schema.build.derivedCount,
	locked: schema.build.locked,
	publishedAt: schema.build.publishedAt,
	updatedAt: schema.build.updatedAt,
	cursorAt: sql<string>`to_char(${schema.build.publishedAt}, 'YYYY-MM-DD"T"HH24:MI:SS.US')`,
	makerName: maker.name,
	makerHandle: maker.handle,
	cover: {
		id: cover.id,
		keyPrefix: cover.keyPrefix,
		widths: cover.widths,
		width: cover.width,
		height: cover.height,
		alt: cover.alt,
		placeholder: cover.placeholder
	},
	originSlug: origin.slug,
	originTitle: origin.title,
	originStatus: origin.status
};

/** A select over builds with maker, cover and origin joined, ready for .where/.orderBy. */
export function selectBuildList(dbx: DbLike = db) {
	return dbx
		.select(listColumns)
		.from(schema.build)
		.innerJoin(maker, eq(maker.id, schema.build.ownerId))
		.leftJoin(cover, eq(cover.id, schema.build.coverPhotoId))
		.leftJoin(origin, eq(origin.id, schema.build.derivedFromId));
}

export type BuildListRow = Awaited<ReturnType<ReturnType<typeof selectBuildList>['execute']>>[number];

/**
 * Published builds, newest first, one page at a time: keyset on (published_at, id) so pages stay
 * stable while builds are added. → { rows, next } where next is the cursor of the following page or null.
 */
export async function listPublishedBuilds(opts: ListOptions = {}, dbx: DbLike = db) {
	const limit = Math.min(Math.max(opts.limit ?? LIST_LIMIT_DEFAULT, 1), LIST_LIMIT_MAX);
	const conds: (SQL | undefined)[] = [eq(schema.build.status, 'published'), ...(opts.where ?? [])];
	if (opts.cursor) {
		conds.push(
			sql`(${schema.build.publishedAt}, ${schema.build.id}) < (${opts.cursor.publishedAt}::timestamp, ${opts.cursor.id}::uuid)`
		);
	}
	const rows = await selectBuildList(dbx)
		.where(and(...conds))
		.orderBy(desc(schema.build.publishedAt), desc(schema.build.id))
		.limit(limit + 1);
	const more = rows.length > limit;
	const page = more ? rows.slice(0, limit) : rows;
	const last = page[page.length - 1];
	const next = more && last?.cursorAt ? { publishedAt: last.cursorAt, id: last.id } : null;
	return { rows: page, next };
}

/** A photo in API form: pixel sizes, alt text and the URL of every WebP rendition. */
export function serializePhoto(p: {
	id: string;
	keyPrefix: string;
	widths: number[];
	width: number;
	height: number;
	alt: string;
}) {
	const widths = [...p.widths].sort((a, b) => a - b);
	return {
		id: p.id,
		alt: p.alt,
		widthPx: p.width,
		heightPx: p.height,
		url: photoUrl(p.keyPrefix, widths[widths.length - 1]),
		renditions: widths.map((w) => ({ widthPx: w, url: photoUrl(p.keyPrefix, w) }))
	};
}

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null);

/** One build in a list, as the API answers it. */
export function serializeListItem(r: BuildListRow) {
	return {
		slug: r.slug,
		url: `/builds/${r.slug}`,
		title: r.title,
		summary: r.summary,
		category: r.category,
		categoryLabel: labelOf(CATEGORY_LABELS, r.category),
		topology: r.topology,
		topologyLabel: labelOf(TOPOLOGY_LABELS, r.topology),
		mainsPowered: r.mainsPowered,
		licence: r.licence,
		status: r.status,
		revision: r.revision,
		derivedCount: r.derivedCount,
		locked: r.locked,
		publishedAt: iso(r.publishedAt),
		updatedAt: iso(r.updatedAt),
		maker: { name: r.makerName, handle: r.makerHandle },
		cover: r.cover?.id ? serializePhoto(r.cover as Parameters<typeof serializePhoto>[0]) : null,
		derivedFrom:
			r.originSlug && r.originStatus !== 'draft' ? { slug: r.originSlug, title: r.originTitle, url: `/builds/${r.originSlug}` } : null
	};
}

function serializeLink(l: LineageLink) {
	return { slug: l.slug, url: `/builds/${l.slug}`, title: l.title, status: l.status, maker: { name: l.makerName, handle: l.makerHandle } };
}

/**
 * GET /api/v1/builds/:slug — a build readers may see (published or archived; drafts only for their
 * maker and admins; 404 otherwise) with steps, spec blocks (derived values and checks), parts list,
 * review state (null until reviews exist) and lineage.
 */
export async function getBuildDetail(slug: string, viewer: Viewer, dbx: DbLike = db) {
	const b = await requireVisibleBuild(slug, viewer, dbx);
	const [m, content, lineage] = await Promise.all([getMaker(b.ownerId, dbx), loadBuildContent(b, dbx), loadLineage(b, viewer, dbx)]);
	const coverPhoto = content.cover;
	return {
		slug: b.slug,
		url: `/builds/${b.slug}`,
		title: b.title,
		summary: b.summary,
		category: b.category,
		categoryLabel: labelOf(CATEGORY_LABELS, b.category),
		topology: b.topology,
		topologyLabel: labelOf(TOPOLOGY_LABELS, b.topology),
		mainsPowered: b.mainsPowered,
		licence: b.licence,
		status: b.status,
		revision: b.revision,
		derivedCount: b.derivedCount,
		locked: b.locked,
		lockedReason: b.locked ? b.lockedReason : null,
		publishedAt: iso(b.publishedAt),
		updatedAt: iso(b.updatedAt),
		maker: { name: m.name, handle: m.handle },
		cover: coverPhoto ? serializePhoto(coverPhoto) : null,
		steps: content.steps.map((s, i) => ({
			id: s.id,
			number: i + 1,
			title: s.title,
			bodyMd: s.bodyMd,
			bodyHtml: s.bodyHtml,
			photos: s.photos.map(serializePhoto)
		})),
		specBlocks: content.specBlocks.map((s) => ({
			id: s.id,
			kind: s.kind,
			title: s.title,
			data: s.data,
			derived: s.derived,
			checks: s.checks
		})),
		parts: content.parts.map((p) => ({
			id: p.id,
			position: p.position,
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
			substitution:
				p.designValueText != null && p.designValueText !== ''
					? {
							designValueText: p.designValueText,
							designValue: p.designValue,
							reason: p.substitutionReason,
							deviationPct: p.deviationPct
						}
					: null,
			checks: p.checks
		})),
		review: null,
		lineage: {
			derivedFrom: lineage.derivedFrom ? serializeLink(lineage.derivedFrom) : null,
			derivedBuilds: lineage.derivedBuilds.map(serializeLink)
		}
	};
}
