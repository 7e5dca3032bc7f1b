import { describe, expect, it } from 'vitest';
import { isUuid } from './uuid';

describe('isUuid', () => {
	it('checks UUIDs before they reach a uuid column', () => {
		// RFC 9562 §4 text form: 8-4-4-4-12 hexadecimal digits.
		expect(isUuid('5d1df01b-f98e-473a-96e0-c2407da0b477')).toBe(true);
		expect(isUuid('5D1DF01B-F98E-473A-96E0-C2407DA0B477')).toBe(true);
		expect(isUuid('5d1df01b')).toBe(false);
		expect(isUuid("x' or 1=1")).toBe(false);
		expect(isUuid('5d1df01b-f98e-473a-96e0-c2407da0b477\n')).toBe(false);
		expect(isUuid(null)).toBe(false);
	});
});
