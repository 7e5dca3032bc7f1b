/**
 * Shapes of a build and its steps, shared by the form actions (server) and superForm (client).
 * Rules that need the database (ownership, state changes) live in $lib/server/builds.
 */
import { z } from 'zod';

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
export const progressSchema = z.object({
	progress: z.enum(BUILD_PROGRESS, { error: 'Choose a build status: in progress, working or abandoned.' })
});

export const TITLE_MIN = 3;
export const TITLE_MAX = 120;
export const SUMMARY_MAX = 600;
export const STEP_TITLE_MAX = 120;
export const STEP_BODY_MAX = 20_000;

/** Fields a maker edits on a build (create and update). */
export const buildSchema = z.object({
	title: z
		.string()
		.trim()
		.min(TITLE_MIN, `Use at least ${TITLE_MIN} characters.`)
		.max(TITLE_MAX, `Use at most ${TITLE_MAX} characters.`),
	summary: z.string().trim().max(SUMMARY_MAX, `Keep the summary under ${SUMMARY_MAX} characters.`).default(''),
	category: z.enum(CATEGORIES, { error: 'Choose a category.' }),
	topology: z.enum(TOPOLOGIES, { error: 'Choose a topology.' }),
	mainsPowered: z.boolean().default(false),
	licence: z.enum(LICENCES, { error: 'Choose a licence.' }).default('CC-BY-SA-4.0')
});
export type BuildInput = z.infer<typeof buildSchema>;

/** A step: a short title and Markdown text. */
export const stepSchema = z.object({
	title: z
		.string()
		.trim()
		.min(1, 'Give the step a title.')
		.max(STEP_TITLE_MAX, `Use at most ${STEP_TITLE_MAX} characters.`),
	bodyMd: z.string().max(STEP_BODY_MAX, `Keep a step under ${STEP_BODY_MAX.toLocaleString('en')} characters; split it into two.`).default('')
});
export type StepInput = z.infer<typeof stepSchema>;

/** A moderator's lock or unlock, with the reason that goes to the audit log. */
export const lockSchema = z.object({
	locked: z.boolean(),
	reason: z.string().trim().max(500, 'Keep the reason under 500 characters.').default('')
});
