import sharp, { type Metadata, type SharpOptions } from 'sharp';
import pLimit from 'p-limit';
import { and, eq, inArray, isNull, sql } from 'drizzle-orm';
import { env } from '$env/dynamic/private';
import { db, type Tx } from '../db';
import type { DbLike } from '../db/tx';
import * as schema from '../db/schema';
import { deleteObjects, putObject } from './storage';
import { deleteObjectsDurably } from './object-deletion';
import { FieldError } from '../http/upload';
import type { Actor } from '../actor';
import { afterContentChange } from '../builds/editable';
import { forgetPlacedPhoto } from '../builds/steps';
import { photoSrcset, photoUrl, type PhotoView } from '$lib/media';
import { isUuid } from '$lib/uuid';

export { photoSrcset, photoUrl, type PhotoView };

/**
 * The photo pipeline: bytes from a browser → checked by content → auto-rotated, metadata
 * stripped, resized into WebP renditions → stored under `photos/<id>/<width>.webp` → one
 * `photo` row. A failure at any point leaves no object and no row behind.
 */

/** Rendition widths in px. A source narrower than one of them is never upscaled. */
export const PHOTO_WIDTHS = [320, 640, 1280] as const;
/** Default upload limit in bytes (env `PHOTO_MAX_BYTES` overrides). */
export const DEFAULT_PHOTO_MAX_BYTES = 15 * 1024 * 1024;
/** Default decoded-pixel limit (env `PHOTO_MAX_PIXELS` overrides): stops decompression bombs. */
export const DEFAULT_PHOTO_MAX_PIXELS = 40_000_000;
/** Alt text length bounds, in characters after trimming. */
export const ALT_MIN = 1;
export const ALT_MAX = 300;

const CACHE_FOREVER = 'public, max-age=31536000, immutable';
/** Longest side over shortest side; beyond it the renditions would pass WebP's 16383 px limit. */
const MAX_ASPECT = 10;

/** Upload limit in bytes from env, else 15 MiB. */
export function photoMaxBytes(): number {
	const n = Number(env.PHOTO_MAX_BYTES);
	return Number.isFinite(n) && n > 0 ? Math.floor(n) : DEFAULT_PHOTO_MAX_BYTES;
}

/** Pixel limit (width × height of the decoded image) from env, else 40 MP. */
export function photoMaxPixels(): number {
	const n = Number(env.PHOTO_MAX_PIXELS);
	return Number.isFinite(n) && n > 0 ? Math.floor(n) : DEFAULT_PHOTO_MAX_PIXELS;
}

/** A refusal about a photo the maker can act on; `status`, `code` and `path` map straight onto the API envelope. */
export class PhotoError extends FieldError {
	override name = 'PhotoError';
}

export type ImageFormat = 'jpeg' | 'png' | 'webp';

const ascii = (bytes: Uint8Array, start: number, end: number) =>
	String.fromCharCode(...bytes.subarray(start, end));

/**
 * The image format from the file's first bytes (its "magic number"), never from its name or
 * the browser's MIME type. JPEG FF D8 FF; PNG 89 'PNG' 0D 0A 1A 0A; WebP 'RIFF' … 'WEBP';
 * 'heic' for HEIC/HEIF containers (recognised only to refuse them kindly); null otherwise.
 */
export function sniffImageFormat(bytes: Uint8Array): ImageFormat | 'heic' | null {
	if (bytes.length >= 3 && bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) return 'jpeg';
	if (
		bytes.length >= 8 &&
		[0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a].every((b, i) => bytes[i] === b)
	)
		return 'png';
	if (bytes.length >= 12 && ascii(bytes, 0, 4) === 'RIFF' && ascii(bytes, 8, 12) === 'WEBP') return 'webp';
	if (bytes.length >= 12 && ascii(bytes, 4, 8) === 'ftyp') {
		const brand = ascii(bytes, 8, 12);
		if (['heic', 'heix', 'hevc', 'hevx', 'heim', 'heis', 'mif1', 'msf1'].includes(brand)) return 'heic';
	}
	return null;
}

/** Trimmed alt text, or a PhotoError saying what is wrong with it. */
export function checkAlt(alt: unknown): string {
	const text = typeof alt === 'string' ? alt.replace(/[\u0000-\u001f\u007f]+/g, ' ').trim() : '';
	if (text.length < ALT_MIN) {
		throw new PhotoError(400, 'invalid', 'Add a short description of the photo (alt text) for readers who cannot see it.', 'alt');
	}
	if (text.length > ALT_MAX) {
		throw new PhotoError(422, 'invalid', `Keep the photo description under ${ALT_MAX} characters (it has ${text.length}).`, 'alt');
	}
	return text;
}

const MB = (n: number) => `${(n / (1024 * 1024)).toFixed(n % (1024 * 1024) === 0 ? 0 : 1)} MB`;

/** Size and content checks that need no decoding. Returns the sniffed format. */
export function checkPhotoBytes(bytes: Uint8Array): ImageFormat {
	if (bytes.byteLength === 0) throw new PhotoError(400, 'invalid', 'The file is empty. Choose a photo to upload.');
	const max = photoMaxBytes();
	if (bytes.byteLength > max) {
		throw new PhotoError(413, 'too_large', `The photo is ${MB(bytes.byteLength)}; the limit is ${MB(max)}. Export it smaller and try again.`);
	}
	const format = sniffImageFormat(bytes);
	if (format === 'heic') {
		throw new PhotoError(415, 'invalid', 'HEIC photos are not supported yet. Export the photo as JPEG (most phones can) and upload that.');
	}
	if (!format) {
		throw new PhotoError(415, 'invalid', 'That file is not a JPEG, PNG or WebP image. Upload a photo in one of those formats.');
	}
	return format;
}

export interface Rendition {
	width: number;
	height: number;
	data: Buffer;
}

export interface ProcessedPhoto {
	/** Rendition widths actually made, ascending. */
	widths: number[];
	/** Size of the largest rendition (already rotated upright). */
	width: number;
	height: number;
	renditions: Rendition[];
	/** A tiny blurred WebP as a data: URI, shown until the real image loads. */
	placeholder: string;
}

/**
 * At most one full-size decode per process at a time (p-limit): a 40-megapixel upload decodes to
 * ~120 MB of pixels, so two at once would double the peak. Others wait their turn in order.
 */
const decodeLimit = pLimit(1);
let decoding = 0;
let decodePeak = 0;

/** The most decodes that ever ran at once in this process since the last reset (for tests and the bench). */
export function photoDecodePeak(reset = false): number {
	const peak = decodePeak;
	if (reset) decodePeak = decoding;
	return peak;
}

/** How many uploads are waiting for the decode slot now. */
export function photoDecodesWaiting(): number {
	return decodeLimit.pendingCount;
}

function withSlot<T>(fn: () => Promise<T>): Promise<T> {
	return decodeLimit(async () => {
		decoding++;
		decodePeak = Math.max(decodePeak, decoding);
		try {
			return await fn();
		} finally {
			decoding--;
		}
	});
}

/** Widths to make for an upright source `sourceWidth` px wide: the standard ones below it, plus the source width when it is narrower than the largest. */
export function renditionWidths(sourceWidth: number): number[] {
	const out: number[] = PHOTO_WIDTHS.filter((w) => w < sourceWidth);
	const largest = PHOTO_WIDTHS[PHOTO_WIDTHS.length - 1];
	out.push(Math.min(sourceWidth, largest));
	return [...new Set(out)].sort((a, b) => a - b);
}

function decodeError(err: unknown): PhotoError {
	const text = err instanceof Error ? err.message : String(err);
	if (/pixel limit/i.test(text)) {
		return new PhotoError(413, 'too_large', `The image has more pixels than we can process (over ${Math.round(photoMaxPixels() / 1e6)} megapixels). Resize it and try again.`);
	}
	return new PhotoError(422, 'invalid', 'The image could not be read: the file looks damaged or incomplete. Export it again and retry.');
}

/**
 * Decode, check and convert an upload into WebP renditions. Pure with respect to storage.
 * Refuses non-images (415), oversized files and decompression bombs (413, checked from the
 * header before any pixel is decoded) and damaged or truncated files (422).
 */
export async function processPhoto(bytes: Uint8Array): Promise<ProcessedPhoto> {
	const format = checkPhotoBytes(bytes);
	const maxPixels = photoMaxPixels();
	const input = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
	const options: SharpOptions = { limitInputPixels: maxPixels, failOn: 'error', sequentialRead: true };

	let meta: Metadata;
	try {
		// Reading the header decodes no pixels, so the limit is checked by hand just below
		// with the real dimensions in the message.
		meta = await sharp(input, { ...options, limitInputPixels: false }).metadata();
	} catch (err) {
		throw decodeError(err);
	}
	if (meta.format !== format || !meta.width || !meta.height) {
		throw new PhotoError(422, 'invalid', 'The image could not be read: its contents do not match its format. Export it again and retry.');
	}
	if (meta.width * meta.height > maxPixels) {
		throw new PhotoError(
			413,
			'too_large',
			`The image is ${meta.width} × ${meta.height} pixels (${(meta.width * meta.height / 1e6).toFixed(0)} megapixels); the limit is ${Math.round(maxPixels / 1e6)} megapixels. Resize it and try again.`
		);
	}

	const long = Math.max(meta.width, meta.height);
	const short = Math.min(meta.width, meta.height);
	if (long / short > MAX_ASPECT) {
		throw new PhotoError(
			422,
			'invalid',
			`The image is ${meta.width} × ${meta.height} pixels, longer than ${MAX_ASPECT}:1. Crop it to a less extreme shape and try again.`
		);
	}

	return withSlot(async () => {
		try {
			// Orientations 5–8 swap the axes once rotated upright.
			const uprightWidth = (meta.orientation ?? 1) >= 5 ? meta.height! : meta.width!;
			const widths = renditionWidths(uprightWidth);
			const largest = widths[widths.length - 1];
			// Decode once: rotate upright, shrink to the largest rendition, keep raw pixels.
			const { data, info } = await sharp(input, options)
				.rotate()
				// Transparent areas become white, so the blurred placeholder never shows through.
				.flatten({ background: '#ffffff' })
				.resize({ width: largest, withoutEnlargement: true })
				.toColourspace('srgb')
				.raw({ depth: 'uchar' })
				.toBuffer({ resolveWithObject: true });
			const raw = { raw: { width: info.width, height: info.height, channels: info.channels } };

			const renditions: Rendition[] = [];
			for (const w of widths) {
				const out = await sharp(data, raw)
					.resize({ width: w, withoutEnlargement: true })
					.webp({ quality: 80, effort: 4 })
					.toBuffer({ resolveWithObject: true });
				renditions.push({ width: out.info.width, height: out.info.height, data: out.data });
			}
			const tiny = await sharp(data, raw).resize({ width: 16 }).blur(0.6).webp({ quality: 40 }).toBuffer();
			const top = renditions[renditions.length - 1];
			return {
				widths: renditions.map((r) => r.width),
				width: top.width,
				height: top.height,
				renditions,
				placeholder: `data:image/webp;base64,${tiny.toString('base64')}`
			};
		} catch (err) {
			throw decodeError(err);
		}
	});
}

/** The storage keys of a photo's renditions. */
export function photoObjectKeys(photo: { keyPrefix: string; widths: number[] }): string[] {
	return photo.widths.map((w) => `${photo.keyPrefix}/${w}.webp`);
}

export interface StorePhotoInput {
	ownerId: string;
	buildId: string;
	stepId?: string | null;
	bytes: Uint8Array;
	alt: string;
	/** Make it the build's cover: sets `build.coverPhotoId` and removes the previous cover. */
	asCover?: boolean;
	/**
	 * Run the row insert inside this transaction (the seed, which inserts the build in the same
	 * transaction). If the caller's transaction later rolls back, the objects stay behind.
	 */
	tx?: Tx;
	/** The member adding it to the build's content: the change is recorded (afterContentChange) with the row. */
	changedBy?: Actor;
}

/**
 * Check, convert and store a photo; returns the new row. Objects are uploaded first, then the
 * row is inserted in a transaction; if the insert fails the objects are deleted again, so a
 * failure leaves neither an orphan object nor an orphan row.
 */
export async function processAndStorePhoto(input: StorePhotoInput): Promise<schema.Photo> {
	const alt = checkAlt(input.alt);
	const runner = input.tx ?? db;
	if (input.stepId) {
		const [step] = await runner
			.select({ id: schema.buildStep.id })
			.from(schema.buildStep)
			.where(and(eq(schema.buildStep.id, input.stepId), eq(schema.buildStep.buildId, input.buildId)));
		if (!step) throw new PhotoError(404, 'not_found', 'That step is not part of this build (it may have been deleted).', 'stepId');
	}

	const processed = await processPhoto(input.bytes);
	const id = crypto.randomUUID();
	const keyPrefix = `photos/${id}`;
	const keys = photoObjectKeys({ keyPrefix, widths: processed.widths });

	const puts = await Promise.allSettled(
		processed.renditions.map((r, i) =>
			putObject(keys[i], r.data, { contentType: 'image/webp', cacheControl: CACHE_FOREVER })
		)
	);
	if (puts.some((p) => p.status === 'rejected')) {
		// Some renditions may have been written: remove them now or from the durable queue (no orphans).
		await deleteObjectsDurably(keys).catch((err) => console.error(`photo ${id}: cleanup after failed upload failed`, err));
		const reason = puts.find((p): p is PromiseRejectedResult => p.status === 'rejected')!.reason;
		console.error(`photo ${id}: storing renditions failed`, reason);
		// Nothing was written to the database: no row without its objects.
		throw new PhotoError(503, 'unavailable', 'Photo storage is not answering right now, so the photo was not saved. Try again in a minute.', 'file');
	}

	let previousCover: { keyPrefix: string; widths: number[] } | null = null;
	try {
		const row = await runner.transaction(async (tx) => {
			let position = 0;
			if (!input.asCover) {
				const [{ next }] = await tx
					.select({ next: sql<number>`coalesce(max(${schema.photo.position}) + 1, 0)::int` })
					.from(schema.photo)
					.where(
						input.stepId
							? eq(schema.photo.stepId, input.stepId)
							: and(eq(schema.photo.buildId, input.buildId), isNull(schema.photo.stepId))
					);
				position = next;
			}
			const [inserted] = await tx
				.insert(schema.photo)
				.values({
					id,
					ownerId: input.ownerId,
					buildId: input.buildId,
					stepId: input.stepId ?? null,
					keyPrefix,
					widths: processed.widths,
					width: processed.width,
					height: processed.height,
					alt,
					placeholder: processed.placeholder,
					position
				})
				.returning();
			if (input.asCover) {
				const [b] = await tx
					.select({ coverPhotoId: schema.build.coverPhotoId })
					.from(schema.build)
					.where(eq(schema.build.id, input.buildId))
					.for('update');
				if (!b) throw new PhotoError(404, 'not_found', 'That build no longer exists.', 'buildSlug');
				await tx.update(schema.build).set({ coverPhotoId: id }).where(eq(schema.build.id, input.buildId));
				if (b.coverPhotoId && b.coverPhotoId !== id) {
					// A previous cover that is also a step's photo stays (only the cover reference moves).
					const [old] = await tx
						.delete(schema.photo)
						.where(and(eq(schema.photo.id, b.coverPhotoId), isNull(schema.photo.stepId)))
						.returning({ keyPrefix: schema.photo.keyPrefix, widths: schema.photo.widths });
					previousCover = old ?? null;
				}
			}
			if (input.changedBy) await afterContentChange(tx, input.buildId, input.changedBy);
			return inserted;
		});
		if (previousCover) {
			await deleteObjectsDurably(photoObjectKeys(previousCover)).catch((err) =>
				console.error(`photo ${id}: could not delete or queue the previous cover's objects`, err)
			);
		}
		return row;
	} catch (err) {
		await deleteObjects(keys).catch((e) => console.error(`photo ${id}: cleanup after failed insert failed`, e));
		throw err;
	}
}

/**
 * Delete one photo: its row first (and any cover reference to it), then its objects. With `changedBy`, the
 * change to the build's content is recorded (afterContentChange) with the row. Returns the deleted row or null.
 */
export async function deletePhoto(photoId: string, changedBy?: Actor): Promise<schema.Photo | null> {
	const row = await db.transaction(async (tx) => {
		const [deleted] = await tx.delete(schema.photo).where(eq(schema.photo.id, photoId)).returning();
		if (deleted) {
			await tx.update(schema.build).set({ coverPhotoId: null }).where(eq(schema.build.coverPhotoId, photoId));
			// Its [[photo:…]] code leaves the build's step text in the same transaction.
			if (deleted.buildId) await forgetPlacedPhoto(tx, deleted.buildId, deleted.id);
			if (changedBy && deleted.buildId) await afterContentChange(tx, deleted.buildId, changedBy);
		}
		return deleted ?? null;
	});
	// The row is gone and the change recorded: the objects follow now, or from the durable queue.
	if (row) await deleteObjectsDurably(photoObjectKeys(row));
	return row;
}

async function deletePhotosWhere(where: ReturnType<typeof eq>, clearCoverOf?: string): Promise<number> {
	const rows = await db.transaction(async (tx) => {
		const deleted = await tx
			.delete(schema.photo)
			.where(where)
			.returning({ keyPrefix: schema.photo.keyPrefix, widths: schema.photo.widths, id: schema.photo.id });
		if (clearCoverOf) {
			await tx.update(schema.build).set({ coverPhotoId: null }).where(eq(schema.build.id, clearCoverOf));
		} else {
			for (const d of deleted) {
				await tx.update(schema.build).set({ coverPhotoId: null }).where(eq(schema.build.coverPhotoId, d.id));
			}
		}
		return deleted;
	});
	await deleteObjectsDurably(rows.flatMap(photoObjectKeys));
	return rows.length;
}

/**
 * Delete every photo of a build (rows, then objects) and clear its cover. Call it BEFORE
 * deleting the build row: the rows would cascade away, but their objects would stay.
 */
export async function deletePhotoObjectsForBuild(buildId: string): Promise<number> {
	return deletePhotosWhere(eq(schema.photo.buildId, buildId), buildId);
}

/** Delete every photo of a step (rows, then objects). Call it BEFORE deleting the step row. */
export async function deletePhotoObjectsForStep(stepId: string): Promise<number> {
	return deletePhotosWhere(eq(schema.photo.stepId, stepId));
}

/** The public view of a row (what the browser may see; no owner id). */
export function toPhotoView(row: schema.Photo): PhotoView & { stepId: string | null; url: string; srcset: string } {
	return {
		id: row.id,
		keyPrefix: row.keyPrefix,
		widths: row.widths,
		width: row.width,
		height: row.height,
		alt: row.alt,
		placeholder: row.placeholder,
		stepId: row.stepId,
		url: photoUrl(row.keyPrefix, row.widths[row.widths.length - 1]),
		srcset: photoSrcset(row)
	};
}

/** Render an SVG document (a string) to a JPEG: the seed draws its illustrative images this way. */
export async function renderIllustration(svg: string): Promise<Buffer> {
	return sharp(Buffer.from(svg, 'utf8')).flatten({ background: '#f7f2e8' }).jpeg({ quality: 88 }).toBuffer();
}

/** The photos among `ids` that exist, as views by id (one query). */
export async function findPhotoViews(ids: string[], dbx: DbLike = db): Promise<Map<string, ReturnType<typeof toPhotoView>>> {
	const rows = ids.length ? await dbx.select().from(schema.photo).where(inArray(schema.photo.id, ids)) : [];
	return new Map(rows.map((p) => [p.id, toPhotoView(p)]));
}

/** One photo row, or null. */
export async function findPhoto(photoId: string): Promise<schema.Photo | null> {
	const [row] = await db.select().from(schema.photo).where(eq(schema.photo.id, photoId));
	return row ?? null;
}

/** What a maker adds to a build (the route has parsed the upload). */
export interface NewBuildPhoto {
	bytes: Uint8Array;
	alt: string;
	/** The step it belongs to; none for the cover. */
	stepId?: string;
	asCover: boolean;
}

/**
 * Add a photo to `build` (which `actor` may edit: see requireEditableBuild) and record the change to the
 * build's content in the same transaction. → the new row.
 */
export async function addBuildPhoto(actor: Actor, build: Pick<schema.Build, 'id' | 'ownerId'>, photo: NewBuildPhoto): Promise<schema.Photo> {
	return processAndStorePhoto({ ...photo, ownerId: build.ownerId, buildId: build.id, changedBy: actor });
}

/**
 * Delete photo `photoId` of `build` (which `actor` may edit) and record the change; 404 when it is not a
 * photo of this build. → the deleted photo's id.
 */
export async function removeBuildPhoto(actor: Actor, build: Pick<schema.Build, 'id'>, photoId: string): Promise<string> {
	const row = isUuid(photoId) ? await findPhoto(photoId) : null;
	if (!row || row.buildId !== build.id) throw new PhotoError(404, 'not_found', 'That photo is not part of this build (it may already be deleted).', 'id');
	await deletePhoto(row.id, actor);
	return row.id;
}
