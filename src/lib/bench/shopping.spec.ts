import { describe, it, expect } from 'vitest';
import Papa from 'papaparse';
import { combineShopping, shoppingKey, type ShoppingLine } from './shopping';
import { parsePartValue } from '$lib/parts/values';

const line = (over: Partial<ShoppingLine>): ShoppingLine => ({
	kind: 'resistor',
	quantity: 1,
	valueText: '',
	value: null,
	unit: null,
	ratingV: null,
	ratingW: null,
	package: '',
	designators: '',
	...over
});
/** A resistor line as the parts module stores it: the typed text and its SI reading (IEC 60062 RKM code for "4k7"). */
const res = (text: string, quantity: number, over: Partial<ShoppingLine> = {}) =>
	line({ valueText: text, value: parsePartValue(text, 'resistance').value, unit: 'ohm', quantity, ...over });

describe('combineShopping', () => {
	it('sums 4k7 and 4.7k (one value in IEC 60062 RKM and SI notation) across builds', () => {
		const rows = combineShopping([
			{ title: 'Amp', lines: [res('4k7', 2, { designators: 'R1, R2', ratingW: 0.25, package: 'axial' }), res('0R22', 2, { ratingW: 5 })] },
			{ title: 'Supply', lines: [res('4.7k', 3, { designators: 'R9', ratingW: 0.25, package: 'Axial' }), res('4700', 1, { ratingW: 2 })] }
		]);
		const quarterWatt = rows.find((r) => r.valueSI === 4700 && r.ratingW === 0.25)!;
		expect(quarterWatt.quantity).toBe(5);
		expect(quarterWatt.value).toBe('4.70 kΩ');
		expect(quarterWatt.packages).toEqual(['axial']);
		expect(quarterWatt.uses).toEqual([
			{ build: 'Amp', designators: 'R1, R2', quantity: 2 },
			{ build: 'Supply', designators: 'R9', quantity: 3 }
		]);
		// Another power rating is another purchase: 4.7 kΩ 2 W stays its own row.
		expect(rows.filter((r) => r.valueSI === 4700).map((r) => [r.ratingW, r.quantity])).toEqual([
			[0.25, 5],
			[2, 1]
		]);
		// Resistors sort by value: 0.22 Ω before 4.7 kΩ.
		expect(rows[0].valueSI).toBeCloseTo(0.22, 12);
	});

	it('keeps kinds apart and matches text values ignoring case and spacing', () => {
		const rows = combineShopping([
			{ title: 'A', lines: [line({ kind: 'ic', valueText: '5-pin power amplifier IC', quantity: 2 }), line({ kind: 'capacitor', valueText: '100n', value: 1e-7, unit: 'F', quantity: 4 })] },
			{ title: 'B', lines: [line({ kind: 'ic', valueText: '5-pin  POWER amplifier ic', quantity: 1 }), line({ kind: 'resistor', valueText: '100n', value: null, quantity: 1 })] }
		]);
		expect(rows.map((r) => [r.kind, r.quantity])).toEqual([
			['resistor', 1],
			['capacitor', 4],
			['ic', 3]
		]);
		expect(shoppingKey(line({ value: 0.22, unit: 'ohm' }))).toBe(shoppingKey(line({ value: 220 * 0.001, unit: 'ohm' })));
	});
});

describe('shopping CSV (RFC 4180, checked with papaparse as an independent reader)', () => {
	it('round-trips through a CSV parser, quotes commas and quotes, neutralises formulas', async () => {
		const { shoppingCsv } = await import('$lib/server/bench');
		const rows = combineShopping([{ title: 'Amp, "v2"', lines: [res('4k7', 2, { designators: '=SUM(A1)', package: '+axial' })] }]);
		const csv = shoppingCsv(rows);
		expect(csv.endsWith('\r\n')).toBe(true);
		const parsed = Papa.parse<string[]>(csv.trimEnd(), { newline: '\r\n' });
		expect(parsed.errors).toEqual([]);
		expect(parsed.data[0]).toEqual(['kind', 'value', 'value_si', 'unit', 'rating_v', 'rating_w', 'quantity', 'packages', 'used_in']);
		expect(parsed.data[1]).toEqual(['resistor', '4.70 kΩ', '4700', 'ohm', '', '', '2', "'+axial", 'Amp, "v2": =SUM(A1)']);
	});
});
