/**
 * Checks that span a build: the parts list's own checks need the supply rail from the spec blocks, and the
 * cross checks read all blocks and the parts list. Everything is computed by the one function behind
 * POST /api/v1/spec-check/build (checkBuildRows in ../specs, $lib/specs checkBuild) and stored whenever the parts
 * list or a spec block is saved, so the build page, review mode, the review desk's counts and the API read the
 * same result straight from the rows.
 * Where a cross check lands: checks about a part line (values.line) on that line; the others on one block each
 * (measurements, thermal, supply, then amplifier — the block whose numbers the maker would change).
 */
import { asc, eq } from 'drizzle-orm';
import * as schema from '../db/schema';
import type { StoredCheck } from '../db/schema';
import type { Tx } from '../db';
import { type Check } from '$lib/specs';
import { lineToDraft, normaliseLine, type NormalisedPartLine, type PartCheck } from '$lib/parts';
import { checkBuildRows, partInput } from '../specs';
import { stableJson } from '../builds/snapshot';

type BlockRow = Pick<schema.SpecBlock, 'id' | 'kind' | 'data' | 'derived' | 'checks'>;
type LineLike = Pick<NormalisedPartLine, 'designators' | 'value' | 'ratingV'> & { kind: string; notes?: string | null };

/**
 * Highest voltage the parts may see on one rail, V: the largest rail of the supply blocks off load at high mains
 * (derived.highMainsPeakDcV, the worst case of API.md revision 2), else the largest amplifier block rail
 * (railV; split supplies per side). Null without either.
 * railFromBlocks([{ kind: 'supply', derived: { highMainsPeakDcV: 40.8 } }]) → 40.8.
 */
export function railFromBlocks(blocks: readonly Pick<BlockRow, 'kind' | 'data' | 'derived'>[]): number | null {
	const supply = blocks
		.filter((b) => b.kind === 'supply')
		.map((b) => Number((b.derived as Record<string, unknown>)?.highMainsPeakDcV ?? (b.derived as Record<string, unknown>)?.peakDcV))
		.filter((v) => Number.isFinite(v) && v > 0);
	if (supply.length) return Math.max(...supply);
	const amp = blocks
		.filter((b) => b.kind === 'amplifier')
		.map((b) => Number((b.data as Record<string, unknown>)?.railV))
		.filter((v) => Number.isFinite(v) && v > 0);
	return amp.length ? Math.max(...amp) : null;
}

const BLOCK_KEYS = ['measurementsBlock', 'thermalBlock', 'supplyBlock', 'amplifierBlock'] as const;

const toStored = (c: Check | PartCheck): StoredCheck => ({
	id: c.id,
	level: c.level,
	message: c.message,
	values: { ...c.values },
	...(c.caution ? { caution: c.caution } : {})
});

/**
 * Say where each cross check lands: per block id and per line index. Blocks are in display order (the indexes
 * the checks report refer to it).
 */
export function placeCrossChecks(
	blocks: readonly Pick<BlockRow, 'id'>[],
	lines: readonly LineLike[],
	cross: readonly Check[]
): { byBlock: Map<string, StoredCheck[]>; byLine: StoredCheck[][] } {
	const byBlock = new Map<string, StoredCheck[]>();
	const byLine: StoredCheck[][] = lines.map(() => []);
	for (const c of cross) {
		// A check about one part line names it by index (values.line).
		if (typeof c.values.line === 'number') {
			if (byLine[c.values.line] && !byLine[c.values.line].some((x) => x.id === c.id)) byLine[c.values.line].push(toStored(c));
			continue;
		}
		const key = BLOCK_KEYS.find((k) => typeof c.values[k] === 'number');
		const block = key ? blocks[c.values[key] as number] : undefined;
		if (!block) continue;
		byBlock.set(block.id, [...(byBlock.get(block.id) ?? []), toStored(c)]);
	}
	return { byBlock, byLine };
}

/** Checks a line gets from the whole-build computation (placed, not its own). */
const PLACED = new Set(['part.fuse-larger']);
const own = (checks: readonly StoredCheck[] | null | undefined) => (checks ?? []).filter((c) => !c.id.startsWith('cross.') && !PLACED.has(c.id));
// Key-order-free: jsonb reorders object keys, so a plain JSON comparison would rewrite unchanged rows (and touch the reader cache).
const same = (a: unknown, b: unknown) => stableJson(a) === stableJson(b);

/** A stored part line as recomputeChecks reads it (a part_line row, or a line of a revision snapshot). */
type StoredLine = Parameters<typeof lineToDraft>[0] & Pick<NormalisedPartLine, 'value' | 'ratingV'> & { kind: string; notes?: string | null; valueText?: string | null; designValueText?: string | null; checks?: readonly StoredCheck[] | null };

/**
 * What a build's stored rows should hold under the rules in force (pure): every block's derived values and checks as
 * the whole-build check returns them (an amplifier block takes its worst case from the build's supply block), the
 * parts list's own checks (they need the rail) and the cross checks placed on lines and blocks. Used for the live
 * rows (refreshBuildChecks) and for a published revision's snapshot (specs-recheck).
 */
export function recomputeChecks(
	blocks: readonly BlockRow[],
	rows: readonly StoredLine[]
): { blocks: { derived: Record<string, unknown>; checks: StoredCheck[] }[]; lines: StoredCheck[][] } {
	// An AC rating (X/Y capacitors) is not a DC rating: the cross checks compare ratings with DC rails, so it is left out.
	const result = checkBuildRows(
		blocks,
		rows.map((r) => ((r as { ratingVAc?: number | null }).ratingVAc ? { ...r, ratingV: null } : r)) as never
	);
	const railV = railFromBlocks(blocks.map((b, i) => ({ ...b, derived: result.blocks[i].derived })));
	const { byBlock, byLine } = placeCrossChecks(blocks, rows as never, result.crossRaw);
	return {
		blocks: blocks.map((b, i) => ({ derived: result.blocks[i].derived, checks: [...result.blocks[i].checks.map(toStored), ...(byBlock.get(b.id) ?? [])] })),
		lines: rows.map((row, i) => {
			// A stored line was valid when saved; if the rules changed since, keep its old own checks.
			const again = normaliseLine(lineToDraft(row), i + 1, { railV });
			return [...(again.line ? again.line.checks.map(toStored) : own(row.checks)), ...byLine[i]];
		})
	};
}

/**
 * Recompute and store, in the caller's transaction, the checks of recomputeChecks for the build's live rows.
 * Writes only rows that changed.
 */
export async function refreshBuildChecks(tx: Tx, buildId: string): Promise<void> {
	const [blocks, rows] = await Promise.all([
		tx
			.select({ id: schema.specBlock.id, kind: schema.specBlock.kind, data: schema.specBlock.data, derived: schema.specBlock.derived, checks: schema.specBlock.checks })
			.from(schema.specBlock)
			.where(eq(schema.specBlock.buildId, buildId))
			.orderBy(asc(schema.specBlock.position), asc(schema.specBlock.createdAt)),
		tx.select().from(schema.partLine).where(eq(schema.partLine.buildId, buildId)).orderBy(asc(schema.partLine.position))
	]);
	const next = recomputeChecks(blocks, rows);
	for (const [i, b] of blocks.entries()) {
		const n = next.blocks[i];
		if (!same(n.checks, b.checks) || !same(n.derived, b.derived)) await tx.update(schema.specBlock).set(n).where(eq(schema.specBlock.id, b.id));
	}
	for (const [i, row] of rows.entries())
		if (!same(next.lines[i], row.checks)) await tx.update(schema.partLine).set({ checks: next.lines[i] }).where(eq(schema.partLine.id, row.id));
}

export { partInput };
