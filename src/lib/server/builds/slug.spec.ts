import { describe, it, expect } from 'vitest';
import { slugify, nextFreeSlug, isSlugShaped, SLUG_MAX } from './slug';

describe('slugify', () => {
	it('makes lower-case words joined by single dashes', () => {
		expect(slugify('Bench stereo chip amp on ±28 V rails')).toBe('bench-stereo-chip-amp-on-28-v-rails');
		expect(slugify('  Class A --- headphone   amp! ')).toBe('class-a-headphone-amp');
	});

	it('folds accents and drops symbols', () => {
		expect(slugify('Röhren-Vorstufe für 8 Ω')).toBe('rohren-vorstufe-fur-8');
		expect(slugify('Straße & Ærø')).toBe('strasse-aero');
	});

	it('cuts long titles at a word boundary within the limit', () => {
		const s = slugify('A very long title about a dual rail linear supply with soft start and bleeders and a lot more words');
		expect(s.length).toBeLessThanOrEqual(SLUG_MAX);
		expect(s.endsWith('-')).toBe(false);
		expect('a-very-long-title-about-a-dual-rail-linear-supply-with-soft-start-and'.startsWith(s)).toBe(true);
	});

	it('falls back for empty or reserved results', () => {
		expect(slugify('±±±')).toBe('build');
		expect(slugify('')).toBe('build');
		expect(slugify('New')).toBe('build-new');
	});

	it('always returns a slug-shaped string', () => {
		for (const t of ['x', '<script>alert(1)</script>', '4k7 — 2R2 / 100n', '-a-', 'ÅÄÖ 123']) {
			expect(isSlugShaped(slugify(t))).toBe(true);
		}
	});
});

describe('nextFreeSlug', () => {
	it('keeps the base when free and numbers clashes from 2', () => {
		expect(nextFreeSlug('chip-amp', [])).toBe('chip-amp');
		expect(nextFreeSlug('chip-amp', ['chip-amp'])).toBe('chip-amp-2');
		expect(nextFreeSlug('chip-amp', ['chip-amp', 'chip-amp-2', 'chip-amp-4'])).toBe('chip-amp-3');
	});

	it('is not confused by other slugs that share the prefix', () => {
		expect(nextFreeSlug('chip-amp', ['chip-amp-mono', 'chip-amp-2'])).toBe('chip-amp');
	});
});

describe('isSlugShaped', () => {
	it('refuses odd URL segments', () => {
		expect(isSlugShaped('chip-amp-2')).toBe(true);
		expect(isSlugShaped('Chip')).toBe(false);
		expect(isSlugShaped('-x')).toBe(false);
		expect(isSlugShaped('a/b')).toBe(false);
		expect(isSlugShaped('x'.repeat(100))).toBe(false);
	});
});
