// Check levels as safety-sign signal words: ANSI Z535.4 / ISO 3864-2 use DANGER (hazard that will cause
// death or serious injury), WARNING, CAUTION (minor or moderate injury) and NOTICE (practices not related
// to personal injury). Our API levels danger / caution / note map to DANGER / CAUTION / NOTICE (from memory).
import { describe, expect, it } from 'vitest';
import { signCounts, signLevel, signalWord } from './signs';

describe('safety-sign words', () => {
	it('maps the API levels to the standard signal words', () => {
		expect(signalWord('danger')).toBe('DANGER');
		expect(signalWord('caution')).toBe('CAUTION');
		expect(signalWord('note')).toBe('NOTICE');
		expect(signalWord('something-new')).toBe('NOTICE');
		expect(signLevel('unknown')).toBe('note');
	});

	it('counts most serious first and leaves out zeros', () => {
		expect(signCounts({ danger: 1, caution: 2, note: 0 })).toBe('1 DANGER · 2 CAUTION');
		expect(signCounts({ danger: 0, caution: 0, note: 3 })).toBe('3 NOTICE');
		expect(signCounts({ danger: 0, caution: 0, note: 0 })).toBe('');
	});
});
