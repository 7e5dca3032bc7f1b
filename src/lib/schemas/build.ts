/**
 * Shapes of a build and its steps, shared by the form actions (server) and superForm (client).
 * Rules that need the database (ownership, state changes) live in $lib/server/builds.
 */
import { z } from 'zod';
import { CATEGORIES, TOPOLOGIES, LICENCES, STATUSES, BUILD_PROGRESS, TITLE_MIN, TITLE_MAX, SUMMARY_MAX, STEP_TITLE_MAX, STEP_BODY_MAX, type Category, type Topology, type Licence, type BuildStatus, type BuildProgress } from './build-values';
export { CATEGORIES, TOPOLOGIES, LICENCES, STATUSES, BUILD_PROGRESS, TITLE_MIN, TITLE_MAX, SUMMARY_MAX, STEP_TITLE_MAX, STEP_BODY_MAX, type Category, type Topology, type Licence, type BuildStatus, type BuildProgress };

export const progressSchema = z.object({
	progress: z.enum(BUILD_PROGRESS, { error: 'Choose a build status: in progress, working or abandoned.' })
});

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
