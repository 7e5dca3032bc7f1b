import { describe, expect, it } from 'vitest';
import { bandsFromValue, valueFromBands } from './bands';
import { eSeriesMantissas } from './eseries';
import { InputRangeError } from './values';

describe('valueFromBands (IEC 60062)', () => {
	// REFERENCE.md §6.1 worked examples / §12 case 9; IEC 60062 colour charts.
	it('yellow-violet-red-gold → 4.7 kΩ ±5 %, not reversible (gold is no digit)', () => {
		expect(valueFromBands(['yellow', 'violet', 'red', 'gold'])).toEqual({ valueOhm: 4700, tolerancePct: 5 });
	});
	it('brown-black-black-red-brown → 10.0 kΩ ±1 %, and back to front 120 Ω ±1 %', () => {
		expect(valueFromBands(['brown', 'black', 'black', 'red', 'brown'])).toEqual({
			valueOhm: 10000,
			tolerancePct: 1,
			reversed: { valueOhm: 120, tolerancePct: 1 }
		});
	});
	it('yellow-violet-gold-gold → 4.7 Ω ±5 %; silver multiplier ×0.01', () => {
		expect(valueFromBands(['yellow', 'violet', 'gold', 'gold'])).toEqual({ valueOhm: 4.7, tolerancePct: 5 });
		expect(valueFromBands(['red', 'red', 'silver', 'silver']).valueOhm).toBe(0.22);
	});
	it('3 bands have no tolerance band → ±20 %', () => {
		expect(valueFromBands(['red', 'red', 'brown'])).toMatchObject({ valueOhm: 220, tolerancePct: 20 });
	});
	it('brown-black-orange-gold → 10 kΩ ±5 % (API.md example)', () => {
		expect(valueFromBands(['brown', 'black', 'orange', 'gold'])).toMatchObject({ valueOhm: 10000, tolerancePct: 5 });
	});
	it('grey, orange and yellow tolerance bands are flagged as ambiguous (charts disagree)', () => {
		expect(valueFromBands(['brown', 'black', 'black', 'red', 'grey']).ambiguous).toMatch(/grey/);
		expect(valueFromBands(['brown', 'black', 'black', 'red', 'orange']).ambiguous).toMatch(/orange/);
		expect(valueFromBands(['brown', 'black', 'black', 'red', 'brown']).ambiguous).toBeUndefined();
	});
	it('6 bands add the temperature coefficient (brown = 100 ppm/K)', () => {
		expect(valueFromBands(['brown', 'black', 'black', 'red', 'brown', 'brown'])).toMatchObject({
			valueOhm: 10000,
			tolerancePct: 1,
			tempcoPpmPerK: 100
		});
	});
	it('accepts Gray/Purple spellings and capitals', () => {
		expect(valueFromBands(['Gray', 'purple', 'BROWN', 'gold']).valueOhm).toBe(870);
	});
	it('throws RangeError naming the bad band', () => {
		const cases: Array<[string[], string]> = [
			[['black', 'violet', 'red', 'gold'], 'colors.0'],
			[['gold', 'violet', 'red', 'gold'], 'colors.0'],
			[['yellow', 'violet', 'red', 'white'], 'colors.3'],
			[['yellow', 'violet', 'red', 'chartreuse'], 'colors.3'],
			[['yellow', 'violet'], 'colors']
		];
		for (const [colors, field] of cases) {
			let err: unknown;
			try {
				valueFromBands(colors);
			} catch (e) {
				err = e;
			}
			expect(err).toBeInstanceOf(InputRangeError);
			expect((err as InputRangeError).field).toBe(field);
		}
	});
});

describe('bandsFromValue (IEC 60062)', () => {
	it('4.7 kΩ → yellow violet red gold (default 4 bands, 5 %)', () => {
		expect(bandsFromValue(4700)).toEqual(['yellow', 'violet', 'red', 'gold']);
	});
	it('10 kΩ 1 % 5-band → brown black black red brown; 5-band defaults to 1 %', () => {
		expect(bandsFromValue(10000, 1, 5)).toEqual(['brown', 'black', 'black', 'red', 'brown']);
		expect(bandsFromValue(10000, undefined, 5)).toEqual(['brown', 'black', 'black', 'red', 'brown']);
	});
	it('4.7 Ω → gold multiplier; 0.47 Ω → silver; 1 Ω → brown black gold', () => {
		expect(bandsFromValue(4.7)).toEqual(['yellow', 'violet', 'gold', 'gold']);
		expect(bandsFromValue(0.47)).toEqual(['yellow', 'violet', 'silver', 'gold']);
		expect(bandsFromValue(1)).toEqual(['brown', 'black', 'gold', 'gold']);
	});
	it('3 bands → no tolerance band (±20 %)', () => {
		expect(bandsFromValue(220, undefined, 3)).toEqual(['red', 'red', 'brown']);
		expect(bandsFromValue(220, 20, 3)).toEqual(['red', 'red', 'brown']);
	});
	it('throws at valueOhm for a value the count cannot encode, at tolerancePct for a tolerance without a colour', () => {
		const field = (f: () => unknown) => {
			try {
				f();
			} catch (e) {
				return e instanceof InputRangeError ? e.field : 'not an InputRangeError';
			}
			return 'no error';
		};
		expect(field(() => bandsFromValue(4750))).toBe('valueOhm'); // needs 3 significant figures
		expect(bandsFromValue(4750, 1, 5)).toEqual(['yellow', 'violet', 'green', 'brown', 'brown']);
		expect(field(() => bandsFromValue(0.047))).toBe('valueOhm'); // below silver
		expect(field(() => bandsFromValue(1e12))).toBe('valueOhm'); // above white
		expect(field(() => bandsFromValue(0))).toBe('valueOhm');
		expect(field(() => bandsFromValue(4700, 20, 4))).toBe('tolerancePct');
		expect(field(() => bandsFromValue(4700, 3))).toBe('tolerancePct');
		expect(field(() => bandsFromValue(220, 5, 3))).toBe('tolerancePct');
	});
	it('property: E24 values round-trip through 4 bands and E96 values through 5 bands', () => {
		for (const m of eSeriesMantissas('E24'))
			for (let k = -1; k <= 8; k++) {
				const v = Number((m * 10 ** k).toPrecision(2));
				const r = valueFromBands(bandsFromValue(v, 5, 4));
				expect(r.valueOhm).toBe(v);
				expect(r.tolerancePct).toBe(5);
			}
		for (const m of eSeriesMantissas('E96'))
			for (let k = 0; k <= 6; k++) {
				const v = Number((m * 10 ** k).toPrecision(3));
				const r = valueFromBands(bandsFromValue(v, 0.5, 5));
				expect(r.valueOhm).toBe(v);
				expect(r.tolerancePct).toBe(0.5);
			}
	});
});
