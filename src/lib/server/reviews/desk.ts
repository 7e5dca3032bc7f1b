/**
 * The review desk (PRODUCT.md §4.5): builds waiting for review, in pages, with filters, two orders and
 * claims, plus the recent verdicts.
 *
 * Waiting builds are read from `review_request` (one row per waiting build, kept by triggers from the
 * build, its published revision and — for a build without a revision row — its spec blocks and part lines;
 * migrations 0007 and 0014). A review is of the published revision, so the desk shows that revision's title,
 * mains flag, category and DANGER/CAUTION counts, as the review page does; pending edits are only marked. Paging is keyset (no OFFSET): the cursor holds
 * the last row's sort key, and the build id breaks ties, so a page never repeats or skips a row while
 * requests come and go. Each order/filter has an index (see DESK_QUERIES below and DEVELOPERS.md).
 */
import { and, desc, eq, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { z } from 'zod';
import { error } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import * as schema from '../db/schema';
import { db } from '../db';
import type { Actor } from '../actor';
import { assertCanView } from '../builds/access';
import { roleAtLeast } from '$lib/roles';
import type { Verdict } from '$lib/reviews';
import { CATEGORIES } from '$lib/schemas/build';

export interface DeskClaim {
	byId: string;
	byName: string;
	at: Date;
	/** When the claim lapses by itself (REVIEW_CLAIM_HOURS after it was made). */
	until: Date;
}

export interface DeskBuild {
	id: string;
	slug: string;
	title: string;
	category: string;
	mainsPowered: boolean;
	/** The published revision under review (the title, mains flag, category and check counts are its). */
	revision: number;
	requestedAt: Date;
	maker: { id: string; name: string; handle: string | null };
	dangerChecks: number;
	cautionChecks: number;
	openFlags: number;
	/** True when the build had a verdict before this request. */
	rereview: boolean;
	/** True when the maker has edits not yet published as a revision (not under review; not counted above). */
	pendingChanges: boolean;
	/** The maker's note for the reviewer ('' when none). */
	note: string;
	/** Who said "I'm reviewing this", while the claim holds; null otherwise. */
	claim: DeskClaim | null;
	/** The latest verdict before this request, if any ("safe at r2" asked again after a change). */
	previous: { verdict: Verdict; revision: number } | null;
}

export interface DeskReview {
	id: string;
	verdict: Verdict;
	revision: number;
	createdAt: Date;
	build: { slug: string; title: string; revision: number; mainsPowered: boolean };
	reviewer: { name: string; handle: string | null };
}

/** How long a claim holds without a verdict or a release (hours; env REVIEW_CLAIM_HOURS, default 24). */
export function claimHours(): number {
	const n = Number(env.REVIEW_CLAIM_HOURS ?? 24);
	return Number.isFinite(n) && n > 0 ? n : 24;
}

/** A moment as a `timestamp` (without time zone, UTC wall time) parameter, as Drizzle stores Dates. */
const ts = (d: Date): SQL => sql`${d.toISOString()}::timestamp`;

/** Claims made before this moment have lapsed. */
function claimCutoff(now = new Date()): Date {
	return new Date(now.getTime() - claimHours() * 3_600_000);
}

export const DESK_SORTS = { oldest: 'Oldest waiting first', danger: 'Most DANGER checks first' } as const;
export const DESK_WAITING = { any: 'Any time', '1': 'At least a day', '7': 'At least a week', '30': 'At least 30 days' } as const;
export const DESK_KINDS = { any: 'First reviews and re-reviews', first: 'First review', again: 'Re-review' } as const;
export const DESK_PAGE_SIZE = 25;

/** The desk's filters and order, as the query string carries them (`?mains=1&danger=1&category=…&waiting=7&kind=again&sort=danger`). */
export const deskQuerySchema = z.object({
	mains: z.boolean().default(false),
	danger: z.boolean().default(false),
	category: z.enum(CATEGORIES).nullable().default(null),
	waiting: z.enum(['any', '1', '7', '30']).default('any'),
	kind: z.enum(['any', 'first', 'again']).default('any'),
	sort: z.enum(['oldest', 'danger']).default('oldest')
});
export type DeskQuery = z.infer<typeof deskQuerySchema>;

/** Read the desk's filters from a query string; unknown values fall back to "any" rather than an error. */
export function parseDeskQuery(params: URLSearchParams): DeskQuery {
	const pick = <T>(schemaOf: z.ZodType<T>, v: unknown, d: T): T => {
		const r = schemaOf.safeParse(v);
		return r.success ? r.data : d;
	};
	const s = deskQuerySchema.shape;
	return {
		mains: params.get('mains') === '1',
		danger: params.get('danger') === '1',
		category: pick(s.category, params.get('category') || null, null),
		waiting: pick(s.waiting, params.get('waiting') ?? undefined, 'any'),
		kind: pick(s.kind, params.get('kind') ?? undefined, 'any'),
		sort: pick(s.sort, params.get('sort') ?? undefined, 'oldest')
	};
}

/** The query string of a desk query (only what differs from the defaults), for links and forms. */
export function deskQueryString(q: DeskQuery, cursor?: string | null): string {
	const p = new URLSearchParams();
	if (q.mains) p.set('mains', '1');
	if (q.danger) p.set('danger', '1');
	if (q.category) p.set('category', q.category);
	if (q.waiting !== 'any') p.set('waiting', q.waiting);
	if (q.kind !== 'any') p.set('kind', q.kind);
	if (q.sort !== 'oldest') p.set('sort', q.sort);
	if (cursor) p.set('after', cursor);
	const s = p.toString();
	return s ? `?${s}` : '';
}

/** The sort key of the last row of a page: danger count (danger order only), request time, build id. */
interface Cursor {
	d?: number;
	t: string;
	id: string;
}

const cursorSchema = z.object({
	d: z.number().int().min(0).optional(),
	t: z.string().datetime(),
	id: z.string().uuid()
});

function encodeCursor(c: Cursor): string {
	return Buffer.from(JSON.stringify(c), 'utf8').toString('base64url');
}

/** The cursor in `after=`, or null when absent or not one of ours (the desk then starts at the top). */
export function decodeCursor(raw: string | null | undefined): Cursor | null {
	if (!raw || raw.length > 400) return null;
	try {
		const r = cursorSchema.safeParse(JSON.parse(Buffer.from(raw, 'base64url').toString('utf8')));
		return r.success ? r.data : null;
	} catch {
		return null;
	}
}

/** The WHERE conditions on review_request for a desk query (without the cursor). */
function deskConditions(q: DeskQuery, now: Date): SQL[] {
	const rr = schema.reviewRequest;
	const out: SQL[] = [];
	if (q.mains) out.push(sql`${rr.mainsPowered}`);
	if (q.danger) out.push(sql`${rr.dangerChecks} > 0`);
	if (q.category) out.push(eq(rr.category, q.category));
	if (q.waiting !== 'any') out.push(sql`${rr.requestedAt} <= ${ts(new Date(now.getTime() - Number(q.waiting) * 86_400_000))}`);
	if (q.kind !== 'any') out.push(q.kind === 'again' ? sql`${rr.rereview}` : sql`not ${rr.rereview}`);
	return out;
}

/** The keyset condition "after this cursor" in the query's order. */
function afterCursor(q: DeskQuery, c: Cursor): SQL {
	const rr = schema.reviewRequest;
	const t = new Date(c.t);
	const tieBreak = sql`(${rr.requestedAt}, ${rr.buildId}) > (${ts(t)}, ${c.id}::uuid)`;
	if (q.sort === 'danger') {
		const d = c.d ?? 0;
		return sql`(${rr.dangerChecks} < ${d} or (${rr.dangerChecks} = ${d} and ${tieBreak}))`;
	}
	return tieBreak;
}

function orderOf(q: DeskQuery): SQL[] {
	const rr = schema.reviewRequest;
	return q.sort === 'danger'
		? [sql`${rr.dangerChecks} desc nulls last`, sql`${rr.requestedAt} asc`, sql`${rr.buildId} asc`]
		: [sql`${rr.requestedAt} asc`, sql`${rr.buildId} asc`];
}

export interface DeskPage {
	items: DeskBuild[];
	/** Cursor of the next page, or null on the last page. */
	next: string | null;
	/** How many requests match the filters (all pages). */
	total: number;
}

/** Joins a waiting build's published revision (build_revision at build.revision; its unique index) to review_request. */
export const reviewedRevisionOn = and(eq(schema.buildRevision.buildId, schema.reviewRequest.buildId), eq(schema.buildRevision.number, schema.build.revision));
/** The title of the revision under review, as the review page shows it (the live title for a build without a revision row). */
export const reviewedTitle = sql<string>`coalesce(${schema.buildRevision.snapshot}->'build'->>'title', ${schema.build.title})`;

/**
 * The page query of the desk (not run): waiting builds matching `q`, in its order, after `cursor`, `limit + 1` rows,
 * with the published revision's title (a left join on build_revision's unique index). listDesk runs it; deskPageSql
 * hands its SQL to EXPLAIN, so the plans checked are those of the query the desk sends.
 */
function deskPageQuery(q: DeskQuery, cursor: string | null, limit: number, now: Date) {
	const rr = schema.reviewRequest;
	const maker = alias(schema.user, 'maker');
	const claimer = alias(schema.user, 'claimer');
	const c = decodeCursor(cursor);
	const conds = deskConditions(q, now);
	const pageConds = c ? [...conds, afterCursor(q, c)] : conds;
	return db
		.select({
			id: schema.build.id,
			slug: schema.build.slug,
			title: reviewedTitle,
			revision: schema.build.revision,
			pendingChangesAt: schema.build.pendingChangesAt,
			category: rr.category,
			mainsPowered: rr.mainsPowered,
			requestedAt: rr.requestedAt,
			dangerChecks: rr.dangerChecks,
			cautionChecks: rr.cautionChecks,
			rereview: rr.rereview,
			note: rr.note,
			claimedById: rr.claimedById,
			claimedAt: rr.claimedAt,
			claimerName: claimer.name,
			makerId: maker.id,
			makerName: maker.name,
			makerHandle: maker.handle,
			openFlags: sql<number>`(select count(*) from ${schema.safetyFlag} f where f.build_id = ${rr.buildId} and f.state = 'open')::int`,
			prevVerdict: sql<string | null>`(select r.verdict from ${schema.review} r where r.build_id = ${rr.buildId} order by r.created_at desc, r.id desc limit 1)`,
			prevRevision: sql<number | null>`(select r.revision from ${schema.review} r where r.build_id = ${rr.buildId} order by r.created_at desc, r.id desc limit 1)`
		})
		.from(rr)
		.innerJoin(schema.build, eq(schema.build.id, rr.buildId))
		.innerJoin(maker, eq(maker.id, schema.build.ownerId))
		.leftJoin(claimer, eq(claimer.id, rr.claimedById))
		.leftJoin(schema.buildRevision, reviewedRevisionOn)
		.where(and(eq(schema.build.status, 'published'), ...pageConds))
		.orderBy(...orderOf(q))
		.limit(limit + 1);
}

/**
 * One page of the desk: waiting builds matching `q`, in its order, after `cursor`. Builds that are not
 * published any more (archived while waiting) are left out.
 */
export async function listDesk(q: DeskQuery, cursor: string | null = null, limit = DESK_PAGE_SIZE, now = new Date()): Promise<DeskPage> {
	const rr = schema.reviewRequest;
	const [rows, [{ total }]] = await Promise.all([
		deskPageQuery(q, cursor, limit, now),
		db
			.select({ total: sql<number>`count(*)::int` })
			.from(rr)
			.innerJoin(schema.build, eq(schema.build.id, rr.buildId))
			.where(and(eq(schema.build.status, 'published'), ...deskConditions(q, now)))
	]);
	const cutoff = claimCutoff(now);
	const items = rows.slice(0, limit).map(
		(r): DeskBuild => ({
			id: r.id,
			slug: r.slug,
			title: r.title,
			category: r.category,
			mainsPowered: r.mainsPowered,
			revision: r.revision,
			requestedAt: r.requestedAt,
			maker: { id: r.makerId, name: r.makerName, handle: r.makerHandle },
			dangerChecks: r.dangerChecks,
			cautionChecks: r.cautionChecks,
			openFlags: r.openFlags,
			rereview: r.rereview,
			pendingChanges: r.pendingChangesAt !== null,
			note: r.note,
			claim:
				r.claimedById && r.claimedAt && r.claimedAt > cutoff
					? { byId: r.claimedById, byName: r.claimerName ?? 'A reviewer', at: r.claimedAt, until: new Date(r.claimedAt.getTime() + claimHours() * 3_600_000) }
					: null,
			previous: r.prevVerdict && r.prevRevision !== null ? { verdict: r.prevVerdict as Verdict, revision: r.prevRevision } : null
		})
	);
	const last = items.at(-1);
	const next =
		rows.length > limit && last
			? encodeCursor({ ...(q.sort === 'danger' ? { d: last.dangerChecks } : {}), t: last.requestedAt.toISOString(), id: last.id })
			: null;
	return { items, next, total };
}

/** Published builds whose makers asked for review, oldest request first (the first `limit` of the desk). */
export async function listWaiting(limit = 100): Promise<DeskBuild[]> {
	return (await listDesk(deskQuerySchema.parse({}), null, limit)).items;
}

/** The waiting request of one build, with its claim (null when the build is not on the desk). */
export async function getDeskEntry(buildId: string, now = new Date()): Promise<{ note: string; rereview: boolean; claim: DeskClaim | null } | null> {
	const rr = schema.reviewRequest;
	const [r] = await db
		.select({ note: rr.note, rereview: rr.rereview, claimedById: rr.claimedById, claimedAt: rr.claimedAt, name: schema.user.name })
		.from(rr)
		.leftJoin(schema.user, eq(schema.user.id, rr.claimedById))
		.where(eq(rr.buildId, buildId));
	if (!r) return null;
	const live = r.claimedById && r.claimedAt && r.claimedAt > claimCutoff(now);
	return {
		note: r.note,
		rereview: r.rereview,
		claim: live ? { byId: r.claimedById!, byName: r.name ?? 'A reviewer', at: r.claimedAt!, until: new Date(r.claimedAt!.getTime() + claimHours() * 3_600_000) } : null
	};
}

/**
 * "I'm reviewing this": the reviewer claims a waiting build so others leave it to them. One statement
 * decides it: the row is taken only when unclaimed, already this reviewer's, or its claim has lapsed —
 * of two reviewers claiming at once, PostgreSQL's row lock lets one win and the other gets 409.
 * Never the maker; reviewers and up. → 'claimed' | 'renewed'.
 */
export async function claimRequest(actor: Actor, buildId: string, now = new Date()): Promise<'claimed' | 'renewed'> {
	if (!roleAtLeast(actor.role, 'reviewer')) error(403, 'Only reviewers can claim a review request.');
	if (!/^[0-9a-f-]{36}$/i.test(buildId)) error(404, 'Not found');
	const rr = schema.reviewRequest;
	const [b] = await db
		.select({ ownerId: schema.build.ownerId, status: schema.build.status })
		.from(schema.build)
		.where(eq(schema.build.id, buildId));
	if (!b) error(404, 'Not found');
	assertCanView(actor, b);
	if (b.ownerId === actor.id) error(403, 'A maker can never review their own build.');
	if (b.status !== 'published') error(409, 'Only published builds can be reviewed.');
	const before = await db.select({ by: rr.claimedById, at: rr.claimedAt }).from(rr).where(eq(rr.buildId, buildId));
	if (!before.length) error(409, 'This build is not waiting for review any more.');
	const took = await db
		.update(rr)
		.set({ claimedById: actor.id, claimedAt: now })
		.where(
			and(
				eq(rr.buildId, buildId),
				sql`(${rr.claimedById} is null or ${rr.claimedById} = ${actor.id} or ${rr.claimedAt} is null or ${rr.claimedAt} <= ${ts(claimCutoff(now))})`
			)
		)
		.returning({ buildId: rr.buildId });
	if (took.length) return before[0].by === actor.id && before[0].at && before[0].at > claimCutoff(now) ? 'renewed' : 'claimed';
	const entry = await getDeskEntry(buildId, now);
	if (!entry) error(409, 'This build is not waiting for review any more.');
	error(409, `${entry.claim?.byName ?? 'Another reviewer'} is already reviewing this build. Pick another from the desk.`);
}

/**
 * Release a claim by hand: the reviewer who holds it, or a moderator. Releasing a claim that has
 * lapsed or is gone is not an error. → true when a claim was removed.
 */
export async function releaseClaim(actor: Actor, buildId: string): Promise<boolean> {
	if (!/^[0-9a-f-]{36}$/i.test(buildId)) error(404, 'Not found');
	const rr = schema.reviewRequest;
	const [row] = await db.select({ by: rr.claimedById }).from(rr).where(eq(rr.buildId, buildId));
	if (!row || !row.by) return false;
	if (row.by !== actor.id && !roleAtLeast(actor.role, 'moderator')) error(403, 'Only the reviewer who claimed it, or a moderator, can release this claim.');
	const done = await db
		.update(rr)
		.set({ claimedById: null, claimedAt: null })
		.where(and(eq(rr.buildId, buildId), eq(rr.claimedById, row.by)))
		.returning({ buildId: rr.buildId });
	return done.length > 0;
}

/** Throw 409 when another reviewer holds a live claim on the build (verdicts wait for them). */
export async function assertNotClaimedByOther(dbx: Pick<typeof db, 'select'>, actor: Actor, buildId: string, now = new Date()): Promise<void> {
	const rr = schema.reviewRequest;
	const [row] = await dbx
		.select({ by: rr.claimedById, at: rr.claimedAt, name: schema.user.name })
		.from(rr)
		.leftJoin(schema.user, eq(schema.user.id, rr.claimedById))
		.where(eq(rr.buildId, buildId));
	if (row?.by && row.by !== actor.id && row.at && row.at > claimCutoff(now)) {
		error(
			409,
			`${row.name ?? 'Another reviewer'} has claimed this review (“I'm reviewing this”) until ${new Date(row.at.getTime() + claimHours() * 3_600_000).toISOString().slice(0, 16).replace('T', ' ')} UTC. Tag hazards if you like; the sign-off or send-back is theirs until they release it or the claim lapses.`
		);
	}
}

/**
 * The desk's queries by name, with the index each is meant to use: for EXPLAIN in the integration test that
 * checks the plans (desk.spec.ts, at 6,000 waiting requests).
 */
export const DESK_QUERIES: { name: string; index: string; query: DeskQuery }[] = [
	{ name: 'desk: oldest waiting', index: 'review_request_oldest_idx', query: deskQuerySchema.parse({}) },
	{ name: 'desk: most danger first', index: 'review_request_danger_idx', query: deskQuerySchema.parse({ sort: 'danger' }) },
	{ name: 'desk: mains powered, oldest', index: 'review_request_mains_idx', query: deskQuerySchema.parse({ mains: true }) },
	{
		name: 'desk: mains with danger findings, most danger first',
		index: 'review_request_mains_danger_idx',
		query: deskQuerySchema.parse({ mains: true, danger: true, sort: 'danger' })
	},
	{ name: 'desk: one category, oldest', index: 'review_request_category_idx', query: deskQuerySchema.parse({ category: 'preamp' }) }
];

/** The SQL text and parameters of one desk page query — the very query listDesk sends (for EXPLAIN). */
export function deskPageSql(q: DeskQuery, now = new Date()) {
	return deskPageQuery(q, null, DESK_PAGE_SIZE, now).toSQL();
}

/** The latest verdicts on the site, newest first. */
export async function listRecentlyReviewed(limit = 20): Promise<DeskReview[]> {
	const rows = await db
		.select({
			id: schema.review.id,
			verdict: schema.review.verdict,
			revision: schema.review.revision,
			createdAt: schema.review.createdAt,
			slug: schema.build.slug,
			title: schema.build.title,
			buildRevision: schema.build.revision,
			mainsPowered: schema.build.mainsPowered,
			reviewerName: schema.user.name,
			reviewerHandle: schema.user.handle
		})
		.from(schema.review)
		.innerJoin(schema.build, eq(schema.build.id, schema.review.buildId))
		.innerJoin(schema.user, eq(schema.user.id, schema.review.reviewerId))
		.where(eq(schema.build.status, 'published'))
		.orderBy(desc(schema.review.createdAt))
		.limit(limit);
	return rows.map((r) => ({
		id: r.id,
		verdict: r.verdict as Verdict,
		revision: r.revision,
		createdAt: r.createdAt,
		build: { slug: r.slug, title: r.title, revision: r.buildRevision, mainsPowered: r.mainsPowered },
		reviewer: { name: r.reviewerName, handle: r.reviewerHandle }
	}));
}
