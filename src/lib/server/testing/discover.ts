// Integration-test helpers for discover: published builds inserted straight into the tables, so list,
// search and feed tests control publish times, derive counts and review times exactly.
import { inArray, sql } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import type { Role } from '$lib/roles';
import { createTestUser, removeTestUsers } from './builds';

const tag = () => `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 7)}`;

/** A unique lower-case token (consonants only, so the English stemmer leaves it whole) for titles and searches. */
export function uniqueWord(prefix = 'zq'): string {
	// Consonants only, no y: the Snowball English stemmer (PostgreSQL's english config) then changes
	// neither the word nor a prefix of it in a query (with vowels, a prefix ending in "y" became "i").
	const letters = 'bcdfghjklmnpqrstvwxz';
	let w = prefix;
	for (let i = 0; i < 10; i++) w += letters[Math.floor(Math.random() * letters.length)];
	return w;
}

export interface TestBuild {
	title?: string;
	summary?: string;
	searchText?: string;
	category?: string;
	topology?: string;
	mainsPowered?: boolean;
	status?: 'draft' | 'published' | 'archived';
	publishedAt?: Date | null;
	updatedAt?: Date;
	derivedCount?: number;
	lastReviewedAt?: Date | null;
	reviewRequestedAt?: Date | null;
	revision?: number;
}

/** Insert builds for `ownerId` (published now unless told otherwise). → their rows, in the order given. */
export async function insertBuilds(ownerId: string, builds: TestBuild[]) {
	if (builds.length === 0) return [];
	const t = tag();
	const rows = await db
		.insert(schema.build)
		.values(
			builds.map((b, i) => {
				const status = b.status ?? 'published';
				const publishedAt = b.publishedAt === undefined ? (status === 'draft' ? null : new Date()) : b.publishedAt;
				return {
					slug: `t-${t}-${i}`,
					ownerId,
					title: b.title ?? `Test build ${t} ${i}`,
					summary: b.summary ?? '',
					searchText: b.searchText ?? '',
					category: b.category ?? 'power-amp',
					topology: b.topology ?? 'class-ab-chip',
					mainsPowered: b.mainsPowered ?? false,
					status,
					revision: b.revision ?? (status === 'draft' ? 0 : 1),
					publishedAt,
					updatedAt: b.updatedAt ?? publishedAt ?? new Date(),
					derivedCount: b.derivedCount ?? 0,
					lastReviewedAt: b.lastReviewedAt ?? null,
					reviewRequestedAt: b.reviewRequestedAt ?? null
				};
			})
		)
		.returning();
	const bySlug = new Map(rows.map((r) => [r.slug, r]));
	return builds.map((_, i) => bySlug.get(`t-${t}-${i}`)!);
}

/** Add a review (verdict on a revision) by `reviewerId`, and keep build.last_reviewed_at as the app does. */
export async function insertReview(buildId: string, reviewerId: string, verdict: 'safe' | 'rework', revision: number, at = new Date()) {
	await db.insert(schema.review).values({ buildId, reviewerId, verdict, revision, summaryMd: 'ok', summaryHtml: '<p>ok</p>', createdAt: at });
	await db.update(schema.build).set({ lastReviewedAt: at }).where(sql`${schema.build.id} = ${buildId}`);
}

/** Delete builds by id (their steps, reviews, bench items cascade). */
export async function removeBuilds(ids: string[]): Promise<void> {
	if (ids.length) await db.delete(schema.build).where(inArray(schema.build.id, ids));
}

/** A throwaway member with a unique handle and e-mail (createTestUser). → { id, handle, name, role }. */
export const createMember = (role: Role = 'maker', name = 'Discover Tester') => createTestUser(role, name);

/** Remove throwaway members; their builds, reviews and bench items go with them (cascades). */
export const removeMembers = removeTestUsers;
