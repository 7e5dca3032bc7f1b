/** Input shapes for review, hazard tags (code: flags), comments and reports: shared by form actions, API routes and forms. */
import { z } from 'zod';
import { FLAG_CATEGORY_VALUES, FLAG_SEVERITY_VALUES } from '$lib/reviews';
import { UUID_PATTERN } from '$lib/uuid';
import { CHECKLIST_KEYS } from '$lib/review-checklist';

const uuid = z.string().trim().regex(UUID_PATTERN, 'Not a valid id.');

/** A reviewer tags a hazard on a step, a spec block or a part line. */
export const raiseFlagSchema = z.object({
	targetKind: z.enum(['step', 'spec', 'part'], { message: 'Choose what the tag points at.' }),
	targetId: uuid,
	category: z.enum(FLAG_CATEGORY_VALUES, { message: 'Choose what kind of hazard it is.' }),
	severity: z.enum(FLAG_SEVERITY_VALUES, { message: 'Choose how urgent it is.' }),
	note: z.string().trim().min(3, 'Say what is wrong and why (at least 3 characters).').max(5000, 'Keep the note under 5000 characters.')
});
export type RaiseFlagInput = z.infer<typeof raiseFlagSchema>;

/** The maker says what they fixed for a hazard tag. */
export const addressFlagSchema = z.object({
	note: z.string().trim().min(3, 'Say what you changed (at least 3 characters).').max(5000, 'Keep the note under 5000 characters.')
});

/** A reviewer's sign-off (`safe`) or send-back (`rework`) with its summary. */
export const reviewSchema = z.object({
	verdict: z.enum(['safe', 'rework'], { message: 'Choose: sign off as safe, or send back for changes.' }),
	summary: z
		.string()
		.trim()
		.min(10, 'Write a short summary of what you checked (at least 10 characters).')
		.max(10000, 'Keep the summary under 10 000 characters.'),
	/** Mains builds: the checklist items the reviewer ticked ($lib/review-checklist). */
	checklist: z.array(z.enum(CHECKLIST_KEYS)).max(CHECKLIST_KEYS.length).default([]),
	/** Why items are left unticked on a sign-off (required then on a mains build). */
	checklistNote: z.string().trim().max(2000, 'Keep the note under 2000 characters.').default('')
});
export type ReviewInput = z.input<typeof reviewSchema>;

/** The maker's note for the reviewer when asking for review (optional). */
export const requestReviewSchema = z.object({
	note: z.string().trim().max(2000, 'Keep the note for the reviewer under 2000 characters.').default('')
});

/** A message in a hazard tag's thread. */
export const flagMessageSchema = z.object({
	body: z.string().trim().min(1, 'Write something first.').max(3000, 'Keep messages under 3000 characters.')
});

/** The reviewer's optional note when clearing a hazard tag. */
export const clearFlagSchema = z.object({
	note: z.string().trim().max(2000, 'Keep the note under 2000 characters.').default('')
});

export const COMMENT_MAX = 5000;

/** A comment, or a reply when parentId is given. */
export const commentSchema = z.object({
	body: z
		.string({ message: 'Write something first.' })
		.trim()
		.min(1, 'Write something first.')
		.max(COMMENT_MAX, `Keep comments under ${COMMENT_MAX} characters.`),
	parentId: uuid.nullish()
});

/** Editing a comment's text. */
export const commentEditSchema = z.object({ body: commentSchema.shape.body });

export const REPORT_TARGET_KINDS = { build: 'Build', comment: 'Comment', member: 'Member' } as const;
export type ReportTargetKind = keyof typeof REPORT_TARGET_KINDS;

/** Any member reports a build, a comment or a member. */
export const reportSchema = z.object({
	targetKind: z.enum(['build', 'comment', 'member'], { message: 'Choose what you are reporting.' }),
	targetId: z.string().trim().min(1, 'Say what you are reporting.').max(200),
	reason: z
		.string()
		.trim()
		.min(5, 'Tell the moderators what is wrong (at least 5 characters).')
		.max(2000, 'Keep the reason under 2000 characters.')
});
export type ReportInput = z.infer<typeof reportSchema>;

/** A moderator's reason for an action (hide, lock, suspend…); required and shown in the audit log. */
export const moderationReason = z
	.string()
	.trim()
	.min(3, 'Give a reason (at least 3 characters); it goes into the audit log.')
	.max(500, 'Keep the reason under 500 characters.');
