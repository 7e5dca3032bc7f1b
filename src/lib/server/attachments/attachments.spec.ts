// Attachments: type found from content (file-type as the detector; the sample files are made here by hand
// from the formats' published layouts), safe names, RFC 6266 downloads, sizes in words, and the store +
// row + revision + durable deletion against the real PostgreSQL and the fake S3.
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { crc32 } from 'node:zlib';
import sharp from 'sharp';
import contentDisposition from 'content-disposition';
import { eq } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { getObjectBytes, listKeys } from '../photos/storage';
import { createTestUser, removeTestUsers, uniqueTitle } from '../testing/builds';
import { addStep, createDraft, pendingChanges, publish, publishRevision } from '../builds';
import {
	AttachmentError,
	addBuildAttachment,
	attachmentForDownload,
	attachmentsFor,
	contentDispositionFor,
	removeBuildAttachment,
	safeFileName,
	sniffAttachment
} from './index';
import { formatBytes } from '$lib/attachments';

/** A minimal PDF 1.4 file (ISO 32000-1 §7.5: header "%PDF-1.4", body, xref, trailer, "%%EOF"). */
export const PDF = Buffer.from('%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [] /Count 0 >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n');

/** A ZIP archive with one stored (uncompressed) file, laid out per PKWARE APPNOTE.TXT §4.3 (local header, data, central directory, end record). */
export function storedZip(name: string, content: string): Buffer {
	const data = Buffer.from(content);
	const fname = Buffer.from(name);
	const crc = crc32(data);
	const local = Buffer.alloc(30);
	local.writeUInt32LE(0x04034b50, 0);
	local.writeUInt16LE(20, 4);
	local.writeUInt32LE(crc, 14);
	local.writeUInt32LE(data.length, 18);
	local.writeUInt32LE(data.length, 22);
	local.writeUInt16LE(fname.length, 26);
	const central = Buffer.alloc(46);
	central.writeUInt32LE(0x02014b50, 0);
	central.writeUInt16LE(20, 4);
	central.writeUInt16LE(20, 6);
	central.writeUInt32LE(crc, 16);
	central.writeUInt32LE(data.length, 20);
	central.writeUInt32LE(data.length, 24);
	central.writeUInt16LE(fname.length, 28);
	const cdOffset = local.length + fname.length + data.length;
	const end = Buffer.alloc(22);
	end.writeUInt32LE(0x06054b50, 0);
	end.writeUInt16LE(1, 8);
	end.writeUInt16LE(1, 10);
	end.writeUInt32LE(central.length + fname.length, 12);
	end.writeUInt32LE(cdOffset, 16);
	return Buffer.concat([local, fname, data, central, fname, end]);
}

const HTML_AS_PDF = Buffer.from('<!doctype html><html><body><script>alert(document.cookie)</script></body></html>');
const SVG = Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"><rect width="10" height="10"/></svg>');

describe('sniffAttachment: the type from the content, never the name', () => {
	it('accepts PDF, PNG, JPEG and ZIP by their signatures', async () => {
		const img = sharp({ create: { width: 4, height: 4, channels: 3, background: '#fff' } });
		expect(await sniffAttachment(PDF)).toBe('pdf');
		expect(await sniffAttachment(await img.clone().png().toBuffer())).toBe('png');
		expect(await sniffAttachment(await img.clone().jpeg().toBuffer())).toBe('jpg');
		expect(await sniffAttachment(storedZip('gerbers/board-F_Cu.gbr', 'G04 top copper*\nM02*\n'))).toBe('zip');
	});

	it('refuses an HTML page, an SVG drawing, a GIF and plain text with a sentence (415)', async () => {
		for (const bad of [HTML_AS_PDF, SVG, Buffer.from('GIF89a\x01\x00\x01\x00\x00\x00\x00'), Buffer.from('just some notes')]) {
			const err = await sniffAttachment(bad).then(() => null, (e) => e);
			expect(err).toBeInstanceOf(AttachmentError);
			expect(err.status).toBe(415);
			expect(err.message).toMatch(/^That file was not added: .+ Attach a PDF, a PNG or JPEG image, or a ZIP archive/);
		}
		expect((await sniffAttachment(SVG).catch((e) => e)).message).toContain('web page or an SVG drawing');
	});
});

describe('safeFileName', () => {
	it('drops paths, control and reserved characters and keeps Unicode letters', () => {
		expect(safeFileName('../../etc/passwd.pdf', 'pdf')).toBe('.._.._etc_passwd.pdf'.replace(/^\.+/, ''));
		expect(safeFileName('Schéma\u0000 «v2».pdf', 'pdf')).toBe('Schéma «v2».pdf');
		expect(safeFileName('a<b>c:d|e?.zip', 'zip')).toBe('a_b_c_d_e_.zip');
	});
	it('ends in the extension of the content, whatever the name claims', () => {
		expect(safeFileName('schematic.pdf', 'png')).toBe('schematic.pdf.png');
		expect(safeFileName('photo.JPEG', 'jpg')).toBe('photo.JPEG');
		expect(safeFileName('', 'zip', 'pcb')).toBe('pcb.zip');
		expect(safeFileName('   ', 'pdf', 'schematic')).toBe('schematic.pdf');
	});
	it('keeps at most 120 characters, the extension included', () => {
		const long = safeFileName(`${'é'.repeat(300)}.pdf`, 'pdf');
		expect([...long]).toHaveLength(120);
		expect(long.endsWith('.pdf')).toBe(true);
	});
});

describe('contentDispositionFor (RFC 6266)', () => {
	it('is always an attachment; a non-ASCII name travels in filename* (RFC 8187 UTF-8) with an ASCII fallback', () => {
		const header = contentDispositionFor('Schéma ampli.pdf');
		expect(header.startsWith('attachment;')).toBe(true);
		expect(header).toContain("filename*=UTF-8''Sch%C3%A9ma%20ampli.pdf");
		// The jshttp parser (a general-purpose library) as the oracle: it reads the UTF-8 name back.
		const parsed = contentDisposition.parse(header);
		expect(parsed.type).toBe('attachment');
		expect(parsed.parameters.filename).toBe('Schéma ampli.pdf');
		expect(/filename="([^"]*)"/.exec(header)?.[1]).toMatch(/^[\x20-\x7e]+$/);
	});
	it('needs no filename* for an ASCII name, and escapes quotes', () => {
		expect(contentDispositionFor('board.zip')).toBe('attachment; filename="board.zip"');
		expect(contentDisposition.parse(contentDispositionFor('my "best" board.zip')).parameters.filename).toBe('my "best" board.zip');
	});
});

describe('formatBytes', () => {
	it('reads bytes in binary multiples, 3 significant figures (hand calculation: 14,540 / 1024 = 14.199…)', () => {
		expect(formatBytes(1)).toBe('1 byte');
		expect(formatBytes(812)).toBe('812 bytes');
		expect(formatBytes(14_540)).toBe('14.2 KB');
		expect(formatBytes(15 * 1024 * 1024)).toBe('15 MB');
		expect(formatBytes(3_565_158)).toBe('3.4 MB');
		expect(() => formatBytes(-1)).toThrow(RangeError);
	});
});

describe('attachments of a build (PostgreSQL + S3)', () => {
	let maker: Awaited<ReturnType<typeof createTestUser>>;
	let other: Awaited<ReturnType<typeof createTestUser>>;
	let admin: Awaited<ReturnType<typeof createTestUser>>;
	let draft: { id: string; slug: string };
	const fields = (title: string) => ({ title, summary: '', category: 'power-amp' as const, topology: 'class-ab-discrete' as const, mainsPowered: false, licence: 'CC-BY-SA-4.0' as const });

	beforeAll(async () => {
		maker = await createTestUser('maker', 'Files');
		other = await createTestUser('maker', 'Other');
		admin = await createTestUser('admin', 'Admin');
		draft = await createDraft(maker.id, fields(uniqueTitle('Files draft')));
	});
	afterAll(async () => {
		await removeTestUsers([maker.id, other.id, admin.id]);
	});

	const rowsOf = (buildId: string) => db.select().from(schema.buildAttachment).where(eq(schema.buildAttachment.buildId, buildId));

	it('stores the object and the row; the object holds the very bytes', async () => {
		const row = await addBuildAttachment(maker, { id: draft.id, ownerId: maker.id }, { bytes: PDF, name: 'Schematic rev 2.pdf', kind: 'schematic' });
		expect(row).toMatchObject({ name: 'Schematic rev 2.pdf', ext: 'pdf', mime: 'application/pdf', sizeBytes: PDF.length, kind: 'schematic', key: `attachments/${row.id}` });
		expect((await getObjectBytes(row.key))?.equals(PDF)).toBe(true);
	});

	it('a hostile file leaves no row and no object behind', async () => {
		const before = (await rowsOf(draft.id)).length;
		const keysBefore = await listKeys('attachments/');
		for (const bytes of [HTML_AS_PDF, SVG]) {
			await expect(addBuildAttachment(maker, { id: draft.id, ownerId: maker.id }, { bytes, name: 'schematic.pdf', kind: 'schematic' })).rejects.toMatchObject({ status: 415 });
		}
		expect((await rowsOf(draft.id)).length).toBe(before);
		expect(await listKeys('attachments/')).toEqual(keysBefore);
	});

	it('refuses an unknown kind (400) and an empty file (400) before storing anything', async () => {
		await expect(addBuildAttachment(maker, { id: draft.id, ownerId: maker.id }, { bytes: PDF, name: 'x.pdf', kind: 'firmware' })).rejects.toMatchObject({ status: 400, path: 'kind' });
		await expect(addBuildAttachment(maker, { id: draft.id, ownerId: maker.id }, { bytes: new Uint8Array(), name: 'x.pdf', kind: 'other' })).rejects.toMatchObject({ status: 400 });
	});

	it('a draft’s files: its maker and admins may download, nobody else (null → 404); another slug never', async () => {
		const [row] = await rowsOf(draft.id);
		expect((await attachmentForDownload(draft.slug, row.id, maker))?.cacheControl).toMatch(/^private/);
		expect(await attachmentForDownload(draft.slug, row.id, admin)).not.toBeNull();
		expect(await attachmentForDownload(draft.slug, row.id, other)).toBeNull();
		expect(await attachmentForDownload(draft.slug, row.id, null)).toBeNull();
		expect(await attachmentForDownload('some-other-build', row.id, maker)).toBeNull();
		expect(await attachmentForDownload(draft.slug, 'not-a-uuid', maker)).toBeNull();
	});

	it('a revision records files added and removed; removal deletes the object; another build’s file is 404', async () => {
		const b = await createDraft(maker.id, fields(uniqueTitle('Files published')));
		await addStep(maker, b.id, { title: 'Board', bodyMd: 'Populate it.' });
		const first = await addBuildAttachment(maker, { id: b.id, ownerId: maker.id }, { bytes: storedZip('f.gbr', 'M02*'), name: 'gerbers.zip', kind: 'pcb' });
		await publish(maker, b.id);
		expect((await attachmentForDownload(b.slug, first.id, null))?.cacheControl).toMatch(/^public/);

		const second = await addBuildAttachment(maker, { id: b.id, ownerId: maker.id }, { bytes: PDF, name: 'enclosure.pdf', kind: 'enclosure' });
		// A file added since the latest revision is a pending change: its maker sees it, readers do not yet.
		expect(await attachmentForDownload(b.slug, second.id, maker)).not.toBeNull();
		expect(await attachmentForDownload(b.slug, second.id, null)).toBeNull();
		expect(await attachmentForDownload(b.slug, second.id, other)).toBeNull();
		const [row] = await db.select().from(schema.build).where(eq(schema.build.id, b.id));
		expect((await attachmentsFor(row, null)).map((a) => a.name)).toEqual(['gerbers.zip']);
		expect((await attachmentsFor(row, maker)).map((a) => a.name)).toEqual(['gerbers.zip', 'enclosure.pdf']);
		await removeBuildAttachment(maker, { id: b.id }, first.id);
		expect(await getObjectBytes(first.key)).toBeNull();
		expect((await pendingChanges(b.id)).changes).toContain('attachments: 1 added, 1 removed');
		const rev = await publishRevision(maker, b.id, 'Enclosure drawing instead of the old gerbers');
		expect(rev.summary).toContain('attachments: 1 added, 1 removed');
		expect((await attachmentForDownload(b.slug, second.id, null))?.cacheControl).toMatch(/^public/);

		await expect(removeBuildAttachment(maker, { id: draft.id }, second.id)).rejects.toMatchObject({ status: 404 });
		await expect(removeBuildAttachment(maker, { id: b.id }, first.id)).rejects.toMatchObject({ status: 404 });
	});
});
