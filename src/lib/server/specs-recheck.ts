/**
 * Stored check results follow the rules in force: when the checks change (revision 2 added worst-case figures,
 * rectifier currents, new ids), blocks and parts lists saved under older rules still hold the old derived values and
 * checks. recheckStoredBuilds() recomputes every build that has spec blocks or part lines with the one function the
 * saves use (refreshBuildChecks → $lib/specs checkBuild), so the build page, review mode, the review desk and the
 * API read what checkBuild returns now — the live rows, and the snapshot of the published revision readers are
 * shown (its derived values and checks only; what the maker published stays as it was). It writes only rows whose
 * result changed, never makes a revision and never touches "edited since sign-off": the maker's content is
 * unchanged, only what is computed from it.
 * Run at app start through recheckAtStart (startup.ts): only when the rules version stored in `check_rules_applied`
 * differs from CHECK_RULES_VERSION, so an ordinary restart walks nothing (RECHECK_ON_START=off skips it, =always
 * walks regardless).
 */
import { and, asc, eq, gt, or, sql } from 'drizzle-orm';
import * as schema from './db/schema';
import { db } from './db';
import { inTx } from './db/tx';
import type { Tx } from './db';
import { recomputeChecks, refreshBuildChecks } from './parts/checks';
import { stableJson, type BuildSnapshot } from './builds/snapshot';

/**
 * The version of the check rules this code computes (`$lib/specs` checkBuild, the parts-list checks). Bump it in the
 * same commit as any change to a check's rule, figure, id, level or sentence: the next start then recomputes every
 * stored result once. 2 = checks revision 2 (worst-case rails, rectifier currents, speaker protection).
 */
export const CHECK_RULES_VERSION = 2;
/** The row of `check_rules_applied` that records the spec/parts checks. */
const RULES_ROW = 'spec-checks';

/** Recompute the derived values and checks inside the snapshot of revision `number` (what readers see). */
async function recheckSnapshot(t: Tx, buildId: string, number: number): Promise<void> {
	const [rev] = await t
		.select({ id: schema.buildRevision.id, snapshot: schema.buildRevision.snapshot })
		.from(schema.buildRevision)
		.where(and(eq(schema.buildRevision.buildId, buildId), eq(schema.buildRevision.number, number)));
	if (!rev) return;
	const snap = rev.snapshot as unknown as BuildSnapshot;
	if (!Array.isArray(snap.specBlocks) || !Array.isArray(snap.parts)) return;
	const next = recomputeChecks(
		snap.specBlocks.map((b) => ({ ...b, checks: b.checks as schema.StoredCheck[] })),
		snap.parts.map((p) => ({ ...p, value: p.value ?? null, ratingV: p.ratingV ?? null, checks: (p.checks ?? []) as schema.StoredCheck[] }))
	);
	const specBlocks = snap.specBlocks.map((b, i) => ({ ...b, derived: next.blocks[i].derived, checks: next.blocks[i].checks }));
	const parts = snap.parts.map((p, i) => ({ ...p, checks: next.lines[i] }));
	// Compared key-order-free: jsonb reorders keys, and an unchanged snapshot must not be rewritten (it would touch the reader cache).
	if (stableJson(specBlocks) !== stableJson(snap.specBlocks) || stableJson(parts) !== stableJson(snap.parts))
		await t
			.update(schema.buildRevision)
			.set({ snapshot: { ...snap, specBlocks, parts } as unknown as Record<string, unknown> })
			.where(eq(schema.buildRevision.id, rev.id));
}

/** Builds per page of the walk over the build table. */
const PAGE = 200;

/**
 * Recompute the stored checks of every build with spec blocks or part lines, one transaction per build with the
 * build row locked (a save in progress finishes first; a save after it recomputes anyway). → how many builds were
 * looked at. recheckStoredBuilds() → { builds: 6 } on the demo scenario.
 */
export async function recheckStoredBuilds(): Promise<{ builds: number }> {
	let after: string | null = null;
	let builds = 0;
	const hasContent = or(
		sql`exists (select 1 from ${schema.specBlock} where ${schema.specBlock.buildId} = ${schema.build.id})`,
		sql`exists (select 1 from ${schema.partLine} where ${schema.partLine.buildId} = ${schema.build.id})`
	);
	for (;;) {
		const page: { id: string }[] = await db
			.select({ id: schema.build.id })
			.from(schema.build)
			.where(after ? and(gt(schema.build.id, after), hasContent) : hasContent)
			.orderBy(asc(schema.build.id))
			.limit(PAGE);
		for (const { id } of page) {
			await inTx(undefined, async (t) => {
				const [b] = await t.select({ id: schema.build.id, revision: schema.build.revision }).from(schema.build).where(eq(schema.build.id, id)).for('update');
				if (!b) return;
				await refreshBuildChecks(t, id);
				if (b.revision > 0) await recheckSnapshot(t, id, b.revision);
			});
			builds++;
		}
		if (page.length < PAGE) break;
		after = page[page.length - 1].id;
	}
	return { builds };
}

/** The rules version the stored results were last brought up to, or null (never: a database from before the table). */
export async function appliedRulesVersion(): Promise<number | null> {
	const [row] = await db.select({ version: schema.checkRulesApplied.version }).from(schema.checkRulesApplied).where(eq(schema.checkRulesApplied.name, RULES_ROW));
	return row?.version ?? null;
}

/**
 * At app start: bring the stored checks up to `version` (CHECK_RULES_VERSION) unless they already are, then record it.
 * The version is written only after the whole walk, so a start interrupted part-way walks again next time (each build's
 * recheck is idempotent). Two instances starting together may both walk; each build is locked, so that only costs time.
 * `always` walks whatever is stored. → { builds walked, skipped: true when nothing needed doing }.
 */
export async function recheckAtStart({ version = CHECK_RULES_VERSION, always = false } = {}): Promise<{ builds: number; skipped: boolean }> {
	if (!always && (await appliedRulesVersion()) === version) return { builds: 0, skipped: true };
	const { builds } = await recheckStoredBuilds();
	await db
		.insert(schema.checkRulesApplied)
		.values({ name: RULES_ROW, version })
		.onConflictDoUpdate({ target: schema.checkRulesApplied.name, set: { version, appliedAt: sql`now()` } });
	return { builds, skipped: false };
}
