import { describe, expect, it } from 'vitest';
import { formatDay, formatDayTime, isoOf } from './dates';

describe('formatDay / formatDayTime', () => {
	it('formats in UTC as day, short month, year (and 24-hour time)', () => {
		// Expected texts written out by hand from the ISO instants (UTC); months abbreviated to three letters.
		expect(formatDay('2026-03-04T23:59:00.000Z')).toBe('4 Mar 2026');
		expect(formatDay(new Date('2025-12-31T00:00:00Z'))).toBe('31 Dec 2025');
		expect(formatDay('2026-09-14T12:00:00Z')).toBe('14 Sep 2026');
		expect(formatDayTime('2026-03-04T14:05:00Z')).toBe('4 Mar 2026, 14:05 UTC');
		expect(formatDayTime('2026-06-01T09:03:59Z')).toBe('1 Jun 2026, 09:03 UTC');
	});
	it('gives nothing for no date or not a date', () => {
		expect(formatDay(null)).toBe('');
		expect(formatDay('not a date')).toBe('');
		expect(formatDayTime(undefined)).toBe('');
		expect(isoOf('not a date')).toBeUndefined();
		expect(isoOf('2026-03-04T14:05:00Z')).toBe('2026-03-04T14:05:00.000Z');
	});
});
