import { describe, it, expect, afterAll, beforeAll, vi } from 'vitest';
import { error } from '@sveltejs/kit';

// The upload plumbing reads no request itself, but auth.ts (imported by the builds guard) needs $app/server.
vi.mock('$app/server', () => ({ getRequestEvent: () => ({ locals: { user: null }, url: new URL('http://x/'), request: new Request('http://x/') }) }));

const { uploadRoute, REFUSED_DRAIN_MAX } = await import('./upload');
const { requireEditableBuild } = await import('../builds');
const { PhotoError } = await import('../photos');
const { createMakerWithBuild, removeMaker } = await import('../testing/photos');

async function status(p: Promise<unknown>): Promise<number | string> {
	return p.then(
		() => 'ok',
		(e: unknown) => (e instanceof PhotoError ? e.status : ((e as { status?: number }).status ?? String(e)))
	);
}

/** Who may change a build, as the photo routes ask it. */
const editableBuild = (slug: string, as: { id: string; role?: 'maker' | 'moderator' | 'admin' } | null) =>
	requireEditableBuild(slug, { as: as && { role: 'maker', ...as } });

describe('who may add photos (requireEditableBuild)', () => {
	let open: Awaited<ReturnType<typeof createMakerWithBuild>>;
	let locked: Awaited<ReturnType<typeof createMakerWithBuild>>;
	beforeAll(async () => {
		open = await createMakerWithBuild();
		locked = await createMakerWithBuild({ locked: true });
	});
	afterAll(async () => {
		await removeMaker(open.userId);
		await removeMaker(locked.userId);
	});

	it('lets the maker and an admin in; refuses others, signed-out visitors and locked builds', async () => {
		expect(await status(editableBuild(open.build.slug, { id: open.userId, role: 'maker' }))).toBe('ok');
		// The build is a draft: to others it is absent (404), never a tell-tale 403.
		expect(await status(editableBuild(open.build.slug, { id: 'someone-else', role: 'maker' }))).toBe(404);
		expect(await status(editableBuild(open.build.slug, { id: 'a-moderator', role: 'moderator' }))).toBe(404);
		expect(await status(editableBuild(open.build.slug, null))).toBe(401);
		expect(await status(editableBuild(locked.build.slug, { id: locked.userId, role: 'maker' }))).toBe(403);
		expect(await status(editableBuild(locked.build.slug, { id: 'an-admin', role: 'admin' }))).toBe('ok');
		expect(await status(editableBuild(`no-such-build-${Date.now()}`, { id: open.userId }))).toBe(404);
	});
});

describe('uploadRoute', () => {
	const upload = (size: number) =>
		new Request('http://x/builds/b/photos', {
			method: 'POST',
			body: new Uint8Array(size),
			headers: { 'content-type': 'multipart/form-data; boundary=x', 'content-length': String(size) }
		});

	it('turns a guard error into the JSON envelope and reads the unread body first', async () => {
		const req = upload(50_000);
		const res = await uploadRoute(req, async () => error(403, 'Only the maker of this build can change it.'), {
			drainLimit: 100_000
		});
		expect(res.status).toBe(403);
		expect(await res.json()).toEqual({
			error: { code: 'forbidden', message: 'Only the maker of this build can change it.', issues: [] }
		});
		expect(req.bodyUsed).toBe(true);
	});

	const tooLarge = async (): Promise<Response> => {
		throw new PhotoError(413, 'too_large', 'The photo is larger than the 15 MB limit.');
	};

	/** A body of `size` bytes sent in 64 KB chunks, counting what was read; no Content-Length when `declared` is false. */
	function streamed(size: number, declared = true) {
		const seen = { bytes: 0 };
		let left = size;
		const body = new ReadableStream<Uint8Array>({
			pull(c) {
				if (left <= 0) return c.close();
				const n = Math.min(left, 65_536);
				left -= n;
				seen.bytes += n;
				c.enqueue(new Uint8Array(n));
			}
		});
		const headers: Record<string, string> = { 'content-type': 'multipart/form-data; boundary=x' };
		if (declared) headers['content-length'] = String(size);
		const req = new Request('http://x/builds/b/photos', { method: 'POST', body, headers, duplex: 'half' } as RequestInit);
		return { req, seen };
	}

	it('reads a refused oversized body to its end before answering 413, so the client gets the answer (no reset)', async () => {
		// 15.5 MB: over the photo limit and the route's drainLimit, under REFUSED_DRAIN_MAX (tests/uploads.e2e.ts sends it).
		const size = Math.round(15.5 * 1024 * 1024);
		const { req, seen } = streamed(size);
		const res = await uploadRoute(req, tooLarge, { drainLimit: 100_000 });
		expect(res.status).toBe(413);
		expect(seen.bytes).toBe(size);
		expect(res.headers.get('connection')).toBeNull();
		expect((await res.json()).error).toMatchObject({ code: 'too_large', issues: [{ path: 'file' }] });
	});

	it('a body without Content-Length is drained the same way, up to REFUSED_DRAIN_MAX', async () => {
		const small = streamed(3 * 1024 * 1024, false);
		const ok = await uploadRoute(small.req, tooLarge, { drainLimit: 100_000 });
		expect([ok.status, small.seen.bytes, ok.headers.get('connection')]).toEqual([413, 3 * 1024 * 1024, null]);
		// Longer than the bound: reading stops just past it (memory stays at one chunk) and the connection closes.
		const endless = streamed(REFUSED_DRAIN_MAX * 4, false);
		const closed = await uploadRoute(endless.req, tooLarge, { drainLimit: 100_000 });
		expect(closed.status).toBe(413);
		expect(closed.headers.get('connection')).toBe('close');
		expect(endless.seen.bytes).toBeGreaterThan(REFUSED_DRAIN_MAX);
		expect(endless.seen.bytes).toBeLessThan(REFUSED_DRAIN_MAX + 1024 * 1024);
	});

	it('answers a body declared longer than REFUSED_DRAIN_MAX at once, unread, and closes the connection', async () => {
		const { req, seen } = streamed(REFUSED_DRAIN_MAX + 1);
		const res = await uploadRoute(req, tooLarge, { drainLimit: 100_000 });
		expect(res.status).toBe(413);
		expect(res.headers.get('connection')).toBe('close');
		expect(req.bodyUsed).toBe(false);
		expect(seen.bytes).toBeLessThan(1024 * 1024);
	});

	it('answers a no-script form with a small page and a way back', async () => {
		const res = await uploadRoute(
			upload(10),
			async () => {
				throw new PhotoError(415, 'invalid', 'That file is not a JPEG, PNG or WebP image.');
			},
			{ htmlBack: '/builds/b/edit', drainLimit: 100 }
		);
		expect(res.status).toBe(415);
		expect(res.headers.get('content-type')).toContain('text/html');
		const html = await res.text();
		expect(html).toContain('That file is not a JPEG, PNG or WebP image.');
		expect(html).toContain('href="/builds/b/edit"');
	});

	it('lets unexpected errors through (they become a logged 500 without details)', async () => {
		await expect(uploadRoute(upload(10), async () => Promise.reject(new Error('db down')))).rejects.toThrow('db down');
	});

});

describe('photos on a published build', () => {
	it('join the pending changes when one is added or removed, published as one revision', async () => {
		const { db } = await import('../db');
		const schema = await import('../db/schema');
		const { eq } = await import('drizzle-orm');
		const { publish, pendingChanges, publishRevision } = await import('../builds');
		const { addBuildPhoto, removeBuildPhoto } = await import('../photos');
		const { jpegWithGpsAndOrientation } = await import('../testing/photos');
		const m = await createMakerWithBuild();
		try {
			const actor = { id: m.userId, role: 'maker' as const };
			expect(await publish(actor, m.build.id)).toBe(1);
			const current = async () => (await db.select().from(schema.build).where(eq(schema.build.id, m.build.id)))[0];
			const before = (await current()).updatedAt;
			const photo = await addBuildPhoto(actor, m.build, { stepId: m.step.id, bytes: await jpegWithGpsAndOrientation(400, 300), alt: 'A heatsink', asCover: false });
			expect((await current()).revision).toBe(1);
			expect((await current()).updatedAt.getTime()).toBeGreaterThan(before.getTime());
			expect((await pendingChanges(m.build.id)).changes).toEqual(['photos: 1 added']);
			expect(await publishRevision(actor, m.build.id, 'Heatsink photo')).toMatchObject({ number: 2 });
			await removeBuildPhoto(actor, m.build, photo.id);
			expect((await pendingChanges(m.build.id)).changes).toEqual(['photos: 1 removed']);
			expect((await current()).revision).toBe(2);
			// Not a photo of this build (any more): refused, and nothing new pending.
			await expect(removeBuildPhoto(actor, m.build, photo.id)).rejects.toMatchObject({ status: 404 });
			expect((await current()).revision).toBe(2);
		} finally {
			await removeMaker(m.userId);
		}
	});
});
