// Hostile uploads against the two upload routes — a build's photos (POST /builds/[slug]/photos, JSON
// answers) and a member's picture (POST /account/avatar?/upload, a no-JavaScript form) — each file made
// in the test (sharp for real images, bytes by hand for the rest). Every refusal must be a 4xx with a
// sentence; files of an allowed type are accepted cleanly, with EXIF (GPS included) gone from every
// stored variant and nothing of an appended payload kept. Afterwards the S3 fake's bucket is listed and
// the database read: no photo row without its objects, no object without its row.
import { test, expect, request as playwrightRequest, type APIRequestContext } from '@playwright/test';
import { S3Client, ListObjectsV2Command } from '@aws-sdk/client-s3';
import postgres from 'postgres';
import sharp, { type Metadata } from 'sharp';
import zlib from 'node:zlib';
import { origin } from './helpers/builds';
import { postPage, throwawayMember } from './helpers/members';

// ---- files ---------------------------------------------------------------------------------------------

const rgb = (width: number, height: number, background = '#b0592b') => sharp({ create: { width, height, channels: 3, background } });
const text = (s: string) => Buffer.from(s, 'utf8');

/** A PNG chunk: length, type, data, CRC-32 over type + data (PNG spec §5.3). */
function pngChunk(type: string, data: Buffer): Buffer {
	const len = Buffer.alloc(4);
	len.writeUInt32BE(data.length);
	const td = Buffer.concat([Buffer.from(type, 'latin1'), data]);
	const crc = Buffer.alloc(4);
	crc.writeUInt32BE(zlib.crc32(td) >>> 0);
	return Buffer.concat([len, td, crc]);
}

/** `png` with its IHDR claiming width × height (CRC fixed), the pixel data left as it was: a decompression bomb's header. */
function pngClaiming(png: Buffer, width: number, height: number): Buffer {
	const out = Buffer.from(png);
	out.writeUInt32BE(width, 16);
	out.writeUInt32BE(height, 20);
	out.writeUInt32BE(zlib.crc32(out.subarray(12, 29)) >>> 0, 29);
	return out;
}

/** `png` with a tEXt chunk inserted after IHDR. */
function pngWithText(png: Buffer, keyword: string, value: string): Buffer {
	return Buffer.concat([png.subarray(0, 33), pngChunk('tEXt', Buffer.concat([Buffer.from(keyword, 'latin1'), Buffer.from([0]), Buffer.from(value, 'latin1')])), png.subarray(33)]);
}

/** `jpeg` whose first SOF marker claims width × height. */
function jpegClaiming(jpeg: Buffer, width: number, height: number): Buffer {
	const out = Buffer.from(jpeg);
	for (let i = 2; i < out.length - 9; ) {
		if (out[i] !== 0xff) throw new Error('not a JPEG marker');
		const marker = out[i + 1];
		const len = out.readUInt16BE(i + 2);
		if (marker >= 0xc0 && marker <= 0xc3) {
			out.writeUInt16BE(height, i + 5);
			out.writeUInt16BE(width, i + 7);
			return out;
		}
		i += 2 + len;
	}
	throw new Error('no SOF marker');
}

/** A JPEG carrying EXIF orientation 6 and a GPS position (a made-up point), as phones write them. */
const gpsJpeg = () =>
	rgb(900, 600, '#efe7d6')
		.jpeg({ quality: 85 })
		.withExif({
			IFD0: { Make: 'Invented Camera Works', Software: 'starground-test' },
			IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 0/1', GPSLongitudeRef: 'W', GPSLongitude: '0/1 7/1 0/1' }
		})
		.withMetadata({ orientation: 6 })
		.toBuffer();

/** Whether an EXIF block carries a GPS IFD pointer (tag 0x8825, either byte order). */
const exifHasGps = (exif: Buffer | undefined) => !!exif && (exif.includes(Buffer.from([0x25, 0x88])) || exif.includes(Buffer.from([0x88, 0x25])));

async function animated(format: 'gif' | 'webp'): Promise<Buffer> {
	const frames = await Promise.all(['#ff0000', '#0000ff', '#00ff00'].map((c) => rgb(64, 48, c).png().toBuffer()));
	const s = sharp(frames, { join: { animated: true } });
	return (format === 'gif' ? s.gif({ loop: 0, delay: [100, 100, 100] }) : s.webp({ loop: 0, delay: [100, 100, 100] })).toBuffer();
}

// ---- the cases -------------------------------------------------------------------------------------------

type File = { name: string; mimeType: string; buffer: Buffer };
interface Upload {
	/** The files under the route's file field (none, one or more). */
	files?: File[];
	/** The file field sent as a text value instead of a file. */
	fileAsText?: string;
	/** Photo route only: replace the alt text / purpose. */
	alt?: string;
	purpose?: string;
	/** A body sent as it is, with this Content-Type (the form fields above are not used). */
	raw?: { data: Buffer; type: string };
}
interface Case {
	name: string;
	make: () => Promise<Upload>;
	/** 'refuse': a 4xx with a sentence. 'accept': stored (and checked by `check` on every stored variant). */
	expect: 'refuse' | 'accept';
	routes?: ('photo' | 'avatar')[];
	/** Checks on the bytes of each stored variant of an accepted upload. */
	check?: (variant: Buffer, meta: Metadata) => void;
	/** A sentence the refusal must contain. */
	says?: RegExp;
}

const one = (buffer: Buffer, name = 'board.jpg', mimeType = 'image/jpeg'): Upload => ({ files: [{ name, mimeType, buffer }] });
const noPayload = (v: Buffer) => {
	expect(v.includes(Buffer.from('<script')), 'script bytes in a stored variant').toBe(false);
	expect(v.includes(Buffer.from('<html')), 'html bytes in a stored variant').toBe(false);
};
const stripped = (_v: Buffer, m: Metadata) => {
	expect(m.format).toBe('webp');
	expect(exifHasGps(m.exif), 'GPS in a stored variant').toBe(false);
	expect(m.exif, 'EXIF in a stored variant').toBeUndefined();
	expect(m.xmp, 'XMP in a stored variant').toBeUndefined();
};
const still = (_v: Buffer, m: Metadata) => expect(m.pages ?? 1, 'frames in a stored variant').toBe(1);

const CASES: Case[] = [
	{ name: 'an empty file', make: async () => one(Buffer.alloc(0)), expect: 'refuse' },
	{ name: 'no file at all', make: async () => ({}), expect: 'refuse' },
	{ name: 'the file field sent as text', make: async () => ({ fileAsText: 'board.jpg' }), expect: 'refuse' },
	{
		name: 'two files in one upload',
		make: async () => ({ files: [(await one(await rgb(64, 48).jpeg().toBuffer())).files![0], { name: 'two.jpg', mimeType: 'image/jpeg', buffer: await rgb(64, 48, '#000').jpeg().toBuffer() }] }),
		expect: 'refuse',
		says: /one (photo|picture) at a time/
	},
	{ name: 'a truncated JPEG', make: async () => { const b = await rgb(400, 300).jpeg().toBuffer(); return one(b.subarray(0, b.length >> 1)); }, expect: 'refuse' },
	{ name: 'a truncated PNG', make: async () => { const b = await rgb(400, 300).png().toBuffer(); return one(b.subarray(0, 60), 'b.png', 'image/png'); }, expect: 'refuse' },
	{ name: 'a truncated WebP', make: async () => { const b = await rgb(400, 300).webp().toBuffer(); return one(b.subarray(0, 40), 'b.webp', 'image/webp'); }, expect: 'refuse' },
	{ name: 'a text file called .jpg', make: async () => one(text('Not a picture, just some words about a heatsink.\n')), expect: 'refuse' },
	{ name: 'an HTML page renamed .jpg', make: async () => one(text('<!doctype html><html><body><script>alert(1)</script></body></html>')), expect: 'refuse' },
	{ name: 'an SVG with a script', make: async () => one(text('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"><script>alert(1)</script><rect width="10" height="10"/></svg>'), 'x.svg', 'image/svg+xml'), expect: 'refuse' },
	{ name: 'an SVG renamed .png', make: async () => one(text('<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg" width="64" height="48"><rect width="64" height="48"/></svg>'), 'x.png', 'image/png'), expect: 'refuse' },
	{ name: 'a GIF', make: async () => one(await rgb(64, 48).gif().toBuffer(), 'x.gif', 'image/gif'), expect: 'refuse' },
	{ name: 'an animated GIF', make: async () => one(await animated('gif'), 'x.gif', 'image/gif'), expect: 'refuse' },
	{ name: 'an animated WebP (kept as its first frame)', make: async () => one(await animated('webp'), 'x.webp', 'image/webp'), expect: 'accept', check: still },
	{ name: 'a TIFF', make: async () => one(await rgb(64, 48).tiff().toBuffer(), 'x.tiff', 'image/tiff'), expect: 'refuse' },
	{
		name: 'a HEIC header',
		make: async () => one(Buffer.concat([Buffer.from([0, 0, 0, 0x18]), text('ftypheic'), Buffer.from([0, 0, 0, 0]), text('mif1heic'), Buffer.alloc(64)]), 'x.heic', 'image/heic'),
		expect: 'refuse',
		says: /HEIC/
	},
	{ name: 'an AVIF header', make: async () => one(Buffer.concat([Buffer.from([0, 0, 0, 0x1c]), text('ftypavif'), Buffer.alloc(4), text('avifmif1miaf'), Buffer.alloc(64)]), 'x.avif', 'image/avif'), expect: 'refuse' },
	{ name: 'a BMP', make: async () => one(Buffer.concat([text('BM'), Buffer.alloc(60)]), 'x.bmp', 'image/bmp'), expect: 'refuse' },
	{ name: 'an ICO', make: async () => one(Buffer.concat([Buffer.from([0, 0, 1, 0, 1, 0]), Buffer.alloc(40)]), 'x.ico', 'image/x-icon'), expect: 'refuse' },
	{ name: 'a PDF renamed .jpg', make: async () => one(text('%PDF-1.4\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n')), expect: 'refuse' },
	{ name: 'a ZIP renamed .png', make: async () => one(Buffer.concat([Buffer.from([0x50, 0x4b, 0x03, 0x04]), Buffer.alloc(60)]), 'x.png', 'image/png'), expect: 'refuse' },
	{ name: 'JPEG magic bytes followed by HTML', make: async () => one(Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), text('<html><script>alert(1)</script></html>')])), expect: 'refuse' },
	{ name: 'WebP magic bytes followed by junk', make: async () => one(Buffer.concat([text('RIFF'), Buffer.from([0x40, 0, 0, 0]), text('WEBPVP8 '), Buffer.alloc(52, 0x41)]), 'x.webp', 'image/webp'), expect: 'refuse' },
	{
		name: 'a polyglot: a real JPEG with an HTML page appended',
		make: async () => one(Buffer.concat([await rgb(320, 240).jpeg().toBuffer(), text('<html><body><script>alert(1)</script></body></html>')])),
		expect: 'accept',
		check: noPayload
	},
	{
		name: 'a PNG with a script in a text chunk',
		make: async () => one(pngWithText(await rgb(320, 240).png().toBuffer(), 'Comment', '<script>alert(1)</script>'), 'x.png', 'image/png'),
		expect: 'accept',
		check: noPayload
	},
	{ name: 'a PNG bomb (header says 30000 × 30000)', make: async () => one(pngClaiming(await rgb(16, 16).png().toBuffer(), 30_000, 30_000), 'bomb.png', 'image/png'), expect: 'refuse', says: /pixels|megapixels/ },
	{ name: 'a JPEG bomb (header says 60000 × 60000)', make: async () => one(jpegClaiming(await rgb(16, 16).jpeg().toBuffer(), 60_000, 60_000)), expect: 'refuse' },
	{
		name: 'a file over the size limit (15.5 MB)',
		make: async () => one(Buffer.concat([await rgb(16, 16).jpeg().toBuffer(), Buffer.alloc(Math.round(15.5 * 1024 * 1024), 0x20)])),
		expect: 'refuse',
		says: /larger than|limit/
	},
	{ name: 'an extreme strip (2000 × 20)', make: async () => one(await rgb(2000, 20).jpeg().toBuffer()), expect: 'refuse' },
	{ name: 'a 1 × 1 pixel JPEG', make: async () => one(await rgb(1, 1).jpeg().toBuffer()), expect: 'accept', check: stripped },
	{ name: 'a phone JPEG with EXIF GPS and orientation', make: async () => one(await gpsJpeg()), expect: 'accept', check: stripped },
	{ name: 'a traversal file name', make: async () => one(await gpsJpeg(), '../../../../etc/passwd.jpg'), expect: 'accept', check: stripped },
	{ name: 'a file name with backslashes, CR, LF and NUL', make: async () => one(await rgb(64, 48).jpeg().toBuffer(), '..\\..\\x\r\nContent-Type: text/html\u0000.jpg'), expect: 'accept', check: stripped },
	{ name: 'a JPEG declared as image/png', make: async () => one(await rgb(64, 48).jpeg().toBuffer(), 'x.png', 'image/png'), expect: 'accept', check: stripped },
	{ name: 'a CMYK JPEG', make: async () => one(await rgb(64, 48).toColourspace('cmyk').jpeg().toBuffer()), expect: 'accept', check: stripped },
	{
		name: 'a 16-bit PNG with transparency',
		make: async () => one(await sharp({ create: { width: 64, height: 48, channels: 4, background: { r: 10, g: 20, b: 30, alpha: 0.5 } } }).png().toColourspace('rgb16').toBuffer(), 'x.png', 'image/png'),
		expect: 'accept',
		check: stripped
	},
	{ name: 'a JSON body instead of a form', make: async () => ({ raw: { data: text('{"file":"x"}'), type: 'application/json' } }), expect: 'refuse' },
	{
		name: 'a multipart body cut off before its end',
		make: async () => ({
			raw: {
				data: Buffer.concat([text('--XYZ\r\nContent-Disposition: form-data; name="file"; filename="a.jpg"\r\nContent-Type: image/jpeg\r\n\r\n'), (await rgb(64, 48).jpeg().toBuffer()).subarray(0, 200)]),
				type: 'multipart/form-data; boundary=XYZ'
			}
		}),
		expect: 'refuse',
		says: /incomplete/
	},
	{ name: 'a photo without alt text', make: async () => ({ ...one(await rgb(64, 48).jpeg().toBuffer()), alt: '' }), expect: 'refuse', routes: ['photo'], says: /alt text/ },
	{ name: 'alt text of 301 characters', make: async () => ({ ...one(await rgb(64, 48).jpeg().toBuffer()), alt: 'x'.repeat(301) }), expect: 'refuse', routes: ['photo'] },
	{ name: 'an unknown purpose', make: async () => ({ ...one(await rgb(64, 48).jpeg().toBuffer()), purpose: 'wallpaper' }), expect: 'refuse', routes: ['photo'] }
];

// ---- storage and rows ---------------------------------------------------------------------------------

const s3 = new S3Client({
	endpoint: process.env.S3_ENDPOINT ?? 'http://127.0.0.1:4579',
	region: process.env.S3_REGION ?? 'us-east-1',
	forcePathStyle: true,
	credentials: { accessKeyId: process.env.S3_ACCESS_KEY_ID ?? 'S3RVER', secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? 'S3RVER' }
});
const bucket = process.env.S3_BUCKET ?? 'starground';

async function listBucket(): Promise<Set<string>> {
	const keys = new Set<string>();
	let token: string | undefined;
	do {
		const page = await s3.send(new ListObjectsV2Command({ Bucket: bucket, ContinuationToken: token }));
		for (const o of page.Contents ?? []) if (o.Key) keys.add(o.Key);
		token = page.IsTruncated ? page.NextContinuationToken : undefined;
	} while (token);
	return keys;
}

// ---- the test ---------------------------------------------------------------------------------------------

let c: APIRequestContext;
let sql: postgres.Sql;
let slug = '';
let stepId = '';
let userId = '';

test.describe.configure({ mode: 'serial' });

test.beforeAll(async () => {
	test.setTimeout(120_000);
	sql = postgres(process.env.DATABASE_URL!, { max: 2 });
	c = await playwrightRequest.newContext({ baseURL: origin() });
	const who = await throwawayMember(c, 'upl');
	userId = (await sql<{ id: string }[]>`select id from "user" where email = ${who.email}`)[0].id;
	const made = await postPage(c, '/builds/new', { title: `Hostile uploads ${Date.now().toString(36)}`, summary: 'Photos that should not be.', category: 'power-amp', topology: 'class-ab-chip', licence: 'CC-BY-SA-4.0' });
	expect(made.status()).toBe(303);
	slug = made.headers()['location'].split('/')[2];
	expect((await postPage(c, `/builds/${slug}/edit?/addStep`, { title: 'Board', bodyMd: 'Where the photos go.' })).status()).toBe(200);
	stepId = (await (await c.get(`/builds/${slug}/edit`)).text()).match(/name="stepId" value="([0-9a-f-]{36})"/)![1];
});

test.afterAll(async () => {
	await c?.dispose();
	await sql?.end();
});

async function send(route: 'photo' | 'avatar', u: Upload) {
	const url = route === 'photo' ? `/builds/${slug}/photos` : '/account/avatar?/upload';
	const field = route === 'photo' ? 'file' : 'avatar';
	const headers = { origin: origin(), accept: route === 'photo' ? 'application/json' : 'text/html' };
	if (u.raw) return c.post(url, { data: u.raw.data, headers: { ...headers, 'content-type': u.raw.type }, maxRedirects: 0, timeout: 60_000 });
	const form = new FormData();
	if (route === 'photo') {
		form.append('purpose', u.purpose ?? 'step');
		form.append('stepId', stepId);
		form.append('alt', u.alt ?? 'A board on the bench');
	}
	if (u.fileAsText !== undefined) form.append(field, u.fileAsText);
	for (const f of u.files ?? []) form.append(field, new Blob([new Uint8Array(f.buffer)], { type: f.mimeType }), f.name);
	return c.post(url, { multipart: form, headers, maxRedirects: 0, timeout: 60_000 });
}

test('≥ 30 hostile uploads to the photo and picture routes: refused with a sentence or accepted clean, and nothing left behind', async () => {
	test.setTimeout(300_000);
	expect(CASES.length).toBeGreaterThanOrEqual(30);
	// The GPS fixture really carries GPS (else "stripped" proves nothing).
	expect(exifHasGps((await sharp(await gpsJpeg()).metadata()).exif)).toBe(true);
	const before = await listBucket();
	const outcomes: string[] = [];
	let acceptedPhotos = 0;
	for (const k of CASES) {
		const u = await k.make();
		for (const route of k.routes ?? (['photo', 'avatar'] as const)) {
			const res = await send(route, u);
			const status = res.status();
			const body = await res.text();
			const label = `${k.name} → ${route}`;
			if (k.expect === 'refuse') {
				expect(status, `${label}: ${body.slice(0, 300)}`).toBeGreaterThanOrEqual(400);
				expect(status, `${label}: ${body.slice(0, 300)}`).toBeLessThan(500);
				let sentence: string;
				if (route === 'photo') {
					const env = JSON.parse(body) as { error: { message: string } };
					sentence = env.error.message;
				} else {
					// The picture page's alert, or the error page's message (a post that is not a form at all).
					sentence = (body.match(/role="alert"[^>]*>([^<]+)</) ?? body.match(/<p class="mt-2 text-ink-soft">([^<]+)</))?.[1] ?? '';
				}
				expect(sentence, label).toMatch(/^[A-Z].{10,}[.!?]$/);
				if (k.says) expect(sentence, label).toMatch(k.says);
				outcomes.push(`${status} ${label}: ${sentence}`);
			} else {
				if (route === 'photo') {
					expect(status, `${label}: ${body.slice(0, 300)}`).toBe(201);
					acceptedPhotos++;
					const { photo } = JSON.parse(body) as { photo: { renditions?: { url: string }[]; url: string } };
					const urls = [...new Set([photo.url, ...(photo.renditions ?? []).map((r) => r.url)])];
					for (const url of urls) {
						const img = await c.get(url);
						expect(img.status(), url).toBe(200);
						const bytes = await img.body();
						k.check?.(bytes, await sharp(bytes).metadata());
					}
				} else {
					expect(status, `${label}: ${body.slice(0, 300)}`).toBe(303);
					expect(res.headers()['location']).toBe('/account?avatar=saved');
					const key = (await sql<{ k: string }[]>`select avatar_key as k from "user" where id = ${userId}`)[0].k;
					const img = await c.get(`/media/${key}`);
					expect(img.status()).toBe(200);
					const bytes = await img.body();
					k.check?.(bytes, await sharp(bytes).metadata());
				}
				outcomes.push(`${status} ${label}: accepted`);
			}
		}
	}
	console.log(`uploads: ${outcomes.length} hostile uploads over ${CASES.length} kinds of file\n  ${outcomes.join('\n  ')}`);

	// No orphan rows: the member's photo rows are the accepted ones, each with all of its objects.
	const rows = await sql<{ id: string; key_prefix: string; widths: number[] }[]>`select id, key_prefix, widths from photo where owner_id = ${userId}`;
	expect(rows.length).toBe(acceptedPhotos);
	const after = await listBucket();
	for (const r of rows) for (const w of r.widths) expect(after.has(`${r.key_prefix}/${w}.webp`), `object of photo ${r.id}`).toBe(true);
	// No orphan objects: every object stored since the start has a row (photos) or is a member's current
	// picture (replaced pictures are deleted). Another test may be between storing and recording its own
	// upload: wait a moment for those before calling anything an orphan.
	const known = async () => {
		const photoIds = new Set((await sql<{ id: string }[]>`select id from photo`).map((r) => r.id));
		const avatars = new Set((await sql<{ k: string }[]>`select avatar_key as k from "user" where avatar_key is not null`).map((r) => r.k));
		const now = await listBucket();
		return [...now]
			.filter((k) => !before.has(k) && /^(photos|avatars)\//.test(k))
			.filter((k) => (k.startsWith('photos/') ? !photoIds.has(k.split('/')[1]) : !avatars.has(k)));
	};
	let orphans = await known();
	for (let i = 0; i < 20 && orphans.length > 0; i++) {
		await new Promise((r) => setTimeout(r, 500));
		orphans = await known();
	}
	expect(orphans, 'objects without a row').toEqual([]);
	// Every new key has the server's own shape: no part of a file name reaches storage.
	for (const k of [...after].filter((x) => !before.has(x) && /^(photos|avatars)\//.test(x))) expect(k).toMatch(/^(photos|avatars)\/[0-9a-f-]{36}\/\d+\.webp$/);
});
