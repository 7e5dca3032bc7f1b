/**
 * Safety flags (PRODUCT.md §3, §4.5): a reviewer points at a step, a spec block or a part line with a
 * category, a severity and a Markdown note. Lifecycle:
 *   open → addressed   by the build's maker, with a note saying what they changed
 *   open | addressed → resolved   by a reviewer (or above) who is not the maker
 *   addressed | resolved → open   "reopened", by a reviewer (or above) who is not the maker
 * Every rule is checked here, whatever route calls it.
 */
import { error } from '@sveltejs/kit';
import { and, eq, inArray, sql } from 'drizzle-orm';
import * as schema from '../db/schema';
import { db, type Tx } from '../db';
import { renderMarkdown } from '../markdown';
import { recordAudit } from '../audit';
import { notifyFlag, notifyFlagUpdate } from '../notifications';
import { stripControls } from '../http/control-chars';
import { inTx } from '../db/tx';
import type { Actor } from '../actor';
import { assertCanView } from '../builds/access';
import { roleAtLeast } from '$lib/roles';
import { addressFlagSchema, clearFlagSchema, flagMessageSchema, raiseFlagSchema, type RaiseFlagInput } from '$lib/schemas/review';
import { FLAG_STATES, type FlagState } from '$lib/reviews';
import { requireTarget } from './targets';


type BuildForReview = Pick<schema.Build, 'id' | 'ownerId' | 'status' | 'slug' | 'title' | 'revision'>;

/**
 * Throw unless `actor` may review `build` (raise flags, give a verdict): 403 below reviewer or for the
 * build's own maker — a maker can never review their own build — and 409 unless it is published.
 */
export function assertCanReview(actor: Actor, build: Pick<schema.Build, 'ownerId' | 'status'>): void {
	assertCanView(actor, build);
	if (!roleAtLeast(actor.role, 'reviewer')) error(403, 'Only reviewers can review builds.');
	if (actor.id === build.ownerId) error(403, 'A maker can never review their own build.');
	if (build.status !== 'published') error(409, 'Only published builds can be reviewed.');
}

/** True when `actor` may review `build` (for showing links; the server still checks on use). */
export function canReview(actor: Actor | null | undefined, build: Pick<schema.Build, 'ownerId' | 'status'>): boolean {
	return !!actor && roleAtLeast(actor.role, 'reviewer') && actor.id !== build.ownerId && build.status === 'published';
}

async function lockBuildRow(tx: Tx, buildId: string): Promise<schema.Build> {
	const [b] = await tx.select().from(schema.build).where(eq(schema.build.id, buildId)).for('update');
	if (!b) error(404, 'Not found');
	return b;
}

async function lockFlag(tx: Tx, flagId: string): Promise<{ flag: schema.SafetyFlag; build: schema.Build }> {
	if (!/^[0-9a-f-]{36}$/i.test(flagId)) error(404, 'Not found');
	const [flag] = await tx.select().from(schema.safetyFlag).where(eq(schema.safetyFlag.id, flagId)).for('update');
	if (!flag) error(404, 'Not found');
	const [build] = await tx.select().from(schema.build).where(eq(schema.build.id, flag.buildId));
	if (!build) error(404, 'Not found');
	return { flag, build };
}

/** Options for writes: run in the caller's transaction; `notify: false` queues no mail (seed). */
export interface WriteOptions {
	tx?: Tx;
	notify?: boolean;
}

/**
 * Raise a safety flag on a step, spec block or part line of a published build. The flag remembers the
 * build revision it was raised on. The maker is e-mailed (unless they turned flag mail off).
 * → the new flag's id.
 */
export async function raiseFlag(actor: Actor, buildId: string, input: RaiseFlagInput, opts: WriteOptions = {}): Promise<string> {
	const data = raiseFlagSchema.parse(input);
	const noteHtml = renderMarkdown(data.note);
	const result = await inTx(opts.tx, async (tx) => {
		const b = await lockBuildRow(tx, buildId);
		assertCanReview(actor, b);
		const target = await requireTarget(tx, b.id, data.targetKind, data.targetId);
		const [row] = await tx
			.insert(schema.safetyFlag)
			.values({
				buildId: b.id,
				raisedById: actor.id,
				targetKind: data.targetKind,
				targetId: data.targetId,
				category: data.category,
				severity: data.severity,
				noteMd: data.note,
				noteHtml,
				revision: b.revision
			})
			.returning({ id: schema.safetyFlag.id });
		await recordAudit(tx, {
			actorId: actor.id,
			action: 'flag.raise',
			targetKind: 'flag',
			targetId: row.id,
			details: { build: b.slug, category: data.category, severity: data.severity, target: target.label }
		});
		return { id: row.id, build: b, target };
	});
	if (opts.notify !== false) {
		await notifyFlag({
			ownerId: result.build.ownerId,
			actorId: actor.id,
			reviewerName: await nameOf(actor),
			build: result.build,
			flagId: result.id,
			category: data.category,
			severity: data.severity,
			targetLabel: result.target.label,
			noteMd: data.note
		});
	}
	return result.id;
}

/**
 * The maker marks a flag addressed, saying what they changed. Only from "open"; not on a locked build. The
 * reviewer who hung it and the build's watchers are told (kind `flag`).
 */
export async function addressFlag(actor: Actor, flagId: string, note: string, opts: WriteOptions = {}): Promise<BuildForReview> {
	const data = addressFlagSchema.parse({ note });
	const out = await inTx(opts.tx, async (tx) => {
		const { flag, build } = await lockFlag(tx, flagId);
		assertCanView(actor, build);
		if (actor.id !== build.ownerId) error(403, 'Only the maker of this build can mark its hazard tags fixed.');
		if (build.locked) error(403, 'A moderator has locked this build, so its hazard tags cannot be changed for now.');
		if (flag.state !== 'open') error(409, `This hazard tag is ${FLAG_STATES[flag.state as FlagState]?.toLowerCase() ?? flag.state}, not tagged: only a tag still tagged can be marked fixed.`);
		await tx
			.update(schema.safetyFlag)
			.set({ state: 'addressed', addressedNote: data.note, addressedAt: new Date(), updatedAt: new Date() })
			.where(eq(schema.safetyFlag.id, flag.id));
		return { build, flag };
	});
	if (opts.notify !== false) {
		await notifyFlagUpdate({
			toId: out.flag.raisedById,
			actorId: actor.id,
			actorName: await nameOf(actor),
			build: out.build,
			flagId: out.flag.id,
			category: out.flag.category,
			what: 'fixed',
			text: data.note
		});
	}
	return out.build;
}

const FROM: Record<'resolve' | 'reopen', FlagState[]> = {
	resolve: ['open', 'addressed'],
	reopen: ['addressed', 'resolved']
};

/**
 * A reviewer (not the build's maker) resolves a flag (from open or addressed), with an optional note
 * saying why it is cleared, or reopens it (from addressed or resolved). Written to the audit log; the
 * maker is told (kind `flag`). → the build it belongs to.
 */
export async function setFlagState(
	actor: Actor,
	flagId: string,
	change: 'resolve' | 'reopen',
	opts: WriteOptions & { note?: string } = {}
): Promise<BuildForReview> {
	const note = clearFlagSchema.parse({ note: stripControls(opts.note ?? '') }).note;
	const out = await inTx(opts.tx, async (tx) => {
		const { flag, build } = await lockFlag(tx, flagId);
		assertCanView(actor, build);
		if (!roleAtLeast(actor.role, 'reviewer')) error(403, 'Only reviewers can clear or re-tag hazard tags.');
		if (actor.id === build.ownerId) error(403, 'A maker cannot clear or re-tag hazard tags on their own build.');
		if (!FROM[change].includes(flag.state as FlagState)) {
			error(409, change === 'resolve' ? 'This hazard tag is already cleared.' : 'This hazard tag is already tagged.');
		}
		const now = new Date();
		await tx
			.update(schema.safetyFlag)
			.set(
				change === 'resolve'
					? { state: 'resolved', resolvedById: actor.id, resolvedAt: now, resolvedNote: note, updatedAt: now }
					: { state: 'open', resolvedById: null, resolvedAt: null, resolvedNote: '', updatedAt: now }
			)
			.where(eq(schema.safetyFlag.id, flag.id));
		await recordAudit(tx, {
			actorId: actor.id,
			action: change === 'resolve' ? 'flag.resolve' : 'flag.reopen',
			targetKind: 'flag',
			targetId: flag.id,
			details: { build: build.slug, from: flag.state }
		});
		return { build, flag };
	});
	if (opts.notify !== false) {
		await notifyFlagUpdate({
			toId: out.build.ownerId,
			actorId: actor.id,
			actorName: await nameOf(actor),
			build: out.build,
			flagId: out.flag.id,
			category: out.flag.category,
			what: change === 'resolve' ? 'cleared' : 'retagged',
			text: note
		});
	}
	return out.build;
}

/**
 * A message in a hazard tag's thread: the build's maker, or a reviewer (or above) who is not the maker.
 * Not on a locked build. The other side is told (kind `flag`): the maker's message goes to the reviewer
 * who hung the tag; a reviewer's message goes to the maker. → the message id.
 */
export async function postFlagMessage(actor: Actor, flagId: string, body: string, opts: WriteOptions = {}): Promise<string> {
	const data = flagMessageSchema.parse({ body: stripControls(body) });
	const out = await inTx(opts.tx, async (tx) => {
		const { flag, build } = await lockFlag(tx, flagId);
		assertCanView(actor, build);
		const isMaker = actor.id === build.ownerId;
		if (!isMaker && !roleAtLeast(actor.role, 'reviewer')) error(403, 'Only the maker and reviewers can write on a hazard tag.');
		if (build.locked) error(403, 'A moderator has locked this build, so its hazard tags cannot be changed for now.');
		const [row] = await tx
			.insert(schema.flagMessage)
			.values({ flagId: flag.id, authorId: actor.id, bodyMd: data.body, bodyHtml: renderMarkdown(data.body) })
			.returning({ id: schema.flagMessage.id });
		// Touch the tag: its build's pages show the thread's length (and the reader cache keys on such writes).
		await tx.update(schema.safetyFlag).set({ updatedAt: new Date() }).where(eq(schema.safetyFlag.id, flag.id));
		return { id: row.id, flag, build, isMaker };
	});
	const toId = out.isMaker ? out.flag.raisedById : out.build.ownerId;
	if (opts.notify !== false && toId !== actor.id) {
		await notifyFlagUpdate({
			toId,
			actorId: actor.id,
			actorName: await nameOf(actor),
			build: out.build,
			flagId: out.flag.id,
			category: out.flag.category,
			what: 'message',
			text: data.body
		});
	}
	return out.id;
}

/** Open flags per target of a build: targetId → count (for inline markers on steps, spec blocks and parts). */
export async function getFlagMarkers(buildId: string): Promise<Map<string, number>> {
	if (!/^[0-9a-f-]{36}$/i.test(buildId)) return new Map();
	const rows = await db
		.select({ targetId: schema.safetyFlag.targetId, n: sql<number>`count(*)::int` })
		.from(schema.safetyFlag)
		.where(and(eq(schema.safetyFlag.buildId, buildId), eq(schema.safetyFlag.state, 'open')))
		.groupBy(schema.safetyFlag.targetId);
	return new Map(rows.map((r) => [r.targetId, r.n]));
}

/** Count of open flags for each of many builds (review desk). */
export async function openFlagCounts(buildIds: string[]): Promise<Map<string, number>> {
	if (!buildIds.length) return new Map();
	const rows = await db
		.select({ buildId: schema.safetyFlag.buildId, n: sql<number>`count(*)::int` })
		.from(schema.safetyFlag)
		.where(and(inArray(schema.safetyFlag.buildId, buildIds), eq(schema.safetyFlag.state, 'open')))
		.groupBy(schema.safetyFlag.buildId);
	return new Map(rows.map((r) => [r.buildId, r.n]));
}

/** One flag with the build it belongs to; 404 when absent. */
export async function getFlag(flagId: string) {
	if (!/^[0-9a-f-]{36}$/i.test(flagId)) error(404, 'Not found');
	const [row] = await db.select().from(schema.safetyFlag).where(eq(schema.safetyFlag.id, flagId));
	if (!row) error(404, 'Not found');
	return row;
}

async function nameOf(actor: Actor): Promise<string> {
	if (actor.name) return actor.name;
	const [u] = await db.select({ name: schema.user.name }).from(schema.user).where(eq(schema.user.id, actor.id));
	return u?.name ?? 'A reviewer';
}

export { nameOf as reviewerName };
