/**
 * Public URLs of stored photo renditions. Pure and client-safe (components use it);
 * `$lib/server/photos` re-exports it for server code.
 */

/** The shape of a photo row that the browser needs to draw it. */
export interface PhotoView {
	id: string;
	keyPrefix: string;
	widths: number[];
	width: number;
	height: number;
	alt: string;
	placeholder?: string | null;
}

/** URL of one WebP rendition: ('photos/ab12…', 640) → '/media/photos/ab12…/640.webp'. */
export function photoUrl(keyPrefix: string, width: number): string {
	return `/media/${keyPrefix}/${width}.webp`;
}

/** `srcset` value listing every rendition, smallest first: '/media/…/320.webp 320w, /media/…/640.webp 640w'. */
export function photoSrcset(photo: Pick<PhotoView, 'keyPrefix' | 'widths'>): string {
	return [...photo.widths]
		.sort((a, b) => a - b)
		.map((w) => `${photoUrl(photo.keyPrefix, w)} ${w}w`)
		.join(', ');
}

/** The rendition to use as plain `src` (browsers without srcset, crawlers): the middle width, else the largest. */
export function photoFallbackWidth(widths: number[]): number {
	const sorted = [...widths].sort((a, b) => a - b);
	if (sorted.length === 0) return 0;
	return sorted.find((w) => w >= 640) ?? sorted[sorted.length - 1];
}
