// The upload pipeline decodes at most one full-size image per process at a time (p-limit): several
// uploads arriving together wait their turn, and each still gets its renditions.
import { describe, it, expect } from 'vitest';
import sharp from 'sharp';
import { photoDecodePeak, photoDecodesWaiting, processPhoto } from './photos';

describe('one full-size decode at a time', () => {
	it('four uploads at once: they queue, never decode together, and all finish', async () => {
		const jpeg = await sharp({ create: { width: 2400, height: 1800, channels: 3, background: '#808080', noise: { type: 'gaussian', mean: 128, sigma: 30 } } })
			.jpeg({ quality: 85 })
			.toBuffer();
		photoDecodePeak(true);
		const uploads = [1, 2, 3, 4].map(() => processPhoto(new Uint8Array(jpeg)));
		// The header checks run before the slot is taken; once they have, three must be waiting.
		let maxWaiting = 0;
		const watch = setInterval(() => (maxWaiting = Math.max(maxWaiting, photoDecodesWaiting())), 1);
		const done = await Promise.all(uploads);
		clearInterval(watch);
		expect(done.map((d) => d.widths)).toEqual(Array(4).fill([320, 640, 1280]));
		expect(maxWaiting).toBeGreaterThanOrEqual(1);
		expect(photoDecodePeak()).toBe(1);
	});
});
