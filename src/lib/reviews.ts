/**
 * Review words and pure review-state logic shared by server and browser (PRODUCT.md §3, §4.5).
 * A review ends in a sign-off (API `safe`) or a send-back (API `rework`), recorded against one revision;
 * a reviewer's pointer at a problem is a hazard tag (code and API: `flag`), tagged → fixed → cleared
 * (API `open` / `addressed` / `resolved`). The database side lives in $lib/server/reviews.
 */
import { revisionLabel } from './revision-label';

export type ReviewLabel = 'unreviewed' | 'waiting' | 'safe' | 'rework' | 'safe-changed' | 'rework-changed';

export const REVIEW_LABELS: readonly ReviewLabel[] = ['unreviewed', 'waiting', 'safe', 'rework', 'safe-changed', 'rework-changed'];

export type Verdict = 'safe' | 'rework';

export interface ReviewState {
	label: ReviewLabel;
	verdict: Verdict | null;
	/** The build revision the latest verdict was given on. */
	verdictRevision: number | null;
	/** The build's current revision. */
	currentRevision: number;
	reviewedAt: Date | null;
	reviewer: { name: string; handle: string | null } | null;
	/** The maker asked for review and no review has landed since. */
	waiting: boolean;
	openFlags: number;
	addressedFlags: number;
}

/** The state of a build nobody has looked at (also used for ids that do not exist). */
export function emptyReviewState(currentRevision = 0, waiting = false): ReviewState {
	return {
		label: waiting ? 'waiting' : 'unreviewed',
		verdict: null,
		verdictRevision: null,
		currentRevision,
		reviewedAt: null,
		reviewer: null,
		waiting,
		openFlags: 0,
		addressedFlags: 0
	};
}

/**
 * Pure: the label from the latest verdict and revisions. A verdict given on r3 of a build now at r4
 * is "changed": the verdict belongs to r3 only. Without a verdict, a build is waiting or unreviewed.
 * computeLabel('safe', 3, 4, false) → 'safe-changed'.
 */
export function computeLabel(verdict: Verdict | null, verdictRevision: number | null, currentRevision: number, waiting: boolean): ReviewLabel {
	if (!verdict || verdictRevision === null) return waiting ? 'waiting' : 'unreviewed';
	const changed = currentRevision > verdictRevision;
	if (verdict === 'safe') return changed ? 'safe-changed' : 'safe';
	return changed ? 'rework-changed' : 'rework';
}

/** Pure: whether a review request is still pending, given when it was asked and when the latest review landed. */
export function isWaiting(requestedAt: Date | null, reviewedAt: Date | null): boolean {
	if (!requestedAt) return false;
	return !reviewedAt || reviewedAt.getTime() < requestedAt.getTime();
}

/**
 * The review state as the JSON API gives it (list items and build detail): the label, its words, the
 * latest verdict and the revision it was given on, and the flag counts. "safe" is a peer's opinion.
 */
export function reviewStateJson(s: ReviewState) {
	return {
		label: s.label,
		text: reviewLabelText(s),
		verdict: s.verdict,
		verdictRevision: s.verdictRevision,
		currentRevision: s.currentRevision,
		reviewedAt: s.reviewedAt ? s.reviewedAt.toISOString() : null,
		reviewer: s.reviewer,
		waiting: s.waiting,
		openFlags: s.openFlags,
		addressedFlags: s.addressedFlags
	};
}

/**
 * One line of text for a state (pure; stamps, cards, feeds, API display fields), in the workshop's words:
 * "Signed off as safe at Rev C", "Sent back for changes at Rev B", "Edited since sign-off at Rev C",
 * "Edited since send-back at Rev B", "Waiting for review", "Not reviewed". A build asked again after an
 * edit adds " · waiting for review".
 */
export function reviewLabelText(state: Pick<ReviewState, 'label' | 'verdict' | 'verdictRevision' | 'waiting'>): string {
	if (!state.verdict || state.verdictRevision === null) return state.waiting ? 'Waiting for review' : 'Not reviewed';
	const rev = revisionLabel(state.verdictRevision);
	const edited = state.label === 'safe-changed' || state.label === 'rework-changed';
	let text = edited
		? `Edited since ${state.verdict === 'safe' ? 'sign-off' : 'send-back'} at ${rev}`
		: state.verdict === 'safe'
			? `Signed off as safe at ${rev}`
			: `Sent back for changes at ${rev}`;
	if (state.waiting) text += ' · waiting for review';
	return text;
}

/** A review's outcome in words, pinned to its revision: "Signed off as safe at Rev B" / "Sent back for changes at Rev B". */
export function verdictText(verdict: Verdict, revision: number): string {
	return `${verdict === 'safe' ? 'Signed off as safe' : 'Sent back for changes'} at ${revisionLabel(revision)}`;
}

/** The outcome's short name: "Sign-off" / "Send-back". */
export const VERDICT_NAMES: Record<Verdict, string> = { safe: 'Sign-off', rework: 'Send-back' };

/** Human names of the review labels (browse filters, API display). */
export const REVIEW_LABEL_NAMES: Record<ReviewLabel, string> = {
	unreviewed: 'Not reviewed',
	waiting: 'Waiting for review',
	safe: 'Signed off as safe (current revision)',
	rework: 'Sent back for changes (current revision)',
	'safe-changed': 'Edited since sign-off',
	'rework-changed': 'Edited since send-back'
};

/** Hazard-tag categories (PRODUCT.md §3), stored value → label. */
export const FLAG_CATEGORIES = {
	'mains-earth': 'Mains & earth',
	heat: 'Heat',
	ratings: 'Ratings',
	'grounding-shielding': 'Grounding & shielding',
	wiring: 'Wiring',
	other: 'Other'
} as const;
export type FlagCategory = keyof typeof FLAG_CATEGORIES;
export const FLAG_CATEGORY_VALUES = Object.keys(FLAG_CATEGORIES) as [FlagCategory, ...FlagCategory[]];

/**
 * How urgent a hazard tag is, mildest first: "check" (look again), "fix" (fix before regular use),
 * "stop" (do not power it up until fixed).
 */
export const FLAG_SEVERITIES = {
	check: 'Look again',
	fix: 'Fix before use',
	stop: 'Do not power up'
} as const;
export type FlagSeverity = keyof typeof FLAG_SEVERITIES;
export const FLAG_SEVERITY_VALUES = Object.keys(FLAG_SEVERITIES) as [FlagSeverity, ...FlagSeverity[]];

/**
 * Hazard-tag states: tagged (API `open`) → fixed by the maker (`addressed`) → cleared by a reviewer
 * (`resolved`), or re-tagged (back to `open`).
 */
export const FLAG_STATES = { open: 'Tagged', addressed: 'Fixed', resolved: 'Cleared' } as const;
export type FlagState = keyof typeof FLAG_STATES;

/** What a hazard tag points at. */
export const FLAG_TARGET_KINDS = { step: 'Step', spec: 'Spec block', part: 'Part line' } as const;
export type FlagTargetKind = keyof typeof FLAG_TARGET_KINDS;

/** Shown wherever sign-offs show (PRODUCT.md §4.11). */
export const PEER_OPINION_NOTE =
	'A sign-off as “safe” is one reviewer’s opinion of one revision, not a certification. Mains, stored charge and heat can hurt: defer to local electrical codes and licensed practice.';

/** The build page's review panel (built by getReviewPanel on the server). */
export interface PanelPerson {
	name: string;
	handle: string | null;
}

export interface PanelFlag {
	id: string;
	target: { kind: FlagTargetKind; id: string; label: string; anchor: string };
	category: FlagCategory;
	severity: FlagSeverity;
	state: FlagState;
	noteHtml: string;
	raisedBy: PanelPerson;
	revision: number;
	createdAt: Date;
	addressedNote: string | null;
	addressedAt: Date | null;
	resolvedBy: PanelPerson | null;
	resolvedAt: Date | null;
	/** The reviewer's note when clearing ('' when none). */
	resolvedNote: string;
	/** The thread on the tag (maker ↔ reviewers), oldest first. */
	messages: PanelFlagMessage[];
}

/** One message in a hazard tag's thread. */
export interface PanelFlagMessage {
	id: string;
	author: PanelPerson;
	/** True when the build's maker wrote it. */
	byMaker: boolean;
	bodyHtml: string;
	createdAt: Date;
}

export interface PanelReview {
	id: string;
	reviewer: PanelPerson;
	verdict: Verdict;
	revision: number;
	summaryHtml: string;
	createdAt: Date;
	/** Mains review checklist stored with the verdict ([] when none applied). */
	checklist: { key: string; ticked: boolean }[];
	/** Why items were left unticked ('' when none). */
	checklistNote: string;
}

export interface ReviewPanelData {
	slug: string;
	status: string;
	locked: boolean;
	state: ReviewState;
	reviews: PanelReview[];
	/** Open flags first, then addressed, then resolved; newest first within each. */
	flags: PanelFlag[];
	can: {
		/** The maker may ask for review now (published, not locked, not already waiting). */
		requestReview: boolean;
		/** The viewer may open review mode (reviewer or above, not the maker, published). */
		review: boolean;
		/** The maker may mark open flags addressed. */
		address: boolean;
		/** The viewer may resolve and reopen flags. */
		resolve: boolean;
		/** The viewer may write in hazard tag threads (the maker, or a reviewer who is not the maker). */
		discuss: boolean;
	};
}

