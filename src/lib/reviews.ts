/**
 * Review words and pure review-state logic shared by server and browser (PRODUCT.md §3, §4.5).
 * The database side lives in $lib/server/reviews.
 */

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
 * One line of text for a state (pure; badges, cards, feeds, API display fields):
 * "safe at r3 · changed since", "rework at r2", "waiting for review", "not reviewed".
 * A build asked again after a change adds "· waiting for review".
 */
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

export function reviewLabelText(state: Pick<ReviewState, 'label' | 'verdict' | 'verdictRevision' | 'waiting'>): string {
	if (!state.verdict || state.verdictRevision === null) return state.waiting ? 'waiting for review' : 'not reviewed';
	let text = `${state.verdict} at r${state.verdictRevision}`;
	if (state.label === 'safe-changed' || state.label === 'rework-changed') text += ' · changed since';
	if (state.waiting) text += ' · waiting for review';
	return text;
}


/** Human names of the review labels (browse filters, API display). */
export const REVIEW_LABEL_NAMES: Record<ReviewLabel, string> = {
	unreviewed: 'Not reviewed',
	waiting: 'Waiting for review',
	safe: 'Safe (current revision)',
	rework: 'Rework (current revision)',
	'safe-changed': 'Safe, changed since',
	'rework-changed': 'Rework, changed since'
};

/** Safety-flag categories (PRODUCT.md §3), stored value → label. */
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
 * Safety-flag severities, mildest first: "check" (worth a second look), "fix" (fix before regular use),
 * "stop" (do not power it up until fixed).
 */
export const FLAG_SEVERITIES = {
	check: 'Check',
	fix: 'Fix before use',
	stop: 'Stop: do not power up'
} as const;
export type FlagSeverity = keyof typeof FLAG_SEVERITIES;
export const FLAG_SEVERITY_VALUES = Object.keys(FLAG_SEVERITIES) as [FlagSeverity, ...FlagSeverity[]];

/** Flag states: open → addressed (by the maker) → resolved (by a reviewer), or reopened to open. */
export const FLAG_STATES = { open: 'Open', addressed: 'Addressed', resolved: 'Resolved' } as const;
export type FlagState = keyof typeof FLAG_STATES;

/** What a flag points at. */
export const FLAG_TARGET_KINDS = { step: 'Step', spec: 'Spec block', part: 'Part line' } as const;
export type FlagTargetKind = keyof typeof FLAG_TARGET_KINDS;

/** Shown wherever verdicts show (PRODUCT.md §4.11). */
export const PEER_OPINION_NOTE =
	'“Safe” is a peer’s opinion of one revision, not a certification. Mains, stored charge and heat can hurt: defer to local electrical codes and licensed practice.';

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
}

export interface PanelReview {
	id: string;
	reviewer: PanelPerson;
	verdict: Verdict;
	revision: number;
	summaryHtml: string;
	createdAt: Date;
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
	};
}

