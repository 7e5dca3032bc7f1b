import { describe, expect, it } from 'vitest';
import { unit } from 'mathjs';
import { InputRangeError, decodeMarking, formatValue, parseValue } from './values';

describe('parseValue — trade notation', () => {
	// RKM code per IEC 60062 (REFERENCE.md §6.2: 4R7, 2n2, 5p6 as decimal-point letters); SI prefixes are standard.
	const cases: Array<[string, 'resistance' | 'capacitance' | 'inductance', number]> = [
		['4.7k', 'resistance', 4700],
		['4.7 kΩ', 'resistance', 4700],
		['100nF', 'capacitance', 100e-9],
		['0.47u', 'capacitance', 0.47e-6],
		['0.47µF', 'capacitance', 0.47e-6],
		['0.47μF', 'capacitance', 0.47e-6], // Greek mu (U+03BC) typed instead of the micro sign
		['10 ohm', 'resistance', 10],
		['4k7', 'resistance', 4700],
		['2R2', 'resistance', 2.2],
		['0R22', 'resistance', 0.22],
		['R47', 'resistance', 0.47],
		['100n', 'capacitance', 100e-9],
		['4u7', 'capacitance', 4.7e-6],
		['1M0', 'resistance', 1e6],
		['2n2', 'capacitance', 2.2e-9],
		['5p6', 'capacitance', 5.6e-12],
		['10R', 'resistance', 10],
		['1K5', 'resistance', 1500],
		['10uH', 'inductance', 10e-6],
		['2,2k', 'resistance', 2200]
	];
	for (const [text, kind, value] of cases)
		it(`reads ${text}`, () => {
			const r = parseValue(text);
			expect(r.kind).toBe(kind);
			expect(r.value).toBe(value);
			expect(r.unit).toBe(kind === 'resistance' ? 'ohm' : kind === 'capacitance' ? 'F' : 'H');
		});

	it('agrees with mathjs unit parsing (oracle)', () => {
		expect(parseValue('4.7 kΩ').value).toBeCloseTo(unit('4.7 kohm').toNumber('ohm'), 9);
		expect(parseValue('100nF').value).toBeCloseTo(unit('100 nF').toNumber('F'), 18);
		expect(parseValue('0.47uF').value).toBeCloseTo(unit('0.47 uF').toNumber('F'), 15);
		expect(parseValue('10mH').value).toBeCloseTo(unit('10 mH').toNumber('H'), 12);
		expect(parseValue('4.7mΩ').value).toBeCloseTo(unit('4.7 mohm').toNumber('ohm'), 12);
	});

	it('reads a plain number in the unit `as` names, and refuses to guess in auto', () => {
		expect(parseValue('100', 'resistance')).toEqual({ kind: 'resistance', value: 100, unit: 'ohm' });
		expect(parseValue('1e-6', 'capacitance').value).toBe(1e-6);
		expect(() => parseValue('100')).toThrow(RangeError);
	});

	it('refuses a value whose letter or unit contradicts `as`', () => {
		expect(() => parseValue('4k7', 'capacitance')).toThrow(/resistance/);
		expect(() => parseValue('100nF', 'resistance')).toThrow(/capacitance/);
		expect(parseValue('100n', 'inductance')).toMatchObject({ kind: 'inductance', value: 100e-9 });
	});

	it('treats a lower-case m without a unit as ambiguous in auto, milli with a unit or a kind', () => {
		expect(() => parseValue('1m')).toThrow(/ambiguous/);
		expect(parseValue('4m7', 'capacitance').value).toBe(4.7e-3);
		expect(parseValue('100 mΩ').value).toBe(0.1);
	});

	it('reads a tolerance tail', () => {
		expect(parseValue('4k7 5%')).toEqual({ kind: 'resistance', value: 4700, unit: 'ohm', tolerancePct: 5 });
		expect(parseValue('100nF ±10%').tolerancePct).toBe(10);
		expect(() => parseValue('4k75%')).toThrow(RangeError);
	});

	it('accepts a 0 Ω jumper but not a zero capacitance', () => {
		expect(parseValue('0R').value).toBe(0);
		expect(() => parseValue('0n')).toThrow(RangeError);
	});

	for (const bad of ['', '   ', 'abc', '4k7k', '-5k', 'k', '1.2.3k', '4x7'])
		it(`throws RangeError for ${JSON.stringify(bad)}`, () => {
			expect(() => parseValue(bad)).toThrow(RangeError);
		});

	it('round-trips formatValue output for random values (property)', () => {
		for (let i = 0; i < 500; i++) {
			const v = 10 ** (Math.random() * 15 - 3); // 1 mΩ … 1 TΩ
			const shown = formatValue(v, 'ohm');
			const back = parseValue(shown).value;
			const expected = Number(v.toPrecision(3));
			expect(Math.abs(back - expected) / expected).toBeLessThan(1e-9);
		}
	});
});

describe('decodeMarking — API.md decode rules', () => {
	// REFERENCE.md §12 case 9 (capacitor-code and potentiometer sources, §6.2–6.3).
	it('104 → 100 nF (bare 3 digits = capacitor in pF)', () => {
		expect(decodeMarking('104')).toEqual({ kind: 'capacitance', value: 100e-9, unit: 'F', display: '100 nF' });
	});
	it('473J → 47 nF ±5 %', () => {
		expect(decodeMarking('473J')).toEqual({ kind: 'capacitance', value: 47e-9, unit: 'F', tolerancePct: 5, display: '47 nF' });
	});
	it('229 → 2.2 pF (third digit 9 = ×0.1, from memory)', () => {
		expect(decodeMarking('229')).toMatchObject({ value: 2.2e-12, display: '2.2 pF' });
		expect(decodeMarking('478').value).toBeCloseTo(0.47e-12, 24); // 8 = ×0.01, from memory
	});
	it('B103 → 10 kΩ, letter B with a note that it is linear in the Asian/US convention', () => {
		const r = decodeMarking('B103');
		expect(r).toMatchObject({ kind: 'resistance', value: 10e3, unit: 'ohm', taper: 'B', display: '10 kΩ' });
		expect(r.taperNote).toMatch(/linear/);
		expect(r.taperNote).toMatch(/Asian\/US/);
	});
	it('A104 → 100 kΩ with a note that A is log in one convention and linear in another', () => {
		const r = decodeMarking('A104');
		expect(r).toMatchObject({ value: 100e3, taper: 'A' });
		expect(r.taperNote).toMatch(/logarithmic/);
		expect(r.taperNote).toMatch(/linear in older European usage/);
	});
	it('reads a potentiometer value written in RKM (B10K) and a bare code as potentiometer', () => {
		expect(decodeMarking('B10K')).toMatchObject({ value: 10e3, taper: 'B' });
		expect(decodeMarking('104', 'potentiometer')).toEqual({ kind: 'resistance', value: 100e3, unit: 'ohm', display: '100 kΩ' });
	});
	it('bare 4 digits → resistor in Ω (4702 = 47 kΩ)', () => {
		expect(decodeMarking('4702')).toMatchObject({ kind: 'resistance', value: 47e3, display: '47 kΩ' });
	});
	it('474K → 470 nF ±10 % (letter after ≥ 3 digits is a tolerance)', () => {
		expect(decodeMarking('474K')).toMatchObject({ value: 470e-9, tolerancePct: 10 });
	});
	it('47K → 47 kΩ: a letter after fewer than 3 digits is an RKM multiplier', () => {
		expect(decodeMarking('47K')).toMatchObject({ kind: 'resistance', value: 47e3 });
	});
	it('470K is 47 pF ±10 % in auto but 470 kΩ when read as a resistor', () => {
		expect(decodeMarking('470K')).toMatchObject({ kind: 'capacitance', value: 47e-12, tolerancePct: 10 });
		expect(decodeMarking('470K', 'resistor')).toMatchObject({ kind: 'resistance', value: 470e3 });
	});
	it('RKM letter decides the kind in auto', () => {
		expect(decodeMarking('4k7')).toMatchObject({ kind: 'resistance', value: 4700, display: '4.7 kΩ' });
		expect(decodeMarking('2R2')).toMatchObject({ kind: 'resistance', value: 2.2, display: '2.2 Ω' });
		expect(decodeMarking('100n')).toMatchObject({ kind: 'capacitance', value: 100e-9 });
		expect(decodeMarking('4u7')).toMatchObject({ kind: 'capacitance', value: 4.7e-6, display: '4.7 µF' });
		expect(decodeMarking('1M0')).toMatchObject({ kind: 'resistance', value: 1e6, display: '1 MΩ' });
		expect(decodeMarking('4K7J')).toMatchObject({ value: 4700, tolerancePct: 5 });
	});
	it('inductors: 3 digits in µH, R as the µH decimal point', () => {
		expect(decodeMarking('101', 'inductor')).toMatchObject({ kind: 'inductance', value: 100e-6, unit: 'H', display: '100 µH' });
		expect(decodeMarking('4R7', 'inductor')).toMatchObject({ value: 4.7e-6 });
		expect(decodeMarking('10uH')).toMatchObject({ kind: 'inductance', value: 10e-6 });
	});
	it('capacitors: R is the pF decimal point (4R7 = 4.7 pF); 2-digit markings are plain pF', () => {
		expect(decodeMarking('4R7', 'capacitor')).toMatchObject({ value: 4.7e-12, display: '4.7 pF' });
		expect(decodeMarking('47')).toMatchObject({ kind: 'capacitance', value: 47e-12 });
	});
	it('falls back to SI notation', () => {
		expect(decodeMarking('4.7 kΩ')).toMatchObject({ value: 4700 });
		expect(decodeMarking('0.47uF', 'capacitor')).toMatchObject({ value: 0.47e-6 });
	});
	for (const [code, as] of [
		['xyz', 'auto'],
		['', 'auto'],
		['104Z', 'auto'], // +80/−20 % is not a symmetric tolerance
		['4k7', 'capacitor'],
		['100n', 'resistor'],
		['4702', 'capacitor'],
		['1m0', 'auto'],
		['47J', 'auto'],
		['B104', 'capacitor']
	] as const)
		it(`throws RangeError for ${JSON.stringify(code)} as ${as}`, () => {
			expect(() => decodeMarking(code, as)).toThrow(RangeError);
		});
});

describe('formatValue', () => {
	it('3 significant figures, engineering prefix, one space (API.md examples)', () => {
		expect(formatValue(4700, 'ohm')).toBe('4.7 kΩ');
		expect(formatValue(100e-9, 'F')).toBe('100 nF');
		expect(formatValue(2.2e-12, 'F')).toBe('2.2 pF');
		expect(formatValue(470e-6, 'F')).toBe('470 µF');
		expect(formatValue(22.627, 'V')).toBe('22.6 V');
		expect(formatValue(12345, 'ohm')).toBe('12.3 kΩ');
	});
	it('uses U+00B5 for micro and U+03A9 for ohm', () => {
		expect(formatValue(1e-6, 'F').codePointAt(2)).toBe(0x00b5);
		expect(formatValue(1, 'ohm').codePointAt(2)).toBe(0x03a9);
	});
	it('carries rounding into the next prefix, handles zero and negatives', () => {
		expect(formatValue(999.7, 'ohm')).toBe('1 kΩ');
		expect(formatValue(0, 'F')).toBe('0 F');
		expect(formatValue(-0.0123, 'V')).toBe('-12.3 mV');
	});
	it('throws RangeError for non-finite input', () => {
		expect(() => formatValue(Number.NaN, 'ohm')).toThrow(RangeError);
	});
});

describe('InputRangeError', () => {
	it('is a RangeError that names its field', () => {
		const e = new InputRangeError('outputW', 'too big');
		expect(e).toBeInstanceOf(RangeError);
		expect(e.field).toBe('outputW');
	});
});
