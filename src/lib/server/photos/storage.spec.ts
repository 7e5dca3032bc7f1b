import { describe, it, expect } from 'vitest';
import { randomBytes } from 'node:crypto';
import { deleteObjects, ensureBucket, getObject, getObjectBytes, listKeys, putObject } from './storage';

// Runs against the S3-compatible store named by S3_ENDPOINT / S3_BUCKET (the fake in tests).
const prefix = `test-storage/${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 7)}`;

describe('storage (S3 API)', () => {
	it('ensureBucket is idempotent on an existing bucket', async () => {
		await expect(ensureBucket()).resolves.toBeUndefined();
		await expect(ensureBucket()).resolves.toBeUndefined();
	});

	it('a round trip returns byte-identical content with its type and an ETag', async () => {
		// Random bytes of an awkward size: any checksum trailer or re-encoding would show.
		const bytes = randomBytes(300_001);
		const key = `${prefix}/round-trip.bin`;
		await putObject(key, bytes, { contentType: 'application/octet-stream', cacheControl: 'no-store' });
		const back = await getObjectBytes(key);
		expect(back).not.toBeNull();
		expect(back!.length).toBe(bytes.length);
		expect(Buffer.compare(back!, bytes)).toBe(0);

		const obj = await getObject(key);
		expect(obj && obj !== 'not-modified' && obj.contentType).toBe('application/octet-stream');
		expect(obj && obj !== 'not-modified' && obj.contentLength).toBe(300_001);
		const etag = obj && obj !== 'not-modified' ? obj.etag : undefined;
		expect(etag).toMatch(/^"[^"]+"$/);
		if (obj && obj !== 'not-modified') await obj.body.cancel();

		expect(await getObject(key, { ifNoneMatch: etag })).toBe('not-modified');
	});

	it('a missing key reads as null, not an error', async () => {
		expect(await getObject(`${prefix}/nothing-here.webp`)).toBeNull();
		expect(await getObjectBytes(`${prefix}/nothing-here.webp`)).toBeNull();
	});

	it('lists by prefix and deletes in a batch (missing keys are fine)', async () => {
		const keys = [`${prefix}/del/a.txt`, `${prefix}/del/b.txt`, `${prefix}/del/c.txt`];
		for (const k of keys) await putObject(k, Buffer.from(k), { contentType: 'text/plain' });
		expect((await listKeys(`${prefix}/del/`)).sort()).toEqual(keys);
		await deleteObjects([...keys, `${prefix}/del/never-existed.txt`]);
		expect(await listKeys(`${prefix}/del/`)).toEqual([]);
		await deleteObjects([`${prefix}/round-trip.bin`]);
		expect(await listKeys(prefix)).toEqual([]);
	});
});
