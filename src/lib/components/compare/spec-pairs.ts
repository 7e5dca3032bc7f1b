/**
 * Spec blocks of two builds side by side: blocks paired by kind in their order (the first amplifier block with
 * the first, …), each pair as rows of [field, this build, other build] over the inputs and the values worked
 * out from them, with whether they differ. Pure; the compare page renders what this returns.
 */
import { KIND_LABELS, flatten, inReadingOrder, labelOf, showValue } from '$lib/components/specs/display';

/** The fields of a stored block the comparison reads. */
export interface ComparableBlock {
	kind: string;
	title?: string;
	data: Record<string, unknown>;
	derived: Record<string, unknown>;
	checks: { level: string }[];
}

export interface SpecRow {
	key: string;
	label: string;
	left: string;
	right: string;
	/** Both sides have the field and show different values (or only one has it). */
	differs: boolean;
}

export interface SpecPair {
	kind: string;
	kindLabel: string;
	/** 1-based number of this pair among blocks of its kind ("Amplifier 2"). */
	nth: number;
	leftTitle: string | null;
	rightTitle: string | null;
	/** Missing on a side: that build has fewer blocks of this kind. */
	left: boolean;
	right: boolean;
	inputs: SpecRow[];
	derived: SpecRow[];
	/** Danger / caution counts per side. */
	signs: { left: { danger: number; caution: number }; right: { danger: number; caution: number } };
}

const KIND_ORDER = ['amplifier', 'supply', 'thermal', 'bringup', 'measurements'];

function rows(a: Record<string, unknown> | undefined, b: Record<string, unknown> | undefined): SpecRow[] {
	const la = new Map(flatten(a ?? {}));
	const lb = new Map(flatten(b ?? {}));
	const keys = inReadingOrder([...new Set([...la.keys(), ...lb.keys()])].map((k) => [k, null] as [string, null])).map(([k]) => k);
	return keys.map((key) => {
		const left = la.has(key) ? showValue(key, la.get(key)) : '—';
		const right = lb.has(key) ? showValue(key, lb.get(key)) : '—';
		return { key, label: labelOf(key), left, right, differs: left !== right };
	});
}

const signs = (blk: ComparableBlock | undefined) => ({
	danger: blk?.checks.filter((c) => c.level === 'danger').length ?? 0,
	caution: blk?.checks.filter((c) => c.level === 'caution').length ?? 0
});

/**
 * pairSpecBlocks([amp A], [amp B, supply B]) → [{ kind: 'amplifier', left: true, right: true, inputs: [...] },
 * { kind: 'supply', left: false, right: true, … }], kinds in reading order (amplifier, supply, thermal, …).
 */
export function pairSpecBlocks(left: readonly ComparableBlock[], right: readonly ComparableBlock[]): SpecPair[] {
	const kinds = [...new Set([...left, ...right].map((b) => b.kind))].sort(
		(x, y) => (KIND_ORDER.indexOf(x) + 1 || 99) - (KIND_ORDER.indexOf(y) + 1 || 99) || x.localeCompare(y)
	);
	const out: SpecPair[] = [];
	for (const kind of kinds) {
		const ls = left.filter((b) => b.kind === kind);
		const rs = right.filter((b) => b.kind === kind);
		for (let i = 0; i < Math.max(ls.length, rs.length); i++) {
			const a = ls[i];
			const b = rs[i];
			out.push({
				kind,
				kindLabel: KIND_LABELS[kind] ?? kind,
				nth: i + 1,
				leftTitle: a?.title || null,
				rightTitle: b?.title || null,
				left: !!a,
				right: !!b,
				inputs: rows(a?.data, b?.data),
				derived: rows(a?.derived, b?.derived),
				signs: { left: signs(a), right: signs(b) }
			});
		}
	}
	return out;
}
