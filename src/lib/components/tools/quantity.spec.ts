import { describe, expect, it } from 'vitest';
import { InputRangeError } from '$lib/engineering';
import { attempt, fieldError, parsePlain, readQuantity } from './quantity';

describe('parsePlain', () => {
	it('reads plain numbers with or without their unit', () => {
		expect(parsePlain('35', 'V')).toBe(35);
		expect(parsePlain(' 35 V ', 'V')).toBe(35);
		expect(parsePlain('0,8', 'V')).toBe(0.8);
		expect(parsePlain('-10', '°C')).toBe(-10);
		expect(parsePlain('40 °C', '°C')).toBe(40);
		expect(parsePlain('1.2 °C/W', 'K/W')).toBe(1.2);
		expect(parsePlain('1e3', 'W')).toBe(1000);
	});
	it('takes SI prefixes where the unit does', () => {
		expect(parsePlain('300m', 'A')).toBe(0.3);
		expect(parsePlain('300 mA', 'A')).toBe(0.3);
		expect(parsePlain('20k', 'Hz')).toBe(20000);
		expect(parsePlain('1.5 kW', 'W')).toBe(1500);
	});
	it('refuses what it cannot read, with a sentence', () => {
		expect(() => parsePlain('', 'V')).toThrow(/Enter a value/);
		expect(() => parsePlain('abc', 'V')).toThrow(/Cannot read "abc"/);
		expect(() => parsePlain('35 A', 'V')).toThrow(RangeError);
		expect(() => parsePlain('40k', '°C')).toThrow(/plain number/);
	});
});

describe('readQuantity', () => {
	it('reads component values in the trade notation', () => {
		expect(readQuantity('4k7', { kind: 'resistance' })).toEqual({ ok: true, value: 4700 });
		expect(readQuantity('0R22', { kind: 'resistance' })).toEqual({ ok: true, value: 0.22 });
		expect(readQuantity('100n', { kind: 'capacitance' })).toEqual({ ok: true, value: 1e-7 });
		expect(readQuantity('10000u', { kind: 'capacitance' })).toEqual({ ok: true, value: 0.01 });
		expect(readQuantity('8', { kind: 'resistance' })).toEqual({ ok: true, value: 8 });
	});
	it('answers undecodable text with an error and examples, never a throw', () => {
		const r = readQuantity('4x7', { kind: 'resistance' });
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.error).toMatch(/4k7/);
		const c = readQuantity('4k7', { kind: 'capacitance' });
		expect(c.ok).toBe(false);
		if (!c.ok) expect(c.error).toMatch(/100n/);
		expect(readQuantity('0', { kind: 'resistance' }).ok).toBe(false);
	});
	it('applies the field range', () => {
		expect(readQuantity('0', { kind: 'plain', unit: 'V', min: 0, minExclusive: true })).toEqual({ ok: false, error: 'Must be more than 0 V.' });
		expect(readQuantity('120', { kind: 'plain', unit: '%', min: 0, max: 100 })).toEqual({ ok: false, error: 'Must be at most 100 %.' });
		expect(readQuantity('2.5', { kind: 'plain', unit: '', integer: true }).ok).toBe(false);
		expect(readQuantity('25', { kind: 'plain', unit: 'V', min: 0 })).toEqual({ ok: true, value: 25 });
	});
});

describe('attempt and fieldError', () => {
	it('catches a library error and keeps the field it names', () => {
		const r = attempt(() => {
			throw new InputRangeError('outputW', 'outputW (80 W) is above the 64 W these rails can give');
		});
		expect(r).toEqual({ ok: false, field: 'outputW', error: 'outputW (80 W) is above the 64 W these rails can give' });
		expect(fieldError(r, 'outputW', 'the output power')).toBe('The output power (80 W) is above the 64 W these rails can give');
		expect(fieldError(r, 'railV', 'the rail')).toBeUndefined();
		const two = attempt(() => {
			throw new InputRangeError('capacitanceF', 'capacitanceF is far too small for loadCurrentA');
		});
		expect(fieldError(two, 'capacitanceF', { capacitanceF: 'the reservoir', loadCurrentA: 'the load current' })).toBe(
			'The reservoir is far too small for the load current'
		);
	});
	it('passes results through', () => {
		const r = attempt(() => 42);
		expect(r).toEqual({ ok: true, value: 42 });
		expect(fieldError(r, 'x', 'x')).toBeUndefined();
		expect(attempt(() => JSON.parse('{'))).toMatchObject({ ok: false });
	});
});
