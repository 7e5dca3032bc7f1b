import { describe, expect, it } from 'vitest';
import { shortDate } from './card';

describe('shortDate', () => {
	it('formats in UTC as day, short month, year', () => {
		expect(shortDate('2026-03-04T23:59:00.000Z')).toBe('4 Mar 2026');
		expect(shortDate('2025-12-31T00:00:00Z')).toBe('31 Dec 2025');
		expect(shortDate(null)).toBe('');
		expect(shortDate('not a date')).toBe('');
	});
});
