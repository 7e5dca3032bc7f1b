import { describe, expect, it } from 'vitest';
import { revisionLabel, revisionLetter } from './revision-label';

// Drawing revision letters: ASME Y14.35 (from memory) skips I, O, Q, S, X, Z; after the last
// single letter the sequence continues with two letters, AA, AB, …
describe('revisionLetter', () => {
	it('letters the first revisions A, B, C', () => {
		expect([1, 2, 3].map(revisionLetter)).toEqual(['A', 'B', 'C']);
	});
	it('skips I, O, Q, S, X and Z', () => {
		const first20 = Array.from({ length: 20 }, (_, i) => revisionLetter(i + 1)).join('');
		expect(first20).toBe('ABCDEFGHJKLMNPRTUVWY');
		for (const banned of 'IOQSXZ') expect(first20).not.toContain(banned);
	});
	it('continues with two letters after Y', () => {
		expect(revisionLetter(21)).toBe('AA');
		expect(revisionLetter(22)).toBe('AB');
		expect(revisionLetter(40)).toBe('AY');
		expect(revisionLetter(41)).toBe('BA');
	});
	it('refuses revision 0 and fractions', () => {
		expect(() => revisionLetter(0)).toThrow(RangeError);
		expect(() => revisionLetter(1.5)).toThrow(RangeError);
	});
	it('labels as drawings do', () => {
		expect(revisionLabel(2)).toBe('Rev B');
	});
});
