/** A build's steps: add, edit, delete, move up/down. Markdown is stored as source plus sanitized HTML. */
import { error } from '@sveltejs/kit';
import { and, asc, eq, gt, or, sql } from 'drizzle-orm';
import * as schema from '../db/schema';
import { db, type Tx } from '../db';
import { PHOTO_REF, renderMarkdown, type PlacedPhoto } from '../markdown';
import { photoUrl } from '$lib/media';
import type { DbLike } from '../db/tx';
import { photoObjectKeys } from '../photos';
import { deleteObjects } from '../photos';
import { stepSchema, type StepInput } from '$lib/schemas/build';
import type { Actor } from '../actor';
import { assertCanEdit } from './access';
import { afterContentChange } from './editable';
import { lockBuild } from './edit';
import { inTx } from '../db/tx';

/**
 * Step text → sanitized HTML, with `[[photo:1a2b3c4d]]` references resolved to photos of THIS build only
 * (an id prefix that matches no photo of the build, or two, renders as a short note instead). The image is
 * the photo's largest rendition under /media, sized by its own width and height.
 */
export async function renderStepMarkdown(dbx: DbLike | undefined, buildId: string, md: string): Promise<string> {
	const runner = dbx ?? db;
	const refs = [...new Set([...md.matchAll(PHOTO_REF)].map((m) => m[1].toLowerCase()))].slice(0, 50);
	if (refs.length === 0) return renderMarkdown(md, { photos: () => null });
	const rows = await runner
		.select()
		.from(schema.photo)
		.where(and(eq(schema.photo.buildId, buildId), or(...refs.map((r) => sql`${schema.photo.id}::text like ${`${r}%`}`))));
	const placed = new Map<string, PlacedPhoto | null>();
	for (const r of refs) {
		const hits = rows.filter((p) => p.id.startsWith(r));
		const p = hits.length === 1 ? hits[0] : null;
		const w = p ? Math.max(...p.widths) : 0;
		placed.set(r, p ? { src: photoUrl(p.keyPrefix, w), alt: p.alt, width: w, height: Math.round((p.height * w) / p.width) } : null);
	}
	return renderMarkdown(md, { photos: (ref) => placed.get(ref) ?? null });
}

/**
 * A photo of the build is being deleted (in `tx`, after its row is gone): take its `[[photo:…]]` code out of the
 * build's step text and store the text rendered again, so no step keeps an image that is gone or a code that points
 * nowhere. The step's version moves on, so an editor still holding the old text gets the usual conflict instead of
 * putting the code back unseen. If another photo of the build shares the 8-character code, the text keeps it (it now
 * names that photo) and is only rendered again. → the number of steps changed.
 */
export async function forgetPlacedPhoto(tx: Tx, buildId: string, photoId: string): Promise<number> {
	const ref = photoId.slice(0, 8).toLowerCase();
	if (!/^[0-9a-f]{8}$/.test(ref)) return 0;
	const steps = await tx
		.select({ id: schema.buildStep.id, bodyMd: schema.buildStep.bodyMd })
		.from(schema.buildStep)
		.where(and(eq(schema.buildStep.buildId, buildId), sql`${schema.buildStep.bodyMd} ilike ${`%[[photo:${ref}]]%`}`));
	if (steps.length === 0) return 0;
	const [another] = await tx
		.select({ id: schema.photo.id })
		.from(schema.photo)
		.where(and(eq(schema.photo.buildId, buildId), sql`${schema.photo.id}::text like ${`${ref}%`}`))
		.limit(1);
	// A code on a line of its own goes with the line breaks before it (no blank lines left over); one inside a line goes alone.
	const onItsLine = new RegExp(`(?:\\n[ \\t]*){0,4}\\[\\[photo:${ref}\\]\\][ \\t]*(?=\\n|$)`, 'gi');
	const code = new RegExp(`\\[\\[photo:${ref}\\]\\]`, 'gi');
	for (const step of steps) {
		const bodyMd = another ? step.bodyMd : step.bodyMd.replace(onItsLine, '').replace(code, '').trim();
		const bodyHtml = await renderStepMarkdown(tx, buildId, bodyMd);
		await tx.update(schema.buildStep).set({ bodyMd, bodyHtml, updatedAt: new Date() }).where(eq(schema.buildStep.id, step.id));
	}
	return steps.length;
}

/** An <img> tag as the sanitizer writes it (attribute values in double quotes, `"` inside them escaped). */
const IMG_TAG = /<img\b(?:\s+[^\s"'>/=]+(?:="[^"]*")?)*\s*\/?>/g;
/** The photo id in a placed photo's address (`/media/photos/<id>/<width>.webp`). */
const PLACED_SRC = /\ssrc="\/media\/photos\/([0-9a-f-]{36})\//;

/** The ids of the photos placed in stored step HTML (`img.placed-photo`). */
export function placedPhotoIds(html: string): string[] {
	return [...html.matchAll(IMG_TAG)].filter((m) => m[0].includes('class="placed-photo"')).flatMap((m) => PLACED_SRC.exec(m[0])?.[1] ?? []);
}

/**
 * Stored step HTML with every placed photo that no longer exists shown as a short sentence instead of a broken image:
 * a published revision keeps the HTML of its day, and its photos may have been deleted since.
 */
export function markRemovedPhotos(html: string, exists: (photoId: string) => boolean): string {
	return html.replace(IMG_TAG, (tag) => {
		const id = tag.includes('class="placed-photo"') ? PLACED_SRC.exec(tag)?.[1] : undefined;
		return id && !exists(id) ? '<span class="photo-missing">[This photo has been removed.]</span>' : tag;
	});
}

/** The step and its build (row-locked), checking that `actor` may edit; 404 when the step is gone. */
async function stepForEdit(tx: Tx, actor: Actor, stepId: string, buildId?: string) {
	const [step] = await tx.select().from(schema.buildStep).where(eq(schema.buildStep.id, stepId));
	if (!step || (buildId && step.buildId !== buildId)) error(404, 'That step no longer exists.');
	const b = await lockBuild(tx, step.buildId);
	assertCanEdit(actor, b);
	return { step, build: b };
}

/** Add a step at the end (owner or admin). Validated with stepSchema. → { id, position } */
export async function addStep(actor: Actor, buildId: string, input: StepInput, tx?: Tx): Promise<{ id: string; position: number }> {
	const data = stepSchema.parse(input);
	return inTx(tx, async (t) => {
		const b = await lockBuild(t, buildId);
		assertCanEdit(actor, b);
		const bodyHtml = await renderStepMarkdown(t, buildId, data.bodyMd);
		const [{ next }] = await t
			.select({ next: sql<number>`coalesce(max(${schema.buildStep.position}) + 1, 0)::int` })
			.from(schema.buildStep)
			.where(eq(schema.buildStep.buildId, buildId));
		const [row] = await t
			.insert(schema.buildStep)
			.values({ buildId, position: next, title: data.title, bodyMd: data.bodyMd, bodyHtml })
			.returning({ id: schema.buildStep.id, position: schema.buildStep.position });
		await afterContentChange(t, buildId, actor);
		return row;
	});
}

/** The version of a step an editor loaded: its updatedAt as ISO text (millisecond precision, as read back). */
export const stepVersion = (step: Pick<schema.BuildStep, 'updatedAt'>): string => step.updatedAt.toISOString();

/** A refused step save: the step as stored now, for the editor to show beside the maker's text. */
export interface StepConflict {
	title: string;
	bodyMd: string;
	version: string;
}

/**
 * Change a step's title and text (owner or admin). `buildId`, when given, must be the step's build.
 * `expectedVersion` is the stepVersion the editor loaded: when the step was saved since (another tab, an
 * admin), nothing is written and the stored step comes back as `{ conflict }`. → `{ version }` after a save.
 */
export async function updateStep(
	actor: Actor,
	stepId: string,
	input: StepInput,
	tx?: Tx,
	buildId?: string,
	expectedVersion?: string | null
): Promise<{ version: string; conflict?: undefined } | { conflict: StepConflict }> {
	const data = stepSchema.parse(input);
	return inTx(tx, async (t) => {
		const { step } = await stepForEdit(t, actor, stepId, buildId);
		const bodyHtml = await renderStepMarkdown(t, step.buildId, data.bodyMd);
		if (expectedVersion && stepVersion(step) !== expectedVersion) {
			return { conflict: { title: step.title, bodyMd: step.bodyMd, version: stepVersion(step) } };
		}
		if (step.title === data.title && step.bodyMd === data.bodyMd && step.bodyHtml === bodyHtml) return { version: stepVersion(step) };
		const updatedAt = new Date();
		await t
			.update(schema.buildStep)
			.set({ title: data.title, bodyMd: data.bodyMd, bodyHtml, updatedAt })
			.where(eq(schema.buildStep.id, stepId));
		await afterContentChange(t, step.buildId, actor);
		return { version: updatedAt.toISOString() };
	});
}

/**
 * Delete a step (owner or admin); later steps move up one place. Its photos go with it: the rows in
 * the transaction, then their stored objects once the rows are gone.
 */
export async function deleteStep(actor: Actor, stepId: string, tx?: Tx, buildId?: string): Promise<void> {
	const photos = await inTx(tx, async (t) => {
		const { step } = await stepForEdit(t, actor, stepId, buildId);
		const gone = await t
			.delete(schema.photo)
			.where(eq(schema.photo.stepId, stepId))
			.returning({ keyPrefix: schema.photo.keyPrefix, widths: schema.photo.widths });
		await t.delete(schema.buildStep).where(eq(schema.buildStep.id, stepId));
		await t
			.update(schema.buildStep)
			.set({ position: sql`${schema.buildStep.position} - 1` })
			.where(and(eq(schema.buildStep.buildId, step.buildId), gt(schema.buildStep.position, step.position)));
		await afterContentChange(t, step.buildId, actor);
		return gone;
	});
	if (photos.length) {
		await deleteObjects(photos.flatMap(photoObjectKeys)).catch((e) =>
			console.error(`step ${stepId}: could not delete its photos' objects`, e)
		);
	}
}

/**
 * Move a step one place up or down (owner or admin) by swapping it with its neighbour. Moving the
 * first step up or the last down changes nothing. → the step's new 0-based index.
 */
export async function moveStep(actor: Actor, stepId: string, direction: 'up' | 'down', tx?: Tx, buildId?: string): Promise<number> {
	return inTx(tx, async (t) => {
		const { step } = await stepForEdit(t, actor, stepId, buildId);
		const steps = await t
			.select({ id: schema.buildStep.id, position: schema.buildStep.position })
			.from(schema.buildStep)
			.where(eq(schema.buildStep.buildId, step.buildId))
			.orderBy(asc(schema.buildStep.position), asc(schema.buildStep.createdAt));
		const ids = steps.map((s) => s.id);
		const was = new Map(steps.map((s) => [s.id, s.position]));
		const from = ids.indexOf(stepId);
		const to = direction === 'up' ? from - 1 : from + 1;
		if (to < 0 || to >= ids.length) return from;
		[ids[from], ids[to]] = [ids[to], ids[from]];
		// Rewrite every position (also repairs gaps or duplicates left by older data).
		for (let i = 0; i < ids.length; i++) {
			if (was.get(ids[i]) === i) continue;
			await t.update(schema.buildStep).set({ position: i }).where(eq(schema.buildStep.id, ids[i]));
		}
		await afterContentChange(t, step.buildId, actor);
		return to;
	});
}
