/**
 * A build's parts list (PRODUCT.md §4.4): read, validate, save as a whole (one transaction that replaces
 * every line), CSV import with a preview and CSV export. Values are parsed and normalised by $lib/parts;
 * checks that need the spec blocks are placed by ./checks.
 */
import { asc, eq } from 'drizzle-orm';
import * as schema from '../db/schema';
import { db, type Tx } from '../db';
import { inTx, type DbLike } from '../db/tx';
import type { Actor } from '../actor';
import { afterContentChange, assertCanEdit, lockBuild } from '../builds';
import { lineToDraft, normaliseLines, type LineError, type NormalisedPartLine, type PartLineDraft } from '$lib/parts';
import { railFromBlocks, refreshBuildChecks } from './checks';
import { previewPartsCsv, type ImportPreview } from './preview';

export { partsToCsv, readPartsCsv, CSV_COLUMNS, CSV_MAX_BYTES, type CsvRead, type CsvRow } from './csv';
export { previewPartsCsv, type ImportPreview, type PreviewRow } from './preview';
export { refreshBuildChecks, railFromBlocks, placeCrossChecks } from './checks';
export { compareWithOrigin } from './compare';

/** A build's part lines in list order. */
export async function listPartLines(buildId: string, dbx: DbLike = db): Promise<schema.PartLine[]> {
	return dbx.select().from(schema.partLine).where(eq(schema.partLine.buildId, buildId)).orderBy(asc(schema.partLine.position));
}

/** The spec blocks the parts checks read, in display order. */
async function blocksFor(dbx: DbLike, buildId: string) {
	return dbx
		.select({ id: schema.specBlock.id, kind: schema.specBlock.kind, data: schema.specBlock.data, derived: schema.specBlock.derived, checks: schema.specBlock.checks })
		.from(schema.specBlock)
		.where(eq(schema.specBlock.buildId, buildId))
		.orderBy(asc(schema.specBlock.position), asc(schema.specBlock.createdAt));
}

/** The rail the build's parts checks use (see railFromBlocks), V or null. */
export async function buildRailV(buildId: string, dbx: DbLike = db): Promise<number | null> {
	return railFromBlocks(await blocksFor(dbx, buildId));
}

/** True when every field of a draft is blank (an empty editor row), so it is skipped rather than refused. */
export function isBlankDraft(d: PartLineDraft): boolean {
	return [d.designators, d.value, d.notes, d.designValue, d.reason, d.package, d.tolerance, d.ratingV, d.ratingW].every(
		(s) => (s ?? '').trim() === ''
	);
}

/** Result of saving a list: either saved (with the revision it made, if any) or the per-line errors, nothing stored. */
export type SaveResult =
	| { ok: true; count: number; revision: number | null }
	| { ok: false; errors: LineError[] };

/**
 * Replace a build's whole parts list with `drafts`, in one transaction (owner or admin; not while locked).
 * Every line is validated first; if any is bad, nothing is written and the errors carry the line numbers
 * (`lineNumbers[i]` for draft i, default i + 1). Blank drafts are skipped. After the write: the lines'
 * checks (with the build's rail), the cross checks on the blocks, the search text, and a revision when
 * the build is published.
 */
export async function savePartsList(
	actor: Actor,
	buildId: string,
	drafts: readonly PartLineDraft[],
	opts: { lineNumbers?: readonly number[]; tx?: Tx } = {}
): Promise<SaveResult> {
	const keep = drafts.map((d, i) => ({ d, n: opts.lineNumbers?.[i] ?? i + 1 })).filter(({ d }) => !isBlankDraft(d));
	return inTx(opts.tx, async (t) => {
		const b = await lockBuild(t, buildId);
		assertCanEdit(actor, b);
		const blocks = await blocksFor(t, buildId);
		const result = normaliseLines(
			keep.map((k) => k.d),
			{ railV: railFromBlocks(blocks) },
			keep.map((k) => k.n)
		);
		if (!result.ok) return { ok: false as const, errors: result.errors };
		await writeLines(t, buildId, blocks, result.lines);
		const revision = await afterContentChange(t, buildId, actor);
		return { ok: true as const, count: result.lines.length, revision };
	});
}

/** Delete and re-insert the lines with their checks, then store the cross checks on the blocks. */
async function writeLines(
	t: Tx,
	buildId: string,
	blocks: Awaited<ReturnType<typeof blocksFor>>,
	lines: NormalisedPartLine[]
): Promise<void> {
	// A line keeps its id while its designators stay the same, so safety flags on it keep their target.
	const previous = await t
		.select({ id: schema.partLine.id, designators: schema.partLine.designators })
		.from(schema.partLine)
		.where(eq(schema.partLine.buildId, buildId));
	const idByDesignators = new Map<string, string>();
	for (const p of previous) {
		const key = p.designators.trim().toLowerCase();
		if (key) idByDesignators.set(key, idByDesignators.has(key) ? '' : p.id);
	}
	const keptId = (designators: string) => {
		const key = designators.trim().toLowerCase();
		const id = idByDesignators.get(key);
		if (!id) return {};
		idByDesignators.set(key, '');
		return { id };
	};
	await t.delete(schema.partLine).where(eq(schema.partLine.buildId, buildId));
	if (lines.length) {
		// Insert in slices: a thousand lines × 19 columns stays far below PostgreSQL's parameter limit per statement.
		for (let i = 0; i < lines.length; i += 200) {
			await t.insert(schema.partLine).values(
				lines.slice(i, i + 200).map((l, j) => ({
					...l,
					...keptId(l.designators),
					buildId,
					position: i + j,
					checks: l.checks
				}))
			);
		}
	}
	// Cross checks on lines and blocks: the same whole-build computation as POST /api/v1/spec-check/build.
	await refreshBuildChecks(t, buildId);
}

/**
 * Import a CSV into a build's parts list: `replace` the list or `append` to it. Validates everything first
 * (errors carry the CSV's line numbers; nothing is saved unless every line is valid), then saves through
 * savePartsList in one transaction.
 */
export async function importPartsCsv(
	actor: Actor,
	buildId: string,
	text: string,
	mode: 'replace' | 'append' = 'replace'
): Promise<{ ok: true; count: number; revision: number | null } | { ok: false; preview: ImportPreview }> {
	return db.transaction(async (t) => {
		const b = await lockBuild(t, buildId);
		assertCanEdit(actor, b);
		const preview = previewPartsCsv(text, await buildRailV(buildId, t));
		if (!preview.ok) return { ok: false as const, preview };
		const existing = mode === 'append' ? (await listPartLines(buildId, t)).map(lineToDraft) : [];
		const imported = preview.rows.map((r) => r.draft);
		const saved = await savePartsList(actor, buildId, [...existing, ...imported], {
			tx: t,
			lineNumbers: [...existing.map((_, i) => -(i + 1)), ...preview.rows.map((r) => r.line)]
		});
		if (!saved.ok) return { ok: false as const, preview: { ...preview, ok: false, fileErrors: saved.errors.map((e) => ({ line: e.line, message: e.message })) } };
		return saved;
	});
}
