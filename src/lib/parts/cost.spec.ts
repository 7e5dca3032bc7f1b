import { describe, expect, it } from 'vitest';
import Decimal from 'decimal.js';
import { channelsOf, costTotals, formatMoney, lineCost, parseCurrency, parseFlag, parseUnitPrice, priceText, totalQuantity } from './cost';
import { emptyDraft, normaliseLine, type PartLineDraft } from './index';

const draft = (over: Partial<PartLineDraft>): PartLineDraft => ({ ...emptyDraft(), ...over });

describe('unit prices are exact', () => {
	it('stores the typed decimal exactly with 4 places; never a binary float', () => {
		expect(parseUnitPrice('0.1')).toBe('0.1000');
		expect(parseUnitPrice('1,50')).toBe('1.5000');
		expect(parseUnitPrice('0.0125')).toBe('0.0125');
		expect(parseUnitPrice('')).toBeNull();
		// 0.1 + 0.2 in binary floating point is 0.30000000000000004; the stored decimals add exactly.
		expect(0.1 + 0.2).not.toBe(0.3);
		expect(costTotals([line('0.1', 1), line('0.2', 1)], 1).totals[0].amount).toBe('0.3000');
	});

	it('refuses what is not a price with a sentence', () => {
		expect(() => parseUnitPrice('€1.20')).toThrow(/put the currency \(e\.g\. EUR\) in the currency column/);
		expect(() => parseUnitPrice('-1')).toThrow(/cannot be negative/);
		expect(() => parseUnitPrice('0.00001')).toThrow(/more than 4 decimal places/);
		expect(() => parseUnitPrice('1,000.50')).toThrow(/no thousands separators/);
		expect(() => parseUnitPrice('2000000')).toThrow(/above 1,000,000/);
	});

	it('shows a stored price without padding beyond two places', () => {
		expect(priceText('0.0120')).toBe('0.012');
		expect(priceText('1.5000')).toBe('1.50');
		expect(priceText('12.0000')).toBe('12.00');
		expect(priceText(null)).toBe('');
	});
});

describe('currencies', () => {
	it('takes ISO 4217 codes (checked against Intl), upper-cased', () => {
		expect(parseCurrency('eur')).toBe('EUR');
		expect(parseCurrency(' JPY ')).toBe('JPY');
		expect(() => parseCurrency('€')).toThrow(/three-letter ISO 4217 code/);
		expect(() => parseCurrency('XYZ')).toThrow(/ISO 4217/);
	});

	it('formats with the currency minor digits of ISO 4217 (JPY 0, EUR 2, KWD 3; from the standard’s table via Intl)', () => {
		expect(formatMoney('1234.5000', 'EUR')).toBe('EUR 1,234.50');
		expect(formatMoney('1200.0000', 'JPY')).toBe('JPY 1,200');
		expect(formatMoney('1.2000', 'KWD')).toBe('KWD 1.200');
		// A sub-cent price keeps its third place instead of rounding to 0.01.
		expect(formatMoney('0.0120', 'USD')).toBe('USD 0.012');
		// Beyond the float range of exact integers (2^53 ≈ 9.007e15) the decimal string is still printed exactly.
		expect(formatMoney('12345678901234567.1200', 'EUR')).toBe('EUR 12,345,678,901,234,567.12');
	});
});

function line(unitPrice: string | null, quantity: number, currency: string | null = 'EUR', perChannel = false) {
	return { quantity, perChannel, unitPrice: unitPrice === null ? null : parseUnitPrice(unitPrice), currency };
}

describe('channels and totals', () => {
	it('takes the channel count from the amplifier block (largest), else 1', () => {
		expect(channelsOf([])).toBe(1);
		expect(channelsOf([{ kind: 'supply', data: {} }, { kind: 'amplifier', data: { channels: 2 } }])).toBe(2);
		expect(channelsOf([{ kind: 'amplifier', data: { channels: 2 } }, { kind: 'amplifier', data: { channels: 6 } }])).toBe(6);
		expect(channelsOf([{ kind: 'amplifier', data: { channels: 'lots' } }])).toBe(1);
	});

	it('multiplies per-channel quantities only', () => {
		expect(totalQuantity({ quantity: 3, perChannel: true }, 2)).toBe(6);
		expect(totalQuantity({ quantity: 3, perChannel: false }, 2)).toBe(3);
		expect(lineCost(line('0.0125', 4, 'EUR', true), 2)).toBe('0.1000');
	});

	it('adds up one total per currency and never mixes currencies', () => {
		const lines = [line('0.0125', 4, 'EUR', true), line('2.50', 1, 'EUR'), line('1200', 1, 'JPY', true), line(null, 2), line(null, 0)];
		const t = costTotals(lines, 2);
		// Independent check with decimal.js: 0.0125 × 4 × 2 + 2.50 × 1 = 2.60 EUR; 1200 × 1 × 2 = 2400 JPY.
		const eur = new Decimal('0.0125').times(8).plus('2.5');
		expect(t.totals).toEqual([
			{ currency: 'EUR', amount: eur.toFixed(4), lines: 2 },
			{ currency: 'JPY', amount: '2400.0000', lines: 1 }
		]);
		expect(t.unpriced).toBe(1);
	});
});

describe('costed lines', () => {
	it('validates and normalises the costed fields', () => {
		const r = normaliseLine(draft({ designators: 'R1', value: '4k7', mpn: ' MF-4K7 ', supplier: 'Any shop', unitPrice: '0.05', currency: 'usd', perChannel: 'yes' }), 1);
		expect(r.errors).toEqual([]);
		expect(r.line).toMatchObject({ mpn: 'MF-4K7', supplier: 'Any shop', unitPrice: '0.0500', currency: 'USD', perChannel: true });
	});

	it('says what is wrong with a price, a currency or the flag, each on its field', () => {
		const r = normaliseLine(draft({ designators: 'R1', value: '4k7', unitPrice: '0.05', perChannel: 'maybe' }), 3);
		expect(r.errors).toEqual([
			{ line: 3, field: 'currency', message: 'a unit price needs its currency: add a three-letter code such as EUR or USD' },
			{ line: 3, field: 'perChannel', message: '"per channel" is yes or no, not "maybe"' }
		]);
		expect(parseFlag('x')).toBe(true);
		expect(parseFlag('')).toBe(false);
	});
});
