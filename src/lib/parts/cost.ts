/**
 * The costed parts list: unit prices held exactly (decimal text, never a binary float; decimal.js does the
 * arithmetic), ISO 4217 currencies checked against the runtime's Intl list, the build's channel count and a
 * cost total per currency — different currencies are never added together. Pure; runs in the browser too.
 *
 * Which lines are per channel: each line has a "per channel" flag (part_line.per_channel). A per-channel line's
 * quantity is what ONE channel needs; the list's total count for it is quantity × the build's channel count.
 * Lines without the flag (the supply, the case, shared hardware) count once. The channel count is the
 * `channels` of the build's amplifier spec block (the largest, if there are several), else 1.
 */
import Decimal from 'decimal.js';
import { channelsOf, totalQuantity } from './channels';

/** The channel count and per-channel quantities, kept in ./channels (no decimal.js there, for pages that show a list without prices). */
export { channelsOf, totalQuantity };

/** Largest unit price accepted, in any currency. */
export const MAX_UNIT_PRICE = 1_000_000;
/** Decimal places a unit price may have (the database column is numeric(14,4)). */
export const PRICE_DECIMALS = 4;

/**
 * Read a unit price as typed: "0.012", "1,50", "12" → the exact decimal with 4 places as stored ("0.0120",
 * "1.5000", "12.0000"). Blank → null. Throws RangeError with a sentence for anything else (a currency sign, a
 * negative price, more than 4 decimals, above MAX_UNIT_PRICE).
 */
export function parseUnitPrice(text: string): string | null {
	const t = (text ?? '').trim();
	if (t === '') return null;
	if (/[^\d.,\s]/.test(t) && /[\p{Sc}a-z]/iu.test(t))
		throw new RangeError(`unit price "${t}" must be a plain number such as 0.12; put the currency (e.g. EUR) in the currency column`);
	if (t.startsWith('-')) throw new RangeError(`unit price "${t}" cannot be negative`);
	const m = /^(\d{1,9})(?:[.,](\d+))?$/.exec(t);
	if (!m) throw new RangeError(`unit price "${t}" must be a number such as 0.12 or 1,50 (no thousands separators)`);
	if ((m[2] ?? '').length > PRICE_DECIMALS)
		throw new RangeError(`unit price "${t}" has more than ${PRICE_DECIMALS} decimal places`);
	const d = new Decimal(`${m[1]}.${m[2] ?? '0'}`);
	if (d.greaterThan(MAX_UNIT_PRICE)) throw new RangeError(`unit price "${t}" is above ${MAX_UNIT_PRICE.toLocaleString('en')}`);
	return d.toFixed(PRICE_DECIMALS);
}

/** A stored price for the editor and the CSV: trailing zeros beyond 2 places dropped ("0.0120" → "0.012", "1.5000" → "1.50"). */
export function priceText(stored: string | null | undefined): string {
	if (stored === null || stored === undefined || stored === '') return '';
	const d = new Decimal(stored);
	const places = Math.max(2, d.decimalPlaces());
	return d.toFixed(Math.min(places, PRICE_DECIMALS));
}

let currencies: Set<string> | null = null;
/** Whether `code` is an ISO 4217 currency code the runtime knows (Intl.supportedValuesOf). */
export function isCurrency(code: string): boolean {
	currencies ??= new Set(Intl.supportedValuesOf('currency'));
	return currencies.has(code);
}

/** Read a currency code: "eur" → "EUR"; blank → null; RangeError with a sentence when not an ISO 4217 code. */
export function parseCurrency(text: string): string | null {
	const t = (text ?? '').trim();
	if (t === '') return null;
	const code = t.toUpperCase();
	if (!/^[A-Z]{3}$/.test(code) || !isCurrency(code))
		throw new RangeError(`currency "${t}" must be a three-letter ISO 4217 code such as EUR, USD or GBP`);
	return code;
}

/** Read the per-channel flag as typed or as found in a CSV: yes/y/true/1/x/per channel → true; blank/no/false/0 → false; null when unreadable. */
export function parseFlag(text: string): boolean | null {
	const t = (text ?? '').trim().toLowerCase();
	if (['', 'no', 'n', 'false', '0', 'off'].includes(t)) return false;
	if (['yes', 'y', 'true', '1', 'x', 'on', 'per channel', 'channel'].includes(t)) return true;
	return null;
}

/** The fields of a line the costing reads. */
export interface CostLine {
	quantity: number;
	perChannel: boolean;
	unitPrice: string | null;
	currency: string | null;
}

/** A line's cost (unit price × total quantity) as an exact decimal string, or null without a price. */
export function lineCost(line: CostLine, channels: number): string | null {
	if (line.unitPrice === null || line.unitPrice === '' || !line.currency) return null;
	return new Decimal(line.unitPrice).times(totalQuantity(line, channels)).toFixed(PRICE_DECIMALS);
}

/** The cost of a list: one exact total per currency (in order of first appearance) and how many lines have no price. */
export interface CostTotals {
	totals: { currency: string; amount: string; lines: number }[];
	unpriced: number;
}

/**
 * Add up a list per currency. costTotals([{ quantity: 2, perChannel: true, unitPrice: '0.1000', currency: 'EUR' }], 2)
 * → { totals: [{ currency: 'EUR', amount: '0.4000', lines: 1 }], unpriced: 0 }. Lines with quantity 0 (not fitted)
 * cost nothing and do not count as unpriced.
 */
export function costTotals(lines: readonly CostLine[], channels: number): CostTotals {
	const by = new Map<string, { amount: Decimal; lines: number }>();
	let unpriced = 0;
	for (const l of lines) {
		const cost = lineCost(l, channels);
		if (cost === null) {
			if (l.quantity > 0) unpriced += 1;
			continue;
		}
		const cur = by.get(l.currency!) ?? { amount: new Decimal(0), lines: 0 };
		by.set(l.currency!, { amount: cur.amount.plus(cost), lines: cur.lines + 1 });
	}
	return { totals: [...by].map(([currency, t]) => ({ currency, amount: t.amount.toFixed(PRICE_DECIMALS), lines: t.lines })), unpriced };
}

/**
 * An exact amount for display in its currency: the currency's own minor digits (Intl), more when the amount
 * has them (a 0.012 resistor keeps its third place). formatMoney('1234.5000', 'EUR') → "EUR 1,234.50";
 * formatMoney('0.0120', 'USD') → "USD 0.012". The code, not a symbol: "$" is several currencies.
 */
export function formatMoney(amount: string, currency: string): string {
	const d = new Decimal(amount);
	let minor = 2;
	try {
		minor = new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
	} catch {
		/* an unknown code keeps 2 */
	}
	const places = Math.min(PRICE_DECIMALS, Math.max(minor, d.decimalPlaces()));
	const n = new Intl.NumberFormat('en', { minimumFractionDigits: places, maximumFractionDigits: places, useGrouping: true });
	// format() takes a decimal string exactly (Intl.NumberFormat v3), so no binary rounding creeps in.
	return `${currency} ${n.format(d.toFixed(places) as unknown as number)}`;
}
