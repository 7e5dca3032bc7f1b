// The review words a person reads (PRODUCT.md §3): a sign-off or a send-back recorded against a lettered
// revision, "edited since" after later edits, and hazard tags tagged → fixed → cleared. The revision
// letters are checked by hand against the drawing convention (Rev A = revision 1, Rev B = 2; I and O are
// skipped, so revision 9 is Rev J — ASME Y14.35, from memory).
import { describe, expect, it } from 'vitest';
import { FLAG_STATES, REVIEW_LABEL_NAMES, computeLabel, reviewLabelText, verdictText } from './reviews';

const state = (verdict: 'safe' | 'rework' | null, verdictRevision: number | null, currentRevision: number, waiting = false) => ({
	label: computeLabel(verdict, verdictRevision, currentRevision, waiting),
	verdict,
	verdictRevision,
	waiting
});

describe('review words', () => {
	it('says sign-off and send-back with the lettered revision', () => {
		expect(reviewLabelText(state('safe', 2, 2))).toBe('Signed off as safe at Rev B');
		expect(reviewLabelText(state('rework', 1, 1))).toBe('Sent back for changes at Rev A');
		expect(reviewLabelText(state('safe', 9, 9))).toBe('Signed off as safe at Rev J');
	});

	it('says "edited since" once the build has a later revision, and keeps the revision the review belongs to', () => {
		expect(reviewLabelText(state('safe', 2, 3))).toBe('Edited since sign-off at Rev B');
		expect(reviewLabelText(state('rework', 1, 2, true))).toBe('Edited since send-back at Rev A · waiting for review');
	});

	it('has plain words before any review', () => {
		expect(reviewLabelText(state(null, null, 1))).toBe('Not reviewed');
		expect(reviewLabelText(state(null, null, 1, true))).toBe('Waiting for review');
	});

	it('names a review pinned to its revision', () => {
		expect(verdictText('safe', 3)).toBe('Signed off as safe at Rev C');
		expect(verdictText('rework', 2)).toBe('Sent back for changes at Rev B');
	});

	it('uses none of the code-host words in labels a person reads', () => {
		const shown = [...Object.values(REVIEW_LABEL_NAMES), ...Object.values(FLAG_STATES), reviewLabelText(state('safe', 1, 2))].join(' ');
		expect(shown).not.toMatch(/verdict|approv|changes requested|changed since|\bopen\b|resolved|reopen|\br\d/i);
		expect(Object.values(FLAG_STATES)).toEqual(['Tagged', 'Fixed', 'Cleared']);
	});
});
