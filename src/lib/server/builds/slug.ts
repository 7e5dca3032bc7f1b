/** Readable, unique URL slugs for builds: "Bench stereo chip amp on ±28 V rails" → "bench-stereo-chip-amp-on-28-v-rails". */

/** Longest slug base, in characters; a clash suffix ("-2") may follow. */
export const SLUG_MAX = 64;

/** Slugs that would collide with fixed routes under /builds. */
const RESERVED = new Set(['new', 'edit', 'feed', 'search', 'compare', 'revisions', 'photos', 'api', 'media']);

/**
 * Turn a title into a URL slug: lower case ASCII letters, digits and single dashes, at most SLUG_MAX
 * characters, cut at a word boundary. Accents are folded ("Röhre" → "rohre"); "±" and "Ω" drop out.
 * Empty or reserved results become "build" / "build-new". slugify('  Class A  headphone amp!') → 'class-a-headphone-amp'.
 */
export function slugify(title: string): string {
	let s = title
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.toLowerCase()
		.replace(/ß/g, 'ss')
		.replace(/æ/g, 'ae')
		.replace(/ø/g, 'o')
		.replace(/[^a-z0-9]+/g, '-')
		.replace(/^-+|-+$/g, '');
	if (s.length > SLUG_MAX) {
		const cut = s.slice(0, SLUG_MAX + 1);
		const lastDash = cut.lastIndexOf('-');
		s = (lastDash > SLUG_MAX / 2 ? cut.slice(0, lastDash) : cut.slice(0, SLUG_MAX)).replace(/-+$/, '');
	}
	if (!s) return 'build';
	if (RESERVED.has(s)) return `build-${s}`;
	return s;
}

/**
 * The first free slug for `base` given the slugs already taken that start with it:
 * nextFreeSlug('chip-amp', ['chip-amp', 'chip-amp-2']) → 'chip-amp-3'; nextFreeSlug('chip-amp', []) → 'chip-amp'.
 */
export function nextFreeSlug(base: string, taken: Iterable<string>): string {
	const set = new Set(taken);
	if (!set.has(base)) return base;
	for (let n = 2; ; n++) {
		const candidate = `${base}-${n}`;
		if (!set.has(candidate)) return candidate;
	}
}

/** True when `s` has the shape of a slug we make (used to refuse odd URL segments early). */
export function isSlugShaped(s: string): boolean {
	return /^[a-z0-9](?:[a-z0-9-]{0,80}[a-z0-9])?$/.test(s);
}
