/**
 * The builds read API (/api/v1/builds): query logic and JSON serializers. Pages reuse the list query
 * (browse, search, home, maker profiles). Filters: category, topology, review state, mains powered,
 * maker, full-text `q`; sorts: recent, most derived, recently reviewed, relevance (with `q`); keyset
 * cursor pagination on (sort key…, id) so pages never repeat or skip while builds are published.
 */
import { and, desc, eq, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { z } from 'zod';
import * as schema from '../db/schema';
import { db } from '../db';
import { photoUrl, type PhotoView } from '../photos';
import { getReviewState, reviewLabelCondition, reviewStateJson } from '../reviews/state';
import { CATEGORY_LABELS, TOPOLOGY_LABELS, labelOf } from '$lib/labels';
import { CATEGORIES, TOPOLOGIES } from '$lib/schemas/build';
import { LIST_SORTS, REVIEW_FILTERS, type ListSort } from '$lib/schemas/list';
import type { Viewer } from '../actor';
import { getMaker, loadBuildContent, loadLineage, requireVisibleBuild, type LineageLink } from './queries';
import type { DbLike } from '../db/tx';
import { isUuid } from '$lib/uuid';

export const LIST_LIMIT_DEFAULT = 20;
export const LIST_LIMIT_MAX = 100;
/** Longest accepted search text, in characters. */
export const QUERY_MAX = 200;

export { LIST_SORTS, REVIEW_FILTERS, type ListSort, type ReviewFilter } from '$lib/schemas/list';

const oneOf = (values: readonly string[]) => ({ error: `must be one of: ${values.join(', ')}` });

/** Query string of GET /api/v1/builds and of the browse and search pages. */
export const listQuerySchema = z.object({
	q: z.string().trim().max(QUERY_MAX, `must be at most ${QUERY_MAX} characters`).optional(),
	category: z.enum(CATEGORIES, oneOf(CATEGORIES)).optional(),
	topology: z.enum(TOPOLOGIES, oneOf(TOPOLOGIES)).optional(),
	review: z.enum(REVIEW_FILTERS, oneOf(REVIEW_FILTERS)).optional(),
	mains: z.enum(['true', 'false'], oneOf(['true', 'false'])).optional(),
	maker: z
		.string()
		.trim()
		.toLowerCase()
		.regex(/^[a-z0-9][a-z0-9-]{0,39}$/, 'must be a member handle')
		.optional(),
	sort: z.enum(LIST_SORTS, oneOf(LIST_SORTS)).optional(),
	cursor: z.string().max(400).optional(),
	limit: z.coerce
		.number({ error: 'must be a whole number' })
		.int('must be a whole number')
		.min(1, 'must be at least 1')
		.max(LIST_LIMIT_MAX, `must be at most ${LIST_LIMIT_MAX}`)
		.default(LIST_LIMIT_DEFAULT)
});
export type ListQuery = z.infer<typeof listQuerySchema>;

/**
 * Position after the last item of a page: the sort it belongs to, the sort key values of that item
 * as PostgreSQL prints them (timestamps to the microsecond, '2026-03-01T10:22:03.123456'; counts;
 * ranks) and its id, the final tie-breaker.
 */
export interface ListCursor {
	sort: ListSort;
	keys: string[];
	id: string;
}

const CURSOR_TS = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{6}$/;
const isTs = (v: string) => CURSOR_TS.test(v) && !Number.isNaN(Date.parse(`${v.slice(0, 23)}Z`));

/** What each key of a sort must look like in a cursor (checked before it reaches SQL). */
const KEY_SHAPES: Record<ListSort, ((v: string) => boolean)[]> = {
	recent: [isTs],
	'most-derived': [(v) => /^\d{1,9}$/.test(v), isTs],
	'recently-reviewed': [(v) => v === '-infinity' || isTs(v), isTs],
	relevance: [(v) => /^-?\d+(\.\d+)?(e[-+]?\d+)?$/i.test(v) && v.length <= 32, isTs]
};

/** Opaque cursor text: base64url of a small JSON object. */
export function encodeCursor(c: ListCursor): string {
	return Buffer.from(JSON.stringify({ s: c.sort, k: c.keys, i: c.id }), 'utf8').toString('base64url');
}

/** Read a cursor made by encodeCursor; null when it is not one (the route answers 400). */
export function decodeCursor(text: string): ListCursor | null {
	if (!/^[A-Za-z0-9_-]{1,400}$/.test(text)) return null;
	try {
		const v = JSON.parse(Buffer.from(text, 'base64url').toString('utf8')) as { s?: unknown; k?: unknown; i?: unknown };
		if (!v || typeof v !== 'object' || Array.isArray(v)) return null;
		const sort = v.s as ListSort;
		if (!LIST_SORTS.includes(sort) || typeof v.i !== 'string' || !isUuid(v.i) || !Array.isArray(v.k)) return null;
		const shapes = KEY_SHAPES[sort];
		if (v.k.length !== shapes.length || !v.k.every((k, n) => typeof k === 'string' && shapes[n](k))) return null;
		return { sort, keys: v.k as string[], id: v.i.toLowerCase() };
	} catch {
		return null;
	}
}

export interface ListOptions {
	limit?: number;
	cursor?: ListCursor | null;
	/** Order; `recent` (newest published first) unless given. `relevance` needs `search`. */
	sort?: ListSort;
	/** A tsquery (from searchQuery) for the relevance order. */
	search?: SQL;
	/** Extra conditions (filters); ANDed with "published". */
	where?: (SQL | undefined)[];
}

const maker = alias(schema.user, 'maker');
const cover = alias(schema.photo, 'cover');
const origin = alias(schema.build, 'origin');

const microTs = (col: SQL | typeof schema.build.publishedAt) => sql`to_char(${col}, 'YYYY-MM-DD"T"HH24:MI:SS.US')`;

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
	cursorAt: sql<string>`${microTs(schema.build.publishedAt)}`,
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

/** websearch_to_tsquery over the English configuration: quotes, `or` and `-word` work as people expect. */
export function searchQuery(q: string): SQL {
	return sql`websearch_to_tsquery('english', ${q})`;
}

/** Rank of a build against a tsquery: cover density, length-normalised (flag 1: divide by 1 + log(length)). */
export function searchRank(tsquery: SQL): SQL<number> {
	return sql<number>`ts_rank_cd(${schema.build.search}, ${tsquery}, 1)`;
}

/** Sort keys of one order, descending, before the id tie-breaker; `casts` turn cursor text back into values. */
function sortSpec(sort: ListSort, search?: SQL): { keys: SQL[]; text: SQL[]; casts: string[] } {
	const b = schema.build;
	const published = sql`${b.publishedAt}`;
	switch (sort) {
		case 'most-derived':
			return { keys: [sql`${b.derivedCount}`, published], text: [sql`${b.derivedCount}::text`, microTs(published)], casts: ['int', 'timestamp'] };
		case 'recently-reviewed': {
			const reviewed = sql`coalesce(${b.lastReviewedAt}, '-infinity'::timestamp)`;
			return {
				keys: [reviewed, published],
				text: [sql`case when ${b.lastReviewedAt} is null then '-infinity' else ${microTs(sql`${b.lastReviewedAt}`)} end`, microTs(published)],
				casts: ['timestamp', 'timestamp']
			};
		}
		case 'relevance': {
			if (!search) throw new RangeError('The relevance order needs a search text.');
			const rank = searchRank(search);
			return { keys: [rank, published], text: [sql`${rank}::text`, microTs(published)], casts: ['real', 'timestamp'] };
		}
		default:
			return { keys: [published], text: [microTs(published)], casts: ['timestamp'] };
	}
}

/**
 * Published builds, one page at a time, in `sort` order (newest first by default). Keyset on
 * (sort keys…, id), all descending: an item's position depends only on its own values, so pages stay
 * stable while builds are published (new ones sort before the cursor). → { rows, next } where next is
 * the cursor of the following page or null. A cursor from another sort is a RangeError.
 */
export async function listPublishedBuilds(opts: ListOptions = {}, dbx: DbLike = db) {
	const limit = Math.min(Math.max(opts.limit ?? LIST_LIMIT_DEFAULT, 1), LIST_LIMIT_MAX);
	const sort = opts.sort ?? 'recent';
	const spec = sortSpec(sort, opts.search);
	const conds: (SQL | undefined)[] = [eq(schema.build.status, 'published'), ...(opts.where ?? [])];
	if (opts.cursor) {
		if (opts.cursor.sort !== sort || opts.cursor.keys.length !== spec.keys.length) {
			throw new RangeError('This cursor belongs to another order; start again from the first page.');
		}
		const values = opts.cursor.keys.map((k, n) => sql`${k}::${sql.raw(spec.casts[n])}`);
		conds.push(sql`(${sql.join([...spec.keys, sql`${schema.build.id}`], sql`, `)}) < (${sql.join([...values, sql`${opts.cursor.id}::uuid`], sql`, `)})`);
	}
	const rows = await dbx
		.select({ ...listColumns, sortKeys: sql<string[]>`array[${sql.join(spec.text, sql`, `)}]::text[]` })
		.from(schema.build)
		.innerJoin(maker, eq(maker.id, schema.build.ownerId))
		.leftJoin(cover, eq(cover.id, schema.build.coverPhotoId))
		.leftJoin(origin, eq(origin.id, schema.build.derivedFromId))
		.where(and(...conds))
		.orderBy(...spec.keys.map((k) => sql`${k} desc`), desc(schema.build.id))
		.limit(limit + 1);
	const more = rows.length > limit;
	const page = more ? rows.slice(0, limit) : rows;
	const last = page[page.length - 1];
	const next: ListCursor | null = more && last ? { sort, keys: last.sortKeys, id: last.id } : null;
	return { rows: page, next };
}

/** SQL conditions for the filters of a list query (all optional; ANDed). */
export function listFilters(q: Pick<ListQuery, 'q' | 'category' | 'topology' | 'review' | 'mains' | 'maker'>): SQL[] {
	const b = schema.build;
	const out: SQL[] = [];
	if (q.q) out.push(sql`${b.search} @@ ${searchQuery(q.q)}`);
	if (q.category) out.push(eq(b.category, q.category));
	if (q.topology) out.push(eq(b.topology, q.topology));
	if (q.mains) out.push(eq(b.mainsPowered, q.mains === 'true'));
	if (q.maker) out.push(eq(maker.handle, q.maker));
	switch (q.review) {
		case 'unreviewed':
		case 'safe':
		case 'rework':
			out.push(reviewLabelCondition(q.review));
			break;
		case 'changed':
			out.push(sql`(${reviewLabelCondition('safe-changed')} or ${reviewLabelCondition('rework-changed')})`);
			break;
		case 'waiting':
			// Asked for review and no review has landed since the request (also after an earlier verdict).
			out.push(
				sql`(${b.reviewRequestedAt} is not null and not exists (select 1 from ${schema.review} r where r.build_id = ${b.id} and r.created_at >= ${b.reviewRequestedAt}))`
			);
			break;
	}
	return out;
}

/** The order a list query asks for: its `sort`, else relevance when searching, else recent. */
export function effectiveSort(q: Pick<ListQuery, 'q' | 'sort'>): ListSort {
	return q.sort ?? (q.q ? 'relevance' : 'recent');
}

export type ListResult =
	| { ok: true; rows: Awaited<ReturnType<typeof listPublishedBuilds>>['rows']; next: ListCursor | null; sort: ListSort }
	| { ok: false; path: string; message: string };

/**
 * Run a validated list query (filters, sort, cursor, limit): the one entry point of the builds API list,
 * the browse and search pages. A bad cursor or relevance without `q` → { ok: false, path, message }.
 */
export async function queryBuilds(q: ListQuery, dbx: DbLike = db): Promise<ListResult> {
	const sort = effectiveSort(q);
	if (sort === 'relevance' && !q.q) return { ok: false, path: 'sort', message: 'sort=relevance needs a search text (q)' };
	let cursor: ListCursor | null = null;
	if (q.cursor) {
		cursor = decodeCursor(q.cursor);
		if (!cursor) return { ok: false, path: 'cursor', message: 'is not a cursor this list made' };
		if (cursor.sort !== sort) return { ok: false, path: 'cursor', message: 'belongs to another sort order; start from the first page' };
	}
	const { rows, next } = await listPublishedBuilds(
		{ limit: q.limit, cursor, sort, search: q.q ? searchQuery(q.q) : undefined, where: listFilters(q) },
		dbx
	);
	return { ok: true, rows, next, sort };
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

/**
 * What a build card needs (lists on pages): like the API item, but the cover as a PhotoView for the
 * Photo component. toCardData(row) → BuildCardData.
 */
export function toCardData(r: BuildListRow) {
	return {
		slug: r.slug,
		title: r.title,
		summary: r.summary,
		category: r.category,
		topology: r.topology,
		mainsPowered: r.mainsPowered,
		status: r.status,
		revision: r.revision,
		derivedCount: r.derivedCount,
		publishedAt: iso(r.publishedAt),
		makerName: r.makerName,
		makerHandle: r.makerHandle,
		cover: r.cover?.id ? (r.cover as PhotoView) : null,
		derivedFrom: r.originSlug && r.originStatus !== 'draft' ? { slug: r.originSlug, title: r.originTitle ?? '' } : null
	};
}
export type BuildCardData = ReturnType<typeof toCardData>;

function serializeLink(l: LineageLink) {
	return { slug: l.slug, url: `/builds/${l.slug}`, title: l.title, status: l.status, maker: { name: l.makerName, handle: l.makerHandle } };
}

/**
 * GET /api/v1/builds/:slug — a build readers may see (published or archived; drafts only for their
 * maker and admins; 404 otherwise) with steps, spec blocks (derived values and checks), parts list,
 * review state (latest verdict, the revision it was given on, open flags) and lineage.
 */
export async function getBuildDetail(slug: string, viewer: Viewer, dbx: DbLike = db) {
	const b = await requireVisibleBuild(slug, viewer, dbx);
	const [m, content, lineage, review] = await Promise.all([
		getMaker(b.ownerId, dbx),
		loadBuildContent(b, dbx),
		loadLineage(b, viewer, dbx),
		getReviewState(b.id)
	]);
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
		review: reviewStateJson(review),
		lineage: {
			derivedFrom: lineage.derivedFrom ? serializeLink(lineage.derivedFrom) : null,
			derivedBuilds: lineage.derivedBuilds.map(serializeLink)
		}
	};
}
