// The trade's other notations. Expected values worked out by hand below, from these sources:
// - EIA three-digit capacitor code: two significant digits and a power-of-ten multiplier in pF, then the
//   IEC 60062 tolerance letter (F ±1 %, G ±2 %, J ±5 %, K ±10 %, M ±20 %): 104 = 10 × 10⁴ pF = 100 nF,
//   472 = 47 × 10² pF = 4.7 nF, 473 = 47 nF.
// - Capacitor voltage codes (EIA-198 / JIS C 5101-1 style tables; from memory): the digit is the power of
//   ten and the letter the significand: 0J 6.3 V, 1A 10 V, 1C 16 V, 1E 25 V, 1V 35 V, 1H 50 V, 1J 63 V,
//   2A 100 V, 2D 200 V, 2E 250 V, 2G 400 V, 2W 450 V, 2J 630 V, 3A 1000 V.
// - Series and parallel capacitors (any circuits textbook): parallel adds, series is 1/(1/C1 + 1/C2):
//   two 1 µF in series = 0.5 µF, in parallel = 2 µF.
import { describe, expect, it } from 'vitest';
import { decodeCapacitorCode, decodeVoltageCodedMarking, expandCount, voltageCodeV } from './trade-notation';
import { parsePartValue } from '$lib/parts';

describe('counts of equal parts', () => {
	it('reads 2×10000u, 2 x 4700u and 3*10k as parallel banks, and says series when written', () => {
		expect(expandCount('2×10000u')).toEqual({ text: '10000u||10000u', count: 2, arrangement: 'parallel' });
		expect(expandCount('2 x 4700u')).toEqual({ text: '4700u||4700u', count: 2, arrangement: 'parallel' });
		expect(expandCount('3*10k')?.text).toBe('10k||10k||10k');
		expect(expandCount('2×1u series')).toEqual({ text: '1u+1u', count: 2, arrangement: 'series' });
		expect(expandCount('2×1u parallel')?.text).toBe('1u||1u');
		expect(expandCount('4k7')).toBeNull();
		expect(() => expandCount('1×10u')).toThrow(/between 2 and 50/);
		expect(() => expandCount('99×10u')).toThrow(/between 2 and 50/);
	});

	it('gives the network value through the parts parser (hand calculation above)', () => {
		expect(parsePartValue('2×10000u', 'capacitance')).toMatchObject({ value: 0.02, parts: 2, arrangement: 'parallel' });
		expect(parsePartValue('2 x 4700u/35V', 'capacitance')).toMatchObject({ value: 0.0094, parts: 2, ratingV: 35 });
		expect(parsePartValue('2×1u series', 'capacitance').value).toBeCloseTo(5e-7, 15);
		expect(parsePartValue('2×1u parallel', 'capacitance').value).toBeCloseTo(2e-6, 15);
		expect(parsePartValue('1u||1u', 'capacitance').value).toBeCloseTo(2e-6, 15);
		// 2 × 0R22 in parallel = 0.11 Ω.
		expect(parsePartValue('2×0R22', 'resistance').value).toBeCloseTo(0.11, 12);
	});
});

describe('capacitor markings with tolerance and voltage', () => {
	it('reads voltage codes', () => {
		const table: [string, number][] = [['0J', 6.3], ['1A', 10], ['1C', 16], ['1E', 25], ['1V', 35], ['1H', 50], ['1J', 63], ['2A', 100], ['2D', 200], ['2E', 250], ['2G', 400], ['2W', 450], ['2J', 630], ['3A', 1000]];
		for (const [code, v] of table) expect(voltageCodeV(code), code).toBe(v);
		expect(voltageCodeV('2I')).toBeNull();
		expect(voltageCodeV('5A')).toBeNull();
	});

	it('decodes 2A104J and 1H473, and says why 2I104J cannot be read', () => {
		const m = decodeVoltageCodedMarking('2A104J');
		expect(m).toMatchObject({ ratingV: 100, tolerancePct: 5, display: '100 nF ±5 % 100 V' });
		expect(m!.value).toBeCloseTo(1e-7, 18);
		expect(decodeVoltageCodedMarking('1H473')).toMatchObject({ ratingV: 50, value: 4.7e-8 });
		expect(() => decodeVoltageCodedMarking('2I104J')).toThrow(/"2I" is not a capacitor voltage code/);
		expect(decodeVoltageCodedMarking('104')).toBeNull();
	});

	it('reads 472J 100V in a capacitor value field: 4.7 nF ±5 %, rated 100 V', () => {
		expect(decodeCapacitorCode('472J')).toEqual({ value: 4.7e-9, tolerancePct: 5 });
		expect(decodeCapacitorCode('104')).toBeNull();
		const p = parsePartValue('472J 100V', 'capacitance');
		expect(p).toMatchObject({ unit: 'F', ratingV: 100, tolerancePct: 5, parts: 1 });
		expect(p.value).toBeCloseTo(4.7e-9, 20);
		expect(parsePartValue('2A104J', 'capacitance')).toMatchObject({ ratingV: 100, tolerancePct: 5 });
		// A voltage written out wins over the code's.
		expect(parsePartValue('2A104J 250V', 'capacitance').ratingV).toBe(250);
	});
});

