/**
 * Match a derived build's parts list against its origin's by designators, for the side-by-side view.
 * Pure; the component only renders what this returns.
 */
import type { PartLineFields } from '$lib/parts';

/** The fields of a part line the comparison reads. */
export type ComparableLine = Pick<
	PartLineFields,
	'designators' | 'quantity' | 'kind' | 'valueText' | 'value' | 'unit' | 'tolerancePct' | 'ratingV' | 'ratingW' | 'package'
> & { position?: number };

/** One row of the comparison. status: same | changed | added (only in mine) | removed (only in origin). */
export interface CompareRow<L extends ComparableLine = ComparableLine> {
	key: string;
	mine: L | null;
	origin: L | null;
	status: 'same' | 'changed' | 'added' | 'removed';
	/** Names of the fields that differ ('value', 'quantity', …). */
	changed: string[];
}

/** Canonical designator key: "r2, R1" and "R1 R2" → "R1,R2". */
export function designatorKey(designators: string): string {
	return designators
		.split(/[\s,;]+/)
		.filter(Boolean)
		.map((d) => d.toUpperCase())
		.sort((a, b) => a.localeCompare(b, 'en', { numeric: true }))
		.join(',');
}

const FIELDS: { name: string; same: (a: ComparableLine, b: ComparableLine) => boolean }[] = [
	{ name: 'kind', same: (a, b) => a.kind === b.kind },
	{
		name: 'value',
		same: (a, b) =>
			a.value !== null && b.value !== null
				? Math.abs(a.value - b.value) <= 1e-9 * Math.max(Math.abs(a.value), Math.abs(b.value)) && a.unit === b.unit
				: a.valueText.trim().toLowerCase() === b.valueText.trim().toLowerCase()
	},
	{ name: 'quantity', same: (a, b) => a.quantity === b.quantity },
	{ name: 'tolerance', same: (a, b) => a.tolerancePct === b.tolerancePct },
	{ name: 'voltage rating', same: (a, b) => a.ratingV === b.ratingV },
	{ name: 'power rating', same: (a, b) => a.ratingW === b.ratingW },
	{ name: 'package', same: (a, b) => a.package.trim().toLowerCase() === b.package.trim().toLowerCase() }
];

/**
 * Pair lines by designators (order-insensitive); lines without designators pair by kind + value.
 * Rows follow the derived build's order, then the origin's lines it no longer has.
 */
export function compareParts<L extends ComparableLine>(mine: readonly L[], origin: readonly L[]): CompareRow<L>[] {
	const keyOf = (l: ComparableLine) => designatorKey(l.designators) || `~${l.kind}:${l.valueText.trim().toLowerCase()}`;
	const byPos = (a: L, b: L) => (a.position ?? 0) - (b.position ?? 0);
	const pool = new Map<string, L[]>();
	for (const o of [...origin].sort(byPos)) {
		const k = keyOf(o);
		pool.set(k, [...(pool.get(k) ?? []), o]);
	}
	const rows: CompareRow<L>[] = [];
	for (const m of [...mine].sort(byPos)) {
		const k = keyOf(m);
		const o = pool.get(k)?.shift() ?? null;
		if (!o) {
			rows.push({ key: `m:${rows.length}:${k}`, mine: m, origin: null, status: 'added', changed: [] });
			continue;
		}
		const changed = FIELDS.filter((f) => !f.same(m, o)).map((f) => f.name);
		rows.push({ key: `b:${rows.length}:${k}`, mine: m, origin: o, status: changed.length ? 'changed' : 'same', changed });
	}
	for (const [k, left] of pool)
		for (const o of left) rows.push({ key: `o:${rows.length}:${k}`, mine: null, origin: o, status: 'removed', changed: [] });
	return rows;
}
