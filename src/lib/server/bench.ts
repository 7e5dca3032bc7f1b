/**
 * A member's bench: the builds they saved to come back to (PRODUCT.md §3, §4.8). Only builds readers
 * can see go on a bench (published, or archived after saving); saving twice or removing twice is harmless.
 */
import { and, desc, eq, inArray, ne } from 'drizzle-orm';
import { error } from '@sveltejs/kit';
import { db } from './db';
import * as schema from './db/schema';
import { getBuildBySlug } from './builds/queries';
import { selectBuildList } from './builds/list';
import Papa from 'papaparse';
import { quoteFormula } from './parts/csv';
import { combineShopping, type ShoppingLine, type ShoppingRow } from '$lib/bench/shopping';

/** Most builds one bench lists (a bench is a short list; beyond this the oldest saves drop off the page). */
export const BENCH_LIST_MAX = 500;

/** Whether `userId` has the build on their bench. */
export async function isOnBench(userId: string, buildId: string): Promise<boolean> {
	const [row] = await db
		.select({ buildId: schema.benchItem.buildId })
		.from(schema.benchItem)
		.where(and(eq(schema.benchItem.userId, userId), eq(schema.benchItem.buildId, buildId)));
	return !!row;
}

/** Which of `buildIds` are on the member's bench (one query for a whole list). */
export async function benchedIds(userId: string, buildIds: string[]): Promise<Set<string>> {
	if (buildIds.length === 0) return new Set();
	const rows = await db
		.select({ buildId: schema.benchItem.buildId })
		.from(schema.benchItem)
		.where(and(eq(schema.benchItem.userId, userId), inArray(schema.benchItem.buildId, buildIds)));
	return new Set(rows.map((r) => r.buildId));
}

/**
 * Put a build on the member's bench (`saved = true`) or take it off. 404 for a build readers cannot see;
 * 409 for a draft (only published builds can be saved). → the build's new state.
 */
export async function setOnBench(userId: string, slug: string, saved: boolean): Promise<{ slug: string; saved: boolean }> {
	const b = await getBuildBySlug(slug);
	if (!b || (b.status === 'draft' && b.ownerId !== userId)) error(404, 'Not found');
	if (saved) {
		if (b.status !== 'published') error(409, 'Only published builds can be saved to a bench.');
		await db.insert(schema.benchItem).values({ userId, buildId: b.id }).onConflictDoNothing();
	} else {
		await db.delete(schema.benchItem).where(and(eq(schema.benchItem.userId, userId), eq(schema.benchItem.buildId, b.id)));
	}
	return { slug: b.slug, saved };
}

/** The member's bench, most recently saved first: list rows (published and archived builds) with when each was saved. */
export async function listBench(userId: string) {
	const rows = await selectBuildList()
		.innerJoin(schema.benchItem, and(eq(schema.benchItem.buildId, schema.build.id), eq(schema.benchItem.userId, userId)))
		.where(ne(schema.build.status, 'draft'))
		.orderBy(desc(schema.benchItem.createdAt), desc(schema.build.id))
		.limit(BENCH_LIST_MAX);
	return rows;
}

// --- Notes per saved build and the combined shopping list ---------------------------------------------

/** Longest note a member keeps on a saved build. */
export const BENCH_NOTE_MAX = 2000;

/** The member's notes on their saved builds: build id → note (only non-empty ones). */
export async function benchNotes(userId: string): Promise<Map<string, string>> {
	const rows = await db
		.select({ buildId: schema.benchItem.buildId, note: schema.benchItem.note })
		.from(schema.benchItem)
		.where(and(eq(schema.benchItem.userId, userId), ne(schema.benchItem.note, '')));
	return new Map(rows.map((r) => [r.buildId, r.note]));
}

/** Keep a note on a saved build (only the member sees it). 404 when the build is not on their bench; 422 for an overlong note. */
export async function setBenchNote(userId: string, slug: string, note: string): Promise<{ slug: string; note: string }> {
	const text = note.replace(/\r\n/g, '\n').trim();
	if (text.length > BENCH_NOTE_MAX) error(422, `Keep the note under ${BENCH_NOTE_MAX} characters.`);
	const b = await getBuildBySlug(slug);
	if (!b) error(404, 'Not found');
	const rows = await db
		.update(schema.benchItem)
		.set({ note: text })
		.where(and(eq(schema.benchItem.userId, userId), eq(schema.benchItem.buildId, b.id)))
		.returning({ buildId: schema.benchItem.buildId });
	if (!rows.length) error(404, 'That build is not on your bench: save it first.');
	return { slug: b.slug, note: text };
}

/** Most builds one shopping list combines. */
export const SHOPPING_MAX_BUILDS = 50;

/**
 * The combined shopping list of the chosen builds on the member's bench (slugs not on it are left out): each
 * build's parts list as its latest published revision has it (what readers see), summed by kind, value and
 * ratings (combineShopping). → { builds: [{ slug, title }], rows }
 */
export async function shoppingList(userId: string, slugs: readonly string[]) {
	const wanted = [...new Set(slugs)].slice(0, SHOPPING_MAX_BUILDS);
	if (!wanted.length) return { builds: [], rows: [] as ShoppingRow[] };
	const rows = await db
		.select({ slug: schema.build.slug, title: schema.build.title, snapshot: schema.buildRevision.snapshot })
		.from(schema.benchItem)
		.innerJoin(schema.build, eq(schema.build.id, schema.benchItem.buildId))
		.innerJoin(schema.buildRevision, and(eq(schema.buildRevision.buildId, schema.build.id), eq(schema.buildRevision.number, schema.build.revision)))
		.where(and(eq(schema.benchItem.userId, userId), inArray(schema.build.slug, wanted), ne(schema.build.status, 'draft')))
		.orderBy(desc(schema.benchItem.createdAt));
	const builds = rows.map((r) => ({
		slug: r.slug,
		title: r.title,
		lines: (((r.snapshot as { parts?: ShoppingLine[] }).parts ?? []) as ShoppingLine[]).map((p) => ({
			kind: p.kind,
			quantity: p.quantity,
			valueText: p.valueText ?? '',
			value: p.value ?? null,
			unit: p.unit ?? null,
			ratingV: p.ratingV ?? null,
			ratingW: p.ratingW ?? null,
			package: p.package ?? '',
			designators: p.designators ?? ''
		}))
	}));
	return { builds: builds.map(({ slug, title }) => ({ slug, title })), rows: combineShopping(builds) };
}

/** Column headers of the shopping list CSV, in order. */
export const SHOPPING_CSV_COLUMNS = ['kind', 'value', 'value_si', 'unit', 'rating_v', 'rating_w', 'quantity', 'packages', 'used_in'] as const;

/**
 * The shopping list as RFC 4180 CSV (header row, CRLF after every record, fields with commas, quotes or line
 * breaks quoted); text a spreadsheet could run as a formula gets a leading ' (as the parts list export does).
 */
export function shoppingCsv(rows: readonly ShoppingRow[]): string {
	const num = (x: number | null) => (x === null ? '' : String(x));
	const data = rows.map((r) => [
		quoteFormula(r.kind),
		quoteFormula(r.value),
		num(r.valueSI),
		r.unit ?? '',
		num(r.ratingV),
		num(r.ratingW),
		String(r.quantity),
		quoteFormula(r.packages.join(', ')),
		quoteFormula(r.uses.map((u) => `${u.build}: ${u.designators || u.quantity}`).join('; '))
	]);
	return `${Papa.unparse({ fields: [...SHOPPING_CSV_COLUMNS], data }, { newline: '\r\n', quotes: false, escapeFormulae: false })}\r\n`;
}
