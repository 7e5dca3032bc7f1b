/**
 * Attachments: files a maker adds to a build (schematic as PDF or PNG, PCB and fabrication files as ZIP,
 * enclosure drawing). The bytes → size checked → type found from the content with `file-type` (never the
 * name or the browser's type; HTML, SVG and anything else refused) → one object `attachments/<id>` in
 * object storage → one `build_attachment` row, recorded as a change to the build's content. A failure at
 * any point leaves no object and no row. They are served only as downloads (see contentDispositionFor),
 * to those who may see the build (drafts: its maker and admins). Removal: the row first (with the change),
 * then the object, now or from the durable deletion queue.
 */
import { and, asc, count, eq } from 'drizzle-orm';
import { fileTypeFromBuffer } from 'file-type';
import contentDisposition from 'content-disposition';
import sanitizeFilename from 'sanitize-filename';
import { env } from '$env/dynamic/private';
import { db } from '../db';
import * as schema from '../db/schema';
import type { DbLike } from '../db/tx';
import type { Actor, Viewer } from '../actor';
import { FieldError } from '../http/upload';
import { afterContentChange } from '../builds/editable';
import { lockBuild } from '../builds/edit';
import { canView } from '../builds/access';
import { seesLiveContent } from '../builds/published';
import type { BuildSnapshot } from '../builds/snapshot';
import { deleteObjects, putObject } from '../photos/storage';
import { deleteObjectsDurably } from '../photos/object-deletion';
import { PRIVATE_CACHE } from '../photos/media-access';
import { isUuid } from '$lib/uuid';
import {
	ATTACHMENT_KINDS,
	ATTACHMENT_NAME_MAX,
	ATTACHMENT_TYPES,
	ATTACHMENTS_PER_BUILD,
	formatBytes,
	type AttachmentExt,
	type AttachmentKind,
	type AttachmentView
} from '$lib/attachments';

/** Default size limit in bytes (env `ATTACHMENT_MAX_BYTES` overrides; keep BODY_SIZE_LIMIT a little above it). */
export const DEFAULT_ATTACHMENT_MAX_BYTES = 15 * 1024 * 1024;

/** The size limit in bytes from env, else 15 MiB. */
export function attachmentMaxBytes(): number {
	const n = Number(env.ATTACHMENT_MAX_BYTES);
	return Number.isFinite(n) && n > 0 ? Math.floor(n) : DEFAULT_ATTACHMENT_MAX_BYTES;
}

/** A refusal about an attachment the maker can act on; maps onto the API envelope like a photo's. */
export class AttachmentError extends FieldError {
	override name = 'AttachmentError';
}

const ACCEPTED = 'a PDF, a PNG or JPEG image, or a ZIP archive';

/**
 * The accepted type of `bytes`, found from their content by `file-type`. Refuses what it is not: an HTML
 * page or an SVG drawing renamed .pdf (no signature file-type knows → refused), an Office document (a ZIP
 * inside, reported as docx/xlsx → refused), an executable. → 'pdf' | 'png' | 'jpg' | 'zip'
 */
export async function sniffAttachment(bytes: Uint8Array): Promise<AttachmentExt> {
	const found = await fileTypeFromBuffer(bytes);
	const ext = found?.ext as string | undefined;
	if (ext && ext in ATTACHMENT_TYPES) return ext as AttachmentExt;
	const what = !found
		? looksLikeMarkup(bytes)
			? 'It looks like a web page or an SVG drawing, which could run scripts in a reader’s browser.'
			: 'Its content is not a type we know.'
		: `Its content is ${found.ext.toUpperCase()}, whatever its name says.`;
	throw new AttachmentError(415, 'invalid', `That file was not added: ${what} Attach ${ACCEPTED} (export an SVG drawing as PDF or PNG).`);
}

function looksLikeMarkup(bytes: Uint8Array): boolean {
	const head = Buffer.from(bytes.subarray(0, 512)).toString('utf8').trimStart().toLowerCase();
	return head.startsWith('<');
}

/**
 * A file name that is safe to store, show and offer on download: no path, no control or reserved
 * characters (sanitize-filename), at most ATTACHMENT_NAME_MAX characters, and ending in the extension of
 * the type its content has (`board.pdf` with PNG content → `board.pdf.png`). Empty → `<kind>.<ext>`.
 */
export function safeFileName(name: string, ext: AttachmentExt, kind: AttachmentKind = 'other'): string {
	const base = sanitizeFilename(name.normalize('NFC').replace(/[\u0000-\u001f\u007f-\u009f]+/g, '').trim(), { replacement: '_' })
		.replace(/\s+/g, ' ')
		.trim()
		.replace(/^\.+/, '');
	const exts = ext === 'jpg' ? ['.jpg', '.jpeg'] : [`.${ext}`];
	const lower = base.toLowerCase();
	let stem = exts.some((e) => lower.endsWith(e)) ? base.slice(0, base.lastIndexOf('.')) : base;
	const suffix = exts.some((e) => lower.endsWith(e)) ? base.slice(base.lastIndexOf('.')) : `.${ext}`;
	stem = [...stem].slice(0, ATTACHMENT_NAME_MAX - suffix.length).join('').trim();
	return `${stem || kind}${suffix}`;
}

/** The Content-Disposition of a download: always `attachment`, an ASCII `filename` and the UTF-8 `filename*` (RFC 6266). */
export function contentDispositionFor(name: string): string {
	const ascii = name.normalize('NFKD').replace(/[^\x20-\x7e]/g, '').replace(/["\\]/g, '_') || 'attachment';
	return contentDisposition(name, { type: 'attachment', fallback: ascii === name ? true : ascii });
}

/** Storage key of an attachment's object. */
export const attachmentKey = (id: string) => `attachments/${id}`;

/** What a maker adds (the route has parsed the upload). */
export interface NewAttachment {
	bytes: Uint8Array;
	name: string;
	kind: unknown;
}

function checkKind(kind: unknown): AttachmentKind {
	if (typeof kind === 'string' && (ATTACHMENT_KINDS as readonly string[]).includes(kind)) return kind as AttachmentKind;
	throw new AttachmentError(400, 'invalid', 'Say what the file is: schematic, PCB and fabrication files, enclosure drawing, or other.', 'kind');
}

/** Size checks that need no reading of the content. */
export function checkAttachmentSize(size: number): void {
	if (size === 0) throw new AttachmentError(400, 'invalid', 'The file is empty. Choose the file to attach.');
	const max = attachmentMaxBytes();
	if (size > max) {
		throw new AttachmentError(413, 'too_large', `The file is ${formatBytes(size)}; the limit is ${formatBytes(max)}. Split a large ZIP or export the drawing smaller.`);
	}
}

/**
 * Check and store a file for `build` (which `actor` may edit: see requireEditableBuild) and record the
 * change to the build's content with the row. The object is stored first, then the row inserted; if the
 * insert fails the object is deleted again. → the new row
 */
export async function addBuildAttachment(actor: Actor, build: Pick<schema.Build, 'id' | 'ownerId'>, input: NewAttachment): Promise<schema.BuildAttachment> {
	const kind = checkKind(input.kind);
	checkAttachmentSize(input.bytes.byteLength);
	const ext = await sniffAttachment(input.bytes);
	const name = safeFileName(input.name, ext, kind);
	const [{ n }] = await db.select({ n: count() }).from(schema.buildAttachment).where(eq(schema.buildAttachment.buildId, build.id));
	if (n >= ATTACHMENTS_PER_BUILD) {
		throw new AttachmentError(422, 'invalid', `A build holds at most ${ATTACHMENTS_PER_BUILD} files. Remove one, or put several into one ZIP.`);
	}
	const id = crypto.randomUUID();
	const key = attachmentKey(id);
	try {
		await putObject(key, input.bytes, { contentType: ATTACHMENT_TYPES[ext].mime });
	} catch (err) {
		await deleteObjectsDurably([key]).catch((e) => console.error(`attachment ${id}: cleanup after failed upload failed`, e));
		console.error(`attachment ${id}: storing failed`, err);
		throw new AttachmentError(503, 'unavailable', 'File storage is not answering right now, so the file was not saved. Try again in a minute.');
	}
	try {
		return await db.transaction(async (tx) => {
			const b = await lockBuild(tx, build.id);
			const [{ next }] = await tx
				.select({ next: count() })
				.from(schema.buildAttachment)
				.where(eq(schema.buildAttachment.buildId, b.id));
			if (next >= ATTACHMENTS_PER_BUILD) {
				throw new AttachmentError(422, 'invalid', `A build holds at most ${ATTACHMENTS_PER_BUILD} files. Remove one, or put several into one ZIP.`);
			}
			const [row] = await tx
				.insert(schema.buildAttachment)
				.values({ id, buildId: b.id, ownerId: b.ownerId, kind, name, ext, mime: ATTACHMENT_TYPES[ext].mime, sizeBytes: input.bytes.byteLength, key, position: next })
				.returning();
			await afterContentChange(tx, b.id, actor);
			return row;
		});
	} catch (err) {
		await deleteObjects([key]).catch((e) => console.error(`attachment ${id}: cleanup after failed insert failed`, e));
		throw err;
	}
}

/**
 * Remove attachment `id` of `build` (which `actor` may edit): the row and the recorded change in one
 * transaction, then the object (now, or from the durable queue). 404 when it is not a file of this build.
 * → the removed row
 */
export async function removeBuildAttachment(actor: Actor, build: Pick<schema.Build, 'id'>, id: string): Promise<schema.BuildAttachment> {
	if (!isUuid(id)) throw new AttachmentError(404, 'not_found', 'That file is not attached to this build (it may already be removed).', 'id');
	const row = await db.transaction(async (tx) => {
		await lockBuild(tx, build.id);
		const [deleted] = await tx
			.delete(schema.buildAttachment)
			.where(and(eq(schema.buildAttachment.id, id), eq(schema.buildAttachment.buildId, build.id)))
			.returning();
		if (!deleted) return null;
		await afterContentChange(tx, build.id, actor);
		return deleted;
	});
	if (!row) throw new AttachmentError(404, 'not_found', 'That file is not attached to this build (it may already be removed).', 'id');
	await deleteObjectsDurably([row.key]);
	return row;
}

/** The page's view of a row. */
export function toAttachmentView(row: schema.BuildAttachment, slug: string): AttachmentView {
	return {
		id: row.id,
		kind: row.kind as AttachmentKind,
		name: row.name,
		ext: row.ext as AttachmentExt,
		sizeBytes: row.sizeBytes,
		url: `/builds/${slug}/attachments/${row.id}`
	};
}

/** A build's attachments in the order they were added. */
export async function listAttachments(buildId: string, dbx: DbLike = db): Promise<schema.BuildAttachment[]> {
	return dbx.select().from(schema.buildAttachment).where(eq(schema.buildAttachment.buildId, buildId)).orderBy(asc(schema.buildAttachment.position), asc(schema.buildAttachment.createdAt));
}

/**
 * The files `viewer` may see of build `b`: all of them for its maker and whoever may edit it (live
 * content); for readers of a published or archived build only those in its latest revision that still
 * exist — a file added since is a pending change, not yet published (see ../builds/published).
 */
export async function attachmentsFor(b: schema.Build, viewer: Viewer, dbx: DbLike = db): Promise<schema.BuildAttachment[]> {
	const [rows, published] = await Promise.all([listAttachments(b.id, dbx), publishedAttachmentIds(b, viewer, dbx)]);
	return published ? rows.filter((r) => published.has(r.id)) : rows;
}

/** Ids of the files in the latest revision when `viewer` reads the published build; null when they see live content. */
async function publishedAttachmentIds(b: schema.Build, viewer: Viewer, dbx: DbLike = db): Promise<Set<string> | null> {
	if (seesLiveContent(viewer, b)) return null;
	const [rev] = await dbx
		.select({ snapshot: schema.buildRevision.snapshot })
		.from(schema.buildRevision)
		.where(and(eq(schema.buildRevision.buildId, b.id), eq(schema.buildRevision.number, b.revision)));
	if (!rev) return null;
	// Revisions recorded before attachments existed had none.
	return new Set(((rev.snapshot as unknown as BuildSnapshot).attachments ?? []).map((a) => a.id));
}

/**
 * The attachment `id` of the build at `slug` if `viewer` may download it, with the Cache-Control to send:
 * a draft's files only to those who may see the draft (privately); a published or archived build's files
 * in its latest revision to everyone (a pending one only to those who may edit it). null (→ 404)
 * otherwise, also for another build's file under this slug.
 */
export async function attachmentForDownload(slug: string, id: string, viewer: Viewer): Promise<{ row: schema.BuildAttachment; cacheControl: string } | null> {
	if (!isUuid(id)) return null;
	const [hit] = await db
		.select({ row: schema.buildAttachment, build: schema.build })
		.from(schema.buildAttachment)
		.innerJoin(schema.build, eq(schema.build.id, schema.buildAttachment.buildId))
		.where(and(eq(schema.buildAttachment.id, id), eq(schema.build.slug, slug)))
		.limit(1);
	if (!hit || !canView(viewer, hit.build)) return null;
	const published = await publishedAttachmentIds(hit.build, viewer);
	if (published && !published.has(id)) return null;
	// Removing a file must take effect at once: shared caches keep a published one only briefly.
	const live = hit.build.status === 'draft' || seesLiveContent(viewer, hit.build);
	return { row: hit.row, cacheControl: live ? PRIVATE_CACHE : 'public, max-age=300' };
}
