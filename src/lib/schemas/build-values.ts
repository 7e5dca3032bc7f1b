/**
 * A build's fixed values (categories, topologies, licences, statuses, progress) and field lengths, without
 * the zod schemas: pages that only list or show builds import these, so zod stays out of the browser.
 * $lib/schemas/build re-exports them with the schemas.
 */

/** Build categories (PRODUCT.md §4.2), in the order forms list them. */
export const CATEGORIES = [
	'power-amp',
	'preamp',
	'headphone-amp',
	'dac',
	'power-supply',
	'crossover',
	'test-gear',
	'other'
] as const;
export type Category = (typeof CATEGORIES)[number];

/** Circuit topologies a build can declare; the same values as the amplifier spec block's `topology`, plus passive. */
export const TOPOLOGIES = [
	'class-ab-chip',
	'class-ab-discrete',
	'class-a',
	'class-d',
	'valve',
	'passive',
	'other'
] as const;
export type Topology = (typeof TOPOLOGIES)[number];

/** Open licences a maker can put a build under (SPDX identifiers). */
export const LICENCES = ['CC-BY-SA-4.0', 'CC-BY-4.0', 'CC0-1.0', 'CERN-OHL-S-2.0', 'CERN-OHL-W-2.0', 'CERN-OHL-P-2.0'] as const;
export type Licence = (typeof LICENCES)[number];

/** Life of a build: draft → published → archived (an archived build can be published again). */
export const STATUSES = ['draft', 'published', 'archived'] as const;
export type BuildStatus = (typeof STATUSES)[number];

/**
 * The maker's build status, set in the build editor and shown on cards and the build page: still being
 * built, built and working, or given up. Separate from the publishing life above (code: `progress`;
 * the list's query parameter: `status`).
 */
export const BUILD_PROGRESS = ['in-progress', 'working', 'abandoned'] as const;
export type BuildProgress = (typeof BUILD_PROGRESS)[number];
export const TITLE_MIN = 3;
export const TITLE_MAX = 120;
export const SUMMARY_MAX = 600;
export const STEP_TITLE_MAX = 120;
export const STEP_BODY_MAX = 20_000;
