/**
 * The bench's combined shopping list: the parts lines of several builds summed into one list, a row per kind,
 * value, voltage rating and power rating. Values compare by their SI reading (the parts module's normalised
 * value), so "4k7" and "4.7k" are one row; kinds without an SI value compare by their text, ignoring case and
 * spacing. Pure (the server reads the lines, the page and the CSV show what this returns).
 */
import { formatPartValue } from '$lib/parts/values';
import { PART_KIND_LABELS, PART_KINDS, type PartKind } from '$lib/parts/kinds';
import type { PartLineFields } from '$lib/parts/lines';

/** The fields of a parts line the list reads. */
export type ShoppingLine = Pick<PartLineFields, 'kind' | 'quantity' | 'valueText' | 'value' | 'unit' | 'ratingV' | 'ratingW' | 'package' | 'designators'>;

export interface ShoppingRow {
	key: string;
	kind: string;
	kindLabel: string;
	/** The value as shown: SI with prefix when it has one ("4.7 kΩ"), else as first typed. */
	value: string;
	valueSI: number | null;
	unit: string | null;
	ratingV: number | null;
	ratingW: number | null;
	quantity: number;
	/** Packages seen on the summed lines ("axial, TO-220"). */
	packages: string[];
	/** Per build: its title and the designators it needs ("Quiet amp: R1, R2"). */
	uses: { build: string; designators: string; quantity: number }[];
}

const textKey = (t: string) => t.trim().replace(/\s+/g, ' ').toLowerCase();
/** 12 significant digits: 4700 and 4.7e3 (and 0.22 vs 0.22000000000000003) are one key. */
const siKey = (v: number) => Number(v.toPrecision(12)).toString();

/** The row a line sums into. */
export function shoppingKey(l: ShoppingLine): string {
	const value = l.value !== null && l.value !== undefined ? `${siKey(l.value)}${l.unit ?? ''}` : `t:${textKey(l.valueText)}`;
	return [l.kind, value, l.ratingV ?? '', l.ratingW ?? ''].join('|');
}

/**
 * Sum the lines of several builds. combineShopping([{ title: 'A', lines: [4k7 ×2] }, { title: 'B', lines: [4.7k ×3] }])
 * → one row, quantity 5, uses A ×2 and B ×3. Rows in kind order (resistors first), then by value.
 */
export function combineShopping(builds: readonly { title: string; lines: readonly ShoppingLine[] }[]): ShoppingRow[] {
	const rows = new Map<string, ShoppingRow>();
	for (const b of builds) {
		for (const l of b.lines) {
			const key = shoppingKey(l);
			let row = rows.get(key);
			if (!row) {
				row = {
					key,
					kind: l.kind,
					kindLabel: PART_KIND_LABELS[l.kind as PartKind] ?? l.kind,
					value: formatPartValue(l.value, l.unit, l.valueText) || l.valueText,
					valueSI: l.value,
					unit: l.unit,
					ratingV: l.ratingV,
					ratingW: l.ratingW,
					quantity: 0,
					packages: [],
					uses: []
				};
				rows.set(key, row);
			}
			const qty = Number.isFinite(l.quantity) && l.quantity > 0 ? l.quantity : 1;
			row.quantity += qty;
			const pkg = l.package.trim();
			if (pkg && !row.packages.some((p) => textKey(p) === textKey(pkg))) row.packages.push(pkg);
			row.uses.push({ build: b.title, designators: l.designators, quantity: qty });
		}
	}
	const kindRank = (k: string) => {
		const i = (PART_KINDS as readonly string[]).indexOf(k);
		return i < 0 ? PART_KINDS.length : i;
	};
	return [...rows.values()].sort(
		(a, b) =>
			kindRank(a.kind) - kindRank(b.kind) ||
			(a.valueSI ?? Infinity) - (b.valueSI ?? Infinity) ||
			a.value.localeCompare(b.value) ||
			(a.ratingV ?? 0) - (b.ratingV ?? 0) ||
			(a.ratingW ?? 0) - (b.ratingW ?? 0)
	);
}
