/**
 * A build's parts list (PRODUCT.md §4.4): read, validate, save as a whole (one transaction that replaces
 * every line), CSV import with a preview and CSV export. Values are parsed and normalised by $lib/parts;
 * checks that need the spec blocks are placed by ./checks.
 */
import { createHash } from 'node:crypto';
import { asc, eq } from 'drizzle-orm';
import * as schema from '../db/schema';
import { db, type Tx } from '../db';
import { inTx, type DbLike } from '../db/tx';
import type { Actor } from '../actor';
import { afterContentChange, assertCanEdit, lockBuild } from '../builds';
import { channelsOf, lineToDraft, normaliseLines, type LineError, type NormalisedPartLine, type PartLineDraft } from '$lib/parts';
import { railFromBlocks, refreshBuildChecks } from './checks';
import { previewPartsCsv, type ImportPreview } from './preview';

export { partsToCsv, readPartsCsv, CSV_COLUMNS, CSV_MAX_BYTES, type CsvRead, type CsvRow } from './csv';
export { previewPartsCsv, type ImportPreview, type PreviewRow } from './preview';
export { refreshBuildChecks, railFromBlocks, placeCrossChecks } from './checks';

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

/** The build's channel count for per-channel quantities (channelsOf: the amplifier block's channels, else 1). */
export async function buildChannels(buildId: string, dbx: DbLike = db): Promise<number> {
	return channelsOf(await blocksFor(dbx, buildId));
}

/** True when every field of a draft is blank (an empty editor row), so it is skipped rather than refused. */
export function isBlankDraft(d: PartLineDraft): boolean {
	return [d.designators, d.value, d.notes, d.designValue, d.reason, d.package, d.tolerance, d.ratingV, d.ratingW, d.mpn, d.supplier, d.unitPrice, d.currency].every(
		(s) => (s ?? '').trim() === ''
	);
}

/**
 * The version of a stored parts list: a hash of its lines (ids, order and every field a maker types), so an
 * editor can tell whether the list changed since it loaded it. Checks are left out: they follow from the
 * fields and the spec blocks. → 16 hex digits.
 */
export function partsListVersion(lines: readonly schema.PartLine[]): string {
	const h = createHash('sha256');
	for (const l of lines) {
		h.update(
			JSON.stringify([
				l.id,
				l.designators,
				l.quantity,
				l.kind,
				l.valueText,
				l.tolerancePct,
				l.ratingV,
				l.ratingW,
				l.package,
				l.notes,
				l.designValueText,
				l.substitutionReason,
				// Costed-list fields join the hash only when set, so a list saved before they existed keeps its version.
				...(l.ratingVAc || l.mpn || l.supplier || l.unitPrice !== null || l.currency !== null || l.perChannel
					? [l.ratingVAc, l.mpn, l.supplier, l.unitPrice, l.currency, l.perChannel]
					: [])
			])
		);
		h.update('\n');
	}
	return h.digest('hex').slice(0, 16);
}

/** A stored list as editor rows: each line's draft with its id (posted back so the line keeps it). */
export function editorRowsOf(lines: readonly schema.PartLine[]): { rows: PartLineDraft[]; ids: string[]; version: string } {
	return { rows: lines.map(lineToDraft), ids: lines.map((l) => l.id), version: partsListVersion(lines) };
}

/** The list as stored now, in editor form: what a conflicting save shows beside the maker's own rows. */
export interface PartsConflict {
	rows: PartLineDraft[];
	ids: string[];
	version: string;
}

/**
 * Result of saving a list: saved (with the revision it made, if any); the per-line errors, nothing stored;
 * or a conflict: the list changed since the editor loaded it (another tab, or an admin), nothing stored.
 */
export type SaveResult =
	| { ok: true; count: number; revision: number | null; version: string }
	| { ok: false; errors: LineError[]; conflict?: undefined }
	| { ok: false; errors: []; conflict: PartsConflict };

/**
 * Replace a build's whole parts list with `drafts`, in one transaction (owner or admin; not while locked).
 * Every line is validated first; if any is bad, nothing is written and the errors carry the line numbers
 * (`lineNumbers[i]` for draft i, default i + 1). Blank drafts are skipped. After the write: the lines'
 * checks (with the build's rail), the cross checks on the blocks, the search text, and a revision when
 * the build is published.
 *
 * `ids[i]` is the stored id draft i was loaded with (posted back by the editor): the line keeps that id, so
 * hazard tags on it keep their target whatever its designators. Lines without one (CSV imports) keep the
 * id of a line with the same designators, when exactly one had them. `expectedVersion` is the
 * partsListVersion the editor loaded: when the stored list moved since, nothing is written and the
 * stored list comes back as a conflict — a save never drops lines its editor did not show.
 */
export async function savePartsList(
	actor: Actor,
	buildId: string,
	drafts: readonly PartLineDraft[],
	opts: { lineNumbers?: readonly number[]; tx?: Tx; ids?: readonly (string | null | undefined)[]; expectedVersion?: string | null } = {}
): Promise<SaveResult> {
	const keep = drafts
		.map((d, i) => ({ d, n: opts.lineNumbers?.[i] ?? i + 1, id: opts.ids?.[i] || null }))
		.filter(({ d }) => !isBlankDraft(d));
	return inTx(opts.tx, async (t) => {
		const b = await lockBuild(t, buildId);
		assertCanEdit(actor, b);
		if (opts.expectedVersion) {
			const now = await listPartLines(buildId, t);
			if (partsListVersion(now) !== opts.expectedVersion) return { ok: false as const, errors: [] as [], conflict: editorRowsOf(now) };
		}
		const blocks = await blocksFor(t, buildId);
		const result = normaliseLines(
			keep.map((k) => k.d),
			{ railV: railFromBlocks(blocks) },
			keep.map((k) => k.n)
		);
		if (!result.ok) return { ok: false as const, errors: result.errors };
		await writeLines(t, buildId, blocks, result.lines, keep.map((k) => k.id));
		const revision = await afterContentChange(t, buildId, actor);
		const version = partsListVersion(await listPartLines(buildId, t));
		return { ok: true as const, count: result.lines.length, revision, version };
	});
}

/** Delete and re-insert the lines with their checks, then store the cross checks on the blocks. */
async function writeLines(
	t: Tx,
	buildId: string,
	blocks: Awaited<ReturnType<typeof blocksFor>>,
	lines: NormalisedPartLine[],
	postedIds: readonly (string | null)[] = []
): Promise<void> {
	// A line keeps the id it was loaded with (posted by the editor), so hazard tags on it keep their target;
	// a line without one keeps the id of the only earlier line with the same designators.
	const previous = await t
		.select({ id: schema.partLine.id, designators: schema.partLine.designators })
		.from(schema.partLine)
		.where(eq(schema.partLine.buildId, buildId));
	const unused = new Set(previous.map((p) => p.id));
	const ids: (string | null)[] = lines.map((_, i) => {
		const id = postedIds[i];
		if (id && unused.has(id)) {
			unused.delete(id);
			return id;
		}
		return null;
	});
	const idByDesignators = new Map<string, string>();
	for (const p of previous) {
		const key = p.designators.trim().toLowerCase();
		if (key && unused.has(p.id)) idByDesignators.set(key, idByDesignators.has(key) ? '' : p.id);
	}
	lines.forEach((l, i) => {
		if (ids[i] || postedIds[i]) return;
		const key = l.designators.trim().toLowerCase();
		const id = idByDesignators.get(key);
		if (!id) return;
		idByDesignators.set(key, '');
		ids[i] = id;
	});
	const keptId = (i: number) => (ids[i] ? { id: ids[i] } : {});
	await t.delete(schema.partLine).where(eq(schema.partLine.buildId, buildId));
	if (lines.length) {
		// Insert in slices: a thousand lines × 19 columns stays far below PostgreSQL's parameter limit per statement.
		for (let i = 0; i < lines.length; i += 200) {
			await t.insert(schema.partLine).values(
				lines.slice(i, i + 200).map((l, j) => ({
					...l,
					...keptId(i + j),
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
): Promise<{ ok: true; count: number; total: number; revision: number | null; version: string } | { ok: false; preview: ImportPreview }> {
	return db.transaction(async (t) => {
		const b = await lockBuild(t, buildId);
		assertCanEdit(actor, b);
		const preview = previewPartsCsv(text, await buildRailV(buildId, t));
		if (!preview.ok) return { ok: false as const, preview };
		const existingLines = mode === 'append' ? await listPartLines(buildId, t) : [];
		const existing = existingLines.map(lineToDraft);
		const imported = preview.rows.map((r) => r.draft);
		const saved = await savePartsList(actor, buildId, [...existing, ...imported], {
			tx: t,
			lineNumbers: [...existing.map((_, i) => -(i + 1)), ...preview.rows.map((r) => r.line)],
			ids: [...existingLines.map((l) => l.id), ...imported.map(() => null)]
		});
		if (!saved.ok) return { ok: false as const, preview: { ...preview, ok: false, fileErrors: saved.errors.map((e) => ({ line: e.line, message: e.message })) } };
		// `count` is the lines the CSV brought; `total` the lines of the list now.
		return { ...saved, count: imported.filter((d) => !isBlankDraft(d)).length, total: saved.count };
	});
}
