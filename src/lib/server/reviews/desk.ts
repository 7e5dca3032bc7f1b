/** The review desk (PRODUCT.md §4.5): builds waiting for review, oldest request first, and recent verdicts. */
import { and, desc, eq, isNotNull, sql, asc } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import * as schema from '../db/schema';
import { db } from '../db';
import type { Verdict } from '$lib/reviews';

export interface DeskBuild {
	id: string;
	slug: string;
	title: string;
	category: string;
	mainsPowered: boolean;
	revision: number;
	requestedAt: Date;
	maker: { id: string; name: string; handle: string | null };
	dangerChecks: number;
	cautionChecks: number;
	openFlags: number;
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

/** Count of checks at `level` over a build's spec blocks and part lines (jsonb arrays of { level }). */
function checkCount(level: 'danger' | 'caution') {
	return sql<number>`(
		(select count(*) from ${schema.specBlock} sb, jsonb_array_elements(sb.checks) c
			where sb.build_id = ${schema.build.id} and c->>'level' = ${level})
		+ (select count(*) from ${schema.partLine} pl, jsonb_array_elements(pl.checks) c
			where pl.build_id = ${schema.build.id} and c->>'level' = ${level})
	)::int`;
}

/** Published builds whose makers asked for review, oldest request first, with their check counts. */
export async function listWaiting(limit = 100): Promise<DeskBuild[]> {
	const maker = alias(schema.user, 'maker');
	const rows = await db
		.select({
			id: schema.build.id,
			slug: schema.build.slug,
			title: schema.build.title,
			category: schema.build.category,
			mainsPowered: schema.build.mainsPowered,
			revision: schema.build.revision,
			requestedAt: schema.build.reviewRequestedAt,
			makerId: maker.id,
			makerName: maker.name,
			makerHandle: maker.handle,
			dangerChecks: checkCount('danger'),
			cautionChecks: checkCount('caution'),
			openFlags: sql<number>`(select count(*) from ${schema.safetyFlag} f where f.build_id = ${schema.build.id} and f.state = 'open')::int`,
			prevVerdict: sql<string | null>`(select r.verdict from ${schema.review} r where r.build_id = ${schema.build.id} order by r.created_at desc limit 1)`,
			prevRevision: sql<number | null>`(select r.revision from ${schema.review} r where r.build_id = ${schema.build.id} order by r.created_at desc limit 1)`
		})
		.from(schema.build)
		.innerJoin(maker, eq(maker.id, schema.build.ownerId))
		.where(and(eq(schema.build.status, 'published'), isNotNull(schema.build.reviewRequestedAt)))
		.orderBy(asc(schema.build.reviewRequestedAt), asc(schema.build.id))
		.limit(limit);
	return rows.map((r) => ({
		id: r.id,
		slug: r.slug,
		title: r.title,
		category: r.category,
		mainsPowered: r.mainsPowered,
		revision: r.revision,
		requestedAt: r.requestedAt!,
		maker: { id: r.makerId, name: r.makerName, handle: r.makerHandle },
		dangerChecks: r.dangerChecks,
		cautionChecks: r.cautionChecks,
		openFlags: r.openFlags,
		previous: r.prevVerdict && r.prevRevision !== null ? { verdict: r.prevVerdict as Verdict, revision: r.prevRevision } : null
	}));
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
