/**
 * "Say what happened" after a review action: the action redirects with `?done=<code>` and the page it
 * lands on shows the sentence (works without JavaScript; with it, forms that stay on the page show the
 * same sentence). Only these codes are shown; anything else in `done` is ignored.
 */
export const OUTCOMES = {
	'review-safe': 'Review recorded: you signed this revision off as safe. The maker has been told.',
	'review-rework': 'Review recorded: you sent this revision back for changes. The maker has been told.',
	'review-asked': 'Review asked: your build is on the review desk. You get an e-mail when a reviewer records the outcome.',
	'review-asked-again': 'Review asked again: the current revision is back on the review desk.',
	'review-note': 'Your note for the reviewer is saved; the build keeps its place on the desk.',
	'tag-fixed': 'Hazard tag marked fixed. A reviewer will clear it or tag it again.',
	'tag-cleared': 'Hazard tag cleared. The maker has been told.',
	'tag-retagged': 'Hazard tag tagged again. The maker has been told.',
	'tag-message': 'Message added to the hazard tag. The other side has been told.',
	claimed: 'Claimed: other reviewers see that you are reviewing this build.',
	renewed: 'Claim renewed: it holds for another full period.',
	released: 'Claim released: any reviewer can take this build now.',
	following: 'Saved: the categories you follow for review desk mail.',
	watching: 'You watch this build now: you get an e-mail about its new comments, revisions, reviews and hazard tags.',
	unwatched: 'You stopped watching this build. No more e-mail about it (unless it is about your own comment or hazard tag).'
} as const;

export type Outcome = keyof typeof OUTCOMES;

/** The sentence for a `done` code, or null for anything that is not one of ours. */
export function outcomeText(code: string | null | undefined): string | null {
	return code && Object.hasOwn(OUTCOMES, code) ? OUTCOMES[code as Outcome] : null;
}

/** `path` with `?done=code` (or `&done=code`) added before any fragment. */
export function withOutcome(path: string, code: Outcome): string {
	const [base, hash] = path.split('#');
	return `${base}${base.includes('?') ? '&' : '?'}done=${code}${hash !== undefined ? `#${hash}` : ''}`;
}
