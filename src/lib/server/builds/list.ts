/**
 * The one list query over published builds: the builds API list, the browse and search pages, the home
 * page's lists, maker profiles and the bench. Typed filters (category, topology, review state, mains
 * powered, maker, full-text `q`, …); sorts: recent, most started from (`most-derived`), recently reviewed, relevance (with `q`);
 * keyset cursor pagination on (sort key…, id) so pages never repeat or skip while builds are published.
 * The query string's schema is $lib/schemas/list; the JSON shapes are ./serialize.
 */
import { and, desc, eq, gt, inArray, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import * as schema from '../db/schema';
import { db } from '../db';
import type { DbLike } from '../db/tx';
import { reviewLabelCondition } from '../reviews/state';
import { searchDistance, searchQuery } from '../search';
import type { BuildProgress, Category, Topology } from '$lib/schemas/build';
import { LIST_LIMIT_DEFAULT, LIST_LIMIT_MAX, LIST_SORTS, type ListQuery, type ListSort, type ReviewFilter } from '$lib/schemas/list';
import { isUuid } from '$lib/uuid';
import { figureCondition, partCondition, type FigureFilter, type PartFilter } from './find-index';
import { partValueSI } from '$lib/schemas/list';

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
	// Tier (0: title or summary matched, 1: only the steps and parts), the negated title-and-summary distance, published.
	relevance: [(v) => v === '0' || v === '1', (v) => /^-?(\d+(\.\d+)?(e[-+]?\d+)?|Infinity)$/i.test(v) && v.length <= 32, isTs]
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

/** What a list may be narrowed to (all optional, ANDed with "published"). */
export interface ListFilters {
	/** Full-text search (websearch syntax: quotes, `or`, `-word`); also what the relevance order ranks by. */
	q?: string;
	category?: Category;
	topology?: Topology;
	review?: ReviewFilter;
	/** true: mains powered only; false: not mains powered only. */
	mains?: boolean;
	/** The maker's handle. */
	maker?: string;
	/** The maker's member id. */
	ownerId?: string;
	/** Only builds that others have started from (derived at least once). */
	derivedOnly?: boolean;
	/** The maker's build status (`progress`): in progress, working, abandoned. */
	progress?: BuildProgress;
	/** Rails, load and power of one block of the latest revision (find-index.ts). */
	figures?: FigureFilter;
	/** "Builds using this part": one parts line of the latest revision (find-index.ts). */
	part?: PartFilter;
}

export interface ListOptions {
	limit?: number;
	cursor?: ListCursor | null;
	/** Order; `recent` (newest published first) unless given. `relevance` needs `filters.q`. */
	sort?: ListSort;
	filters?: ListFilters;
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
	progress: schema.build.progress,
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

/**
 * Sort keys of one order, descending, before the id tie-breaker; `casts` turn cursor text back into values;
 * `order` is the ORDER BY, written to match its index column for column, NULLS placement included
 * (PostgreSQL uses an index for an order only when that matches too): "recent" reads
 * build_status_published_idx backwards (DESC NULLS FIRST), the other two their own DESC NULLS LAST
 * indexes (schema.ts). No key is ever NULL for a published build, so the placement changes no result.
 */
function sortSpec(sort: Exclude<ListSort, 'relevance'>): { keys: SQL[]; text: SQL[]; casts: string[]; order: SQL[] } {
	const b = schema.build;
	const published = sql`${b.publishedAt}`;
	switch (sort) {
		case 'most-derived':
			return {
				keys: [sql`${b.derivedCount}`, published],
				text: [sql`${b.derivedCount}::text`, microTs(published)],
				casts: ['int', 'timestamp'],
				order: [sql`${b.derivedCount} desc nulls last`, sql`${published} desc nulls last`, sql`${b.id} desc nulls last`]
			};
		case 'recently-reviewed': {
			const reviewed = sql`coalesce(${b.lastReviewedAt}, '-infinity'::timestamp)`;
			return {
				keys: [reviewed, published],
				text: [sql`case when ${b.lastReviewedAt} is null then '-infinity' else ${microTs(sql`${b.lastReviewedAt}`)} end`, microTs(published)],
				casts: ['timestamp', 'timestamp'],
				order: [sql`${reviewed} desc`, sql`${published} desc nulls last`, sql`${b.id} desc nulls last`]
			};
		}
		default:
			return { keys: [published], text: [microTs(published)], casts: ['timestamp'], order: [sql`${published} desc`, sql`${b.id} desc`] };
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
	const filters = opts.filters ?? {};
	if (sort === 'relevance') {
		if (!filters.q) throw new RangeError('The relevance order needs a search text.');
		return relevancePage(filters.q, filters, limit, opts.cursor ?? null, dbx);
	}
	const spec = sortSpec(sort);
	const conds: SQL[] = [eq(schema.build.status, 'published'), ...filterConditions(filters)];
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
		.orderBy(...spec.order)
		.limit(limit + 1);
	const more = rows.length > limit;
	const page = more ? rows.slice(0, limit) : rows;
	const last = page[page.length - 1];
	const next: ListCursor | null = more && last ? { sort, keys: last.sortKeys, id: last.id } : null;
	return { rows: page, next };
}

/**
 * Title-and-summary matches read from RUM's ordered scan before the exact order is taken among them:
 * enough that the page is usually decided inside them; when equal distances run past them, the run is
 * read by recency (relevancePage).
 */
export const RELEVANCE_CANDIDATES = 1000;

/** The total order of tier 0: nearer first, then newer, then the larger id (uuid order is its hex text's). */
function byRelevance(x: { d: number; k1: string; id: string }, y: { d: number; k1: string; id: string }): number {
	return x.d - y.d || (x.k1 < y.k1 ? 1 : x.k1 > y.k1 ? -1 : 0) || (x.id < y.id ? 1 : x.id > y.id ? -1 : 0);
}

/**
 * One page of the relevance order (sort `relevance`, with a search text), in two tiers:
 *
 * 1. builds whose title and summary match the query by themselves, ranked by their title-and-summary
 *    vector (search.ts searchDistance: title A before summary B; RUM index build_search_head_rum_idx),
 *    then newest, then id;
 * 2. builds that match only through their steps, spec blocks and parts list, newest first, then id
 *    (read backwards along build_status_published_idx, stopping at the page's end).
 *
 * Neither tier ranks the long step text, so the work per page does not grow with the number of
 * matches (RUM scored every match's whole vector before). The trade-off: among builds that mention the
 * words only in their steps, how often and how close they appear no longer orders them — the newest
 * comes first. Every match is in exactly one tier; the keyset cursor (tier, distance, published, id)
 * keeps pages exact and stable while builds are published (a new build sorts where it belongs, before
 * or after the cursor, and never shifts the rows after it).
 */
export async function relevancePage(
	q: string,
	filters: ListFilters,
	limit: number,
	cursor: ListCursor | null,
	dbx: DbLike = db,
	/** How many title-and-summary matches to read from the index at most (tests use a small number). */
	candidateCount = RELEVANCE_CANDIDATES
) {
	const b = schema.build;
	const tsq = searchQuery(q);
	const distance = searchDistance(tsq);
	const headHit = sql`${b.searchHead} @@ ${tsq}`;
	// A title-and-summary hit is a hit of the full vector too, unless the query excludes words (`-word`,
	// printed as `!`): only then is the full vector (TOASTed, long) read for tier-0 rows.
	const fullHitGivenHead = sql`(strpos((${tsq})::text, '!') = 0 or ${b.search} @@ ${tsq})`;
	const others = filterConditions({ ...filters, q: undefined });
	if (cursor && (cursor.sort !== 'relevance' || cursor.keys.length !== 3)) {
		throw new RangeError('This cursor belongs to another order; start again from the first page.');
	}
	const inTail = cursor?.keys[0] === '1';
	const select = (tier: 0 | 1) =>
		dbx
			.select({
				...listColumns,
				sortKeys: tier === 0 ? sql<string[]>`array['0', (-${distance})::text, ${microTs(b.publishedAt)}]::text[]` : sql<string[]>`array['1', '0', ${microTs(b.publishedAt)}]::text[]`
			})
			.from(b)
			.innerJoin(maker, eq(maker.id, b.ownerId))
			.leftJoin(cover, eq(cover.id, b.coverPhotoId))
			.leftJoin(origin, eq(origin.id, b.derivedFromId));
	let rows: Awaited<ReturnType<ReturnType<typeof select>['execute']>> = [];
	if (!inTail) {
		const after = cursor
			? [sql`((-${distance}), ${b.publishedAt}, ${b.id}) < (${cursor.keys[1]}::real, ${cursor.keys[2]}::timestamp, ${cursor.id}::uuid)`]
			: [];
		// The page's ids are chosen on the build table alone, then joined. Candidates come from RUM's
		// ordered scan (`ORDER BY search_head <=> q LIMIT k`: distances computed inside the index, no
		// heap read for the matches past the k-th), then the exact order is taken among them.
		const keyed = () => {
			const q0 = dbx
				.select({ id: b.id, d: sql<number>`(${distance})::float8`, k0: sql<string>`(-${distance})::text`, k1: sql<string>`${microTs(b.publishedAt)}` })
				.from(b)
				.$dynamic();
			return filters.maker ? q0.innerJoin(maker, eq(maker.id, b.ownerId)) : q0;
		};
		const base = [eq(b.status, 'published'), fullHitGivenHead, ...others, ...after];
		const take = Math.max(candidateCount, limit + 1);
		const candidates = await keyed()
			.where(and(headHit, ...base))
			.orderBy(distance)
			.limit(take);
		candidates.sort(byRelevance);
		let chosen = candidates.slice(0, limit + 1);
		const edge = candidates.length === take ? candidates[take - 1].d : Infinity;
		if (chosen.length && chosen[chosen.length - 1].d >= edge) {
			// A run of equal distances goes on past the candidates (a word once in thousands of titles ranks
			// them all alike): the rest of the page is that run's newest, read backwards along the recency
			// index. ts_match_vq is `@@` written as a function, so the planner cannot swap in a bitmap scan
			// of every title hit.
			const nearer = chosen.filter((c) => c.d < edge);
			const run = await keyed()
				.where(and(sql`ts_match_vq(${b.searchHead}, ${tsq})`, sql`${distance} = ${edge}::float8`, ...base))
				.orderBy(desc(b.publishedAt), desc(b.id))
				.limit(limit + 1 - nearer.length);
			chosen = [...nearer, ...run];
		}
		const full = chosen.length ? await select(0).where(inArray(b.id, chosen.map((c) => c.id))) : [];
		const byId = new Map(full.map((r) => [r.id, r]));
		rows = chosen.flatMap((c) => {
			const r = byId.get(c.id);
			return r ? [{ ...r, sortKeys: ['0', c.k0, c.k1] }] : [];
		});
	}
	if (rows.length <= limit) {
		const after = inTail && cursor ? [sql`(${b.publishedAt}, ${b.id}) < (${cursor.keys[2]}::timestamp, ${cursor.id}::uuid)`] : [];
		const tail = await select(1)
			.where(and(eq(b.status, 'published'), sql`not (${headHit})`, sql`${b.search} @@ ${tsq}`, ...others, ...after))
			.orderBy(desc(b.publishedAt), desc(b.id))
			.limit(limit + 1 - rows.length);
		rows = [...rows, ...tail];
	}
	const more = rows.length > limit;
	const page = more ? rows.slice(0, limit) : rows;
	const last = page[page.length - 1];
	const next: ListCursor | null = more && last ? { sort: 'relevance', keys: last.sortKeys, id: last.id } : null;
	return { rows: page, next };
}

/** SQL conditions for the filters of a list (all optional; ANDed). */
function filterConditions(q: ListFilters): SQL[] {
	const b = schema.build;
	const out: SQL[] = [];
	if (q.q) out.push(sql`${b.search} @@ ${searchQuery(q.q)}`);
	if (q.category) out.push(eq(b.category, q.category));
	if (q.topology) out.push(eq(b.topology, q.topology));
	if (q.mains !== undefined) out.push(eq(b.mainsPowered, q.mains));
	if (q.maker) out.push(eq(maker.handle, q.maker));
	if (q.ownerId) out.push(eq(b.ownerId, q.ownerId));
	if (q.derivedOnly) out.push(gt(b.derivedCount, 0));
	if (q.progress) out.push(eq(b.progress, q.progress));
	const figures = q.figures && figureCondition(b.id, q.figures);
	if (figures) out.push(figures);
	const part = q.part && partCondition(b.id, q.part);
	if (part) out.push(part);
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
	const filters: ListFilters = {
		q: q.q || undefined,
		category: q.category,
		topology: q.topology,
		review: q.review,
		mains: q.mains === undefined ? undefined : q.mains === 'true',
		maker: q.maker,
		progress: q.status,
		...findFilters(q)
	};
	const { rows, next } = await listPublishedBuilds({ limit: q.limit, cursor, sort, filters }, dbx);
	return { ok: true, rows, next, sort };
}

/** The find filters of a validated list query (the schema has checked them; the part value is read in SI). */
function findFilters(q: ListQuery): Pick<ListFilters, 'figures' | 'part'> {
	const figures: FigureFilter = { railMinV: q.railMinV, railMaxV: q.railMaxV, loadOhm: q.loadOhm, powerMinW: q.powerMinW, powerMaxW: q.powerMaxW };
	const part: PartFilter = { kind: q.partKind, package: q.partPackage };
	if (q.partKind && q.partValue) {
		const si = partValueSI(q.partKind, q.partValue);
		if (si === null) part.valueText = q.partValue;
		else part.value = si;
	}
	return { figures, part };
}
