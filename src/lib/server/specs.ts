/**
 * Spec blocks of a build (PRODUCT.md §4.3): validate with the kind's zod schema (field-level issues),
 * derive values and checks with $lib/specs, store them, and keep the cross checks between blocks and the
 * parts list current. Owner or admin only; a locked build refuses changes (see builds/access).
 */
import { error } from '@sveltejs/kit';
import { and, asc, eq, max } from 'drizzle-orm';
import { ZodError } from 'zod';
import * as schema from './db/schema';
import type { StoredCheck } from './db/schema';
import { db, type Tx } from './db';
import { inTx, type DbLike } from './db/tx';
import type { Actor } from './actor';
import { afterContentChange, assertCanEdit, lockBuild } from './builds';
import { InputRangeError } from '$lib/engineering';
import {
	checkBuild,
	isSpecKind,
	runSpec,
	specSchemas,
	SPEC_KINDS,
	type BuildCheckResult,
	type Check,
	type PartLineInput,
	type SpecBlockInput as BlockInput,
	type SpecKind
} from '$lib/specs';
import { refreshBuildChecks } from './parts/checks';
import { isUuid } from '$lib/uuid';

/** One problem with one field of a block: `path` is a dot path into the block's data ("device.dropoutV"). */
export interface SpecIssue {
	path: string;
	message: string;
}

/** Most blocks one build may hold. */
export const MAX_SPEC_BLOCKS = 40;
/** Longest block title. */
export const SPEC_TITLE_MAX = 120;

/** A block that passed its schema, with what the server derived. */
export interface ValidSpec {
	ok: true;
	kind: SpecKind;
	data: Record<string, unknown>;
	derived: Record<string, unknown>;
	checks: StoredCheck[];
}

/**
 * Validate `data` with the schema of `kind` and derive its values and checks. Never throws for bad input:
 * → { ok: false, issues } with one issue per field (dot paths), or { ok: true, data (parsed, defaults
 * filled), derived, checks }. validateSpec('amplifier', { …, loadOhm: 0.1 }) → issues [{ path: 'loadOhm', … }].
 */
export function validateSpec(kind: string, data: unknown): ValidSpec | { ok: false; issues: SpecIssue[] } {
	if (!isSpecKind(kind)) return { ok: false, issues: [{ path: 'kind', message: `must be one of ${SPEC_KINDS.join(', ')}` }] };
	const parsed = specSchemas[kind].safeParse(data);
	if (!parsed.success) return { ok: false, issues: zodIssues(parsed.error) };
	try {
		const { derived, checks } = runSpec(kind, parsed.data);
		return {
			ok: true,
			kind,
			data: parsed.data as Record<string, unknown>,
			derived: derived as Record<string, unknown>,
			checks: checks.map((c) => ({ ...c, values: { ...c.values } }))
		};
	} catch (e) {
		if (e instanceof InputRangeError) return { ok: false, issues: [{ path: e.field, message: e.message }] };
		if (e instanceof RangeError) return { ok: false, issues: [{ path: '', message: e.message }] };
		if (e instanceof ZodError) return { ok: false, issues: zodIssues(e) };
		throw e;
	}
}

/** zod issues as dot-path issues, one per path (the first message wins). */
export function zodIssues(err: ZodError): SpecIssue[] {
	const out: SpecIssue[] = [];
	for (const i of err.issues) {
		const path = i.path.map(String).join('.');
		if (!out.some((o) => o.path === path)) out.push({ path, message: i.message });
	}
	return out;
}

/**
 * The one computation behind POST /api/v1/spec-check/build and every build page, review mode and review desk:
 * $lib/specs checkBuild over the build's own blocks and parts (stored by refreshBuildChecks on every save).
 */
export function checkBuildSpecs(blocks: readonly BlockInput[], parts: readonly PartLineInput[] = []): BuildCheckResult {
	return checkBuild(blocks, parts);
}

/** A part line that says it sits across both rails ("rail to rail", "across the rails") is checked against both. */
const RAIL_TO_RAIL = /rail[\s-]+to[\s-]+rail|across (?:both|the) rails/i;

/** A stored or posted part line as the cross checks read it. partInput({ designators: 'C9', kind: 'capacitor', value: 1e-7, ratingV: 63, notes: 'rail to rail' }).railToRail → true. */
export function partInput(l: {
	designators: string;
	kind: string;
	value: number | null;
	ratingV?: number | null;
	notes?: string | null;
	railToRail?: boolean;
	valueText?: string | null;
	designValueText?: string | null;
}): PartLineInput {
	return {
		designators: l.designators,
		kind: l.kind,
		value: l.value,
		ratingV: l.ratingV ?? null,
		railToRail: l.railToRail ?? RAIL_TO_RAIL.test(l.notes ?? ''),
		valueText: l.valueText ?? null,
		designValueText: l.designValueText ?? null
	};
}

/** What a build's stored rows get: per block its derived values and own checks, and the cross checks to place. */
export interface BuildRowsResult {
	blocks: { derived: Record<string, unknown>; checks: Check[] }[];
	crossRaw: Check[];
}

/**
 * checkBuildSpecs over stored rows. A stored block that no longer passes its schema (the rules changed since it was
 * saved) keeps its stored derived values and gets the caution spec.out-of-date naming the fields to fix.
 */
export function checkBuildRows(
	blocks: readonly { kind: string; data: unknown; derived: unknown }[],
	lines: readonly { designators: string; kind: string; value: number | null; ratingV?: number | null; notes?: string | null; valueText?: string | null; designValueText?: string | null }[]
): BuildRowsResult {
	const r = checkBuildSpecs(blocks, lines.map(partInput));
	return {
		blocks: r.blocks.map((o, i) => {
			if (o.ok) return { derived: o.derived, checks: o.checks };
			const issues = o.error instanceof ZodError ? zodIssues(o.error) : [{ path: (o.error as { field?: string }).field ?? '', message: o.error.message }];
			return {
				derived: (blocks[i].derived ?? {}) as Record<string, unknown>,
				checks: [
					{
						id: 'spec.out-of-date',
						level: 'caution',
						message: `This block no longer passes the checks (${issues.map((x) => (x.path ? `${x.path}: ${x.message}` : x.message)).join('; ')}); the figures shown are from when it was saved. Edit the block to re-run its checks.`,
						values: { issues: issues.length }
					}
				]
			};
		}),
		crossRaw: r.cross
	};
}

/** The answer of POST /api/v1/spec-check/build, or the first failing block's error with its index. */
export type BuildCheckAnswer =
	| { ok: true; body: { blocks: { derived: Record<string, unknown>; checks: Check[] }[]; cross: Check[] } }
	| { ok: false; zod: ZodError }
	| { ok: false; range: RangeError; index: number };

/**
 * checkBuildSpecs for the API: every block must pass; schema issues of all blocks come back together with paths
 * from the body root (blocks.2.data.railV).
 */
export function checkBuildRequest(blocks: readonly BlockInput[], parts: readonly PartLineInput[] = []): BuildCheckAnswer {
	const r = checkBuildSpecs(blocks, parts);
	const zodIssuesAll = r.blocks.flatMap((o, i) =>
		!o.ok && o.error instanceof ZodError ? o.error.issues.map((iss) => ({ ...iss, path: ['blocks', i, 'data', ...iss.path] })) : []
	);
	if (zodIssuesAll.length) return { ok: false, zod: new ZodError(zodIssuesAll) };
	const bad = r.blocks.findIndex((o) => !o.ok);
	if (bad >= 0) {
		const o = r.blocks[bad];
		return { ok: false, range: (o as { error: RangeError }).error, index: bad };
	}
	return {
		ok: true,
		body: { blocks: r.blocks.map((o) => (o.ok ? { derived: o.derived, checks: o.checks } : { derived: {}, checks: [] })), cross: r.cross }
	};
}

/** A build's spec blocks in display order. */
export async function listSpecBlocks(buildId: string, dbx: DbLike = db): Promise<schema.SpecBlock[]> {
	return dbx
		.select()
		.from(schema.specBlock)
		.where(eq(schema.specBlock.buildId, buildId))
		.orderBy(asc(schema.specBlock.position), asc(schema.specBlock.createdAt));
}

/** What a caller saves: a new block (no id) or a change to one of the build's blocks. */
export interface SpecBlockInput {
	id?: string | null;
	kind: string;
	title?: string;
	data: unknown;
}

/** The version of a stored block an editor loaded: its updatedAt as ISO text (changes on every save of the block). */
export const specBlockVersion = (b: Pick<schema.SpecBlock, 'updatedAt'>): string => b.updatedAt.toISOString();

/** A refused save: the block as stored now, for the editor to show beside the maker's version. */
export interface SpecConflict {
	version: string;
	title: string;
	data: Record<string, unknown>;
}

/** Saving a block either stores it, reports its issues (and stores nothing), or finds the block moved since it was loaded. */
export type SaveSpecResult =
	| { ok: true; id: string; derived: Record<string, unknown>; checks: StoredCheck[]; revision: number | null; version: string }
	| { ok: false; issues: SpecIssue[]; conflict?: undefined }
	| { ok: false; conflict: SpecConflict; issues?: undefined };


/** The block `blockId` of build `buildId`, locked for update; 404 when it is not this build's. */
async function ownBlock(t: Tx, buildId: string, blockId: string): Promise<schema.SpecBlock> {
	if (!isUuid(blockId)) error(404, 'No such spec block on this build.');
	const [row] = await t
		.select()
		.from(schema.specBlock)
		.where(and(eq(schema.specBlock.id, blockId), eq(schema.specBlock.buildId, buildId)))
		.for('update');
	if (!row) error(404, 'No such spec block on this build.');
	return row;
}

/** After any block change: cross checks and parts checks, then what follows every content change. */
async function afterChange(t: Tx, buildId: string, actor: Actor): Promise<number | null> {
	await refreshBuildChecks(t, buildId);
	return afterContentChange(t, buildId, actor);
}

/**
 * Add or change a spec block (owner or admin; 403 otherwise or while locked; 404 for another build's block).
 * Invalid data → { ok: false, issues } and nothing is stored. A block keeps its kind. The stored checks are
 * the block's own plus the cross checks that land on it. `expectedVersion` (specBlockVersion of the block the editor
 * loaded): when the block was saved since (another tab, an admin), nothing is written and the stored block comes
 * back as { ok: false, conflict }.
 */
export async function saveSpecBlock(actor: Actor, buildId: string, input: SpecBlockInput, tx?: Tx, expectedVersion?: string | null): Promise<SaveSpecResult> {
	const title = typeof input.title === 'string' ? input.title.trim() : '';
	return inTx(tx, async (t) => {
		const b = await lockBuild(t, buildId);
		assertCanEdit(actor, b);
		const existing = input.id ? await ownBlock(t, buildId, input.id) : null;
		if (existing && expectedVersion && specBlockVersion(existing) !== expectedVersion)
			return { ok: false as const, conflict: { version: specBlockVersion(existing), title: existing.title, data: existing.data } };
		const issues: SpecIssue[] = [];
		if (title.length > SPEC_TITLE_MAX) issues.push({ path: 'title', message: `must be at most ${SPEC_TITLE_MAX} characters` });
		if (existing && existing.kind !== input.kind)
			issues.push({ path: 'kind', message: `a ${existing.kind} block stays a ${existing.kind} block; add a new block for another kind` });
		const v = validateSpec(input.kind, input.data);
		if (!v.ok) issues.push(...v.issues);
		if (issues.length || !v.ok) return { ok: false as const, issues };

		let id: string;
		if (existing) {
			await t
				.update(schema.specBlock)
				.set({ title, data: v.data, derived: v.derived, checks: v.checks, updatedAt: new Date(Math.max(Date.now(), existing.updatedAt.getTime() + 1)) })
				.where(eq(schema.specBlock.id, existing.id));
			id = existing.id;
		} else {
			const rows = await t.select({ id: schema.specBlock.id }).from(schema.specBlock).where(eq(schema.specBlock.buildId, buildId));
			if (rows.length >= MAX_SPEC_BLOCKS)
				return { ok: false as const, issues: [{ path: '', message: `A build holds at most ${MAX_SPEC_BLOCKS} spec blocks.` }] };
			const [{ top }] = await t.select({ top: max(schema.specBlock.position) }).from(schema.specBlock).where(eq(schema.specBlock.buildId, buildId));
			const [row] = await t
				.insert(schema.specBlock)
				.values({ buildId, kind: v.kind, title, data: v.data, derived: v.derived, checks: v.checks, position: (top ?? -1) + 1 })
				.returning({ id: schema.specBlock.id });
			id = row.id;
		}
		const revision = await afterChange(t, buildId, actor);
		const [stored] = await t
			.select({ derived: schema.specBlock.derived, checks: schema.specBlock.checks, updatedAt: schema.specBlock.updatedAt })
			.from(schema.specBlock)
			.where(eq(schema.specBlock.id, id));
		return { ok: true as const, id, derived: stored.derived as Record<string, unknown>, checks: stored.checks, revision, version: specBlockVersion(stored) };
	});
}

/** Delete one of the build's spec blocks (owner or admin; not while locked). → the revision made, if any. */
export async function deleteSpecBlock(actor: Actor, buildId: string, blockId: string, tx?: Tx): Promise<number | null> {
	return inTx(tx, async (t) => {
		const b = await lockBuild(t, buildId);
		assertCanEdit(actor, b);
		await ownBlock(t, buildId, blockId);
		await t.delete(schema.specBlock).where(eq(schema.specBlock.id, blockId));
		return afterChange(t, buildId, actor);
	});
}

/** Move a block one place up (-1) or down (+1) in the build's order (owner or admin; not while locked). */
export async function moveSpecBlock(actor: Actor, buildId: string, blockId: string, direction: -1 | 1, tx?: Tx): Promise<void> {
	await inTx(tx, async (t) => {
		const b = await lockBuild(t, buildId);
		assertCanEdit(actor, b);
		await ownBlock(t, buildId, blockId);
		const blocks = await listSpecBlocks(buildId, t);
		const i = blocks.findIndex((x) => x.id === blockId);
		const j = i + direction;
		if (j < 0 || j >= blocks.length) return;
		[blocks[i], blocks[j]] = [blocks[j], blocks[i]];
		for (const [pos, blk] of blocks.entries())
			if (blk.position !== pos) await t.update(schema.specBlock).set({ position: pos }).where(eq(schema.specBlock.id, blk.id));
		await afterChange(t, buildId, actor);
	});
}

/** A cross check with where it is stored: on a block (blockId) or on a part line (partLineId). */
export interface PlacedCrossCheck {
	check: StoredCheck;
	blockId: string | null;
	partLineId: string | null;
}

/**
 * The cross checks of a build as stored (blocks and part lines), for pages that list them in one place.
 * They are recomputed on every save of a block or of the parts list.
 */
export async function buildCrossChecks(buildId: string, dbx: DbLike = db): Promise<PlacedCrossCheck[]> {
	const [blocks, lines] = await Promise.all([
		dbx.select({ id: schema.specBlock.id, checks: schema.specBlock.checks }).from(schema.specBlock).where(eq(schema.specBlock.buildId, buildId)).orderBy(asc(schema.specBlock.position)),
		dbx.select({ id: schema.partLine.id, checks: schema.partLine.checks }).from(schema.partLine).where(eq(schema.partLine.buildId, buildId)).orderBy(asc(schema.partLine.position))
	]);
	return [
		...blocks.flatMap((b) => b.checks.filter((c) => c.id.startsWith('cross.')).map((check) => ({ check, blockId: b.id, partLineId: null }))),
		...lines.flatMap((l) => l.checks.filter((c) => c.id.startsWith('cross.')).map((check) => ({ check, blockId: null, partLineId: l.id })))
	];
}
