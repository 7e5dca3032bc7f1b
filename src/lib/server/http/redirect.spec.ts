import { describe, it, expect } from 'vitest';
import { safeNext } from './redirect';
import { hostileNext } from '../../../../tests/fixtures/hostile-next';

const origin = 'http://127.0.0.1:3100';

/** The shared hostile list (tests/fixtures/hostile-next.ts), decoded the way the sign-in page reads it (URLSearchParams). */
const HOSTILE = hostileNext(new URL(origin).host);

function decoded(raw: string): string | null {
	return new URLSearchParams(`next=${raw}`).get('next');
}

describe('safeNext (sign-in redirect target)', () => {
	it('has 24 hostile values to try', () => {
		expect(HOSTILE).toHaveLength(24);
	});

	it.each(HOSTILE)('keeps %s on the site with a header-safe path', (raw) => {
		const out = safeNext(decoded(raw), origin);
		// The browser's resolution of the answer must be our own origin…
		expect(new URL(out, origin).origin).toBe(origin);
		// …and the answer must be printable ASCII, as a header value must be (RFC 9110 §5.5).
		expect(out).toMatch(/^\/[\x21-\x7e]*$/);
		expect(out.startsWith('//')).toBe(false);
		expect(out.includes('\\')).toBe(false);
	});

	it('keeps ordinary paths with their query and fragment', () => {
		expect(safeNext('/builds/new?x=1#top', origin)).toBe('/builds/new?x=1#top');
		expect(safeNext('/makers/ilse', origin)).toBe('/makers/ilse');
		expect(safeNext(`${origin}/account`, origin)).toBe('/account');
	});

	it('falls back for nothing at all', () => {
		expect(safeNext(null, origin)).toBe('/');
		expect(safeNext('', origin)).toBe('/');
	});
});
