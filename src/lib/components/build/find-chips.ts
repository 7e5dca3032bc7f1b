/** Chips for the "by the numbers" filters in force (browse page): text, and the keys its × link drops. */
import { PART_KIND_LABELS, type PartKind } from '$lib/parts/kinds';
import type { FindFilterValues } from '$lib/schemas/list-values';

const range = (lo: string | undefined, hi: string | undefined, unit: string, pre = '') =>
	lo && hi ? `${pre}${lo}–${hi} ${unit}` : lo ? `${pre}${lo} ${unit} or more` : `up to ${pre}${hi} ${unit}`;

/** findChips({ railMinV: '25', railMaxV: '35', loadOhm: '4' }) → [{ key: 'railMinV,railMaxV', text: 'Rails ±25–35 V' }, { key: 'loadOhm', text: 'Into 4 Ω' }]. */
export function findChips(f: FindFilterValues): { key: string; text: string }[] {
	const out: { key: string; text: string }[] = [];
	if (f.railMinV || f.railMaxV) out.push({ key: 'railMinV,railMaxV', text: `Rails ${range(f.railMinV, f.railMaxV, 'V', '±')}` });
	if (f.loadOhm) out.push({ key: 'loadOhm', text: `Into ${f.loadOhm} Ω` });
	if (f.powerMinW || f.powerMaxW) out.push({ key: 'powerMinW,powerMaxW', text: `Power ${range(f.powerMinW, f.powerMaxW, 'W')}` });
	if (f.partKind || f.partValue || f.partPackage) {
		const kind = f.partKind ? (PART_KIND_LABELS[f.partKind as PartKind] ?? f.partKind).toLowerCase() : 'part';
		const text = ['Uses a', kind, f.partValue, f.partPackage && `(${f.partPackage})`].filter(Boolean).join(' ');
		out.push({ key: 'partKind,partValue,partPackage', text });
	}
	return out;
}
