/**
 * The printable bench sheet of a build (PRODUCT.md §3 "bench"): what to have on the bench while building it —
 * the parts list grouped for kitting (one group per kind, by value), the spec values, the bring-up expectations
 * as blank boxes to fill in with what was measured, and the cautions. Pure: the print page and the PDF
 * (server/bench-sheet.ts) both draw what this returns.
 */
import { KIND_LABELS, flatten, inReadingOrder, labelOf, showValue } from '$lib/components/specs/display';
import { PART_KIND_LABELS, PART_KINDS, type PartKind } from '$lib/parts/kinds';
import { formatPartValue } from '$lib/parts/values';
import type { PartLineFields } from '$lib/parts/lines';
import { MAINS_BUILD_CAUTION, NOT_A_CERTIFICATION } from '$lib/labels';
import { revisionLabel } from '$lib/revision-label';

export interface SheetBlock {
	kind: string;
	title?: string;
	data: Record<string, unknown>;
	derived: Record<string, unknown>;
	checks: { id?: string; level: string; message: string; caution?: string }[];
}

/** The fields of a parts line the sheet reads. */
export type SheetPart = Pick<PartLineFields, 'designators' | 'quantity' | 'kind' | 'valueText' | 'value' | 'unit' | 'tolerancePct' | 'ratingV' | 'ratingW' | 'package' | 'notes'>;

export interface SheetInput {
	title: string;
	slug: string;
	url: string;
	makerName: string;
	revision: number;
	mainsPowered: boolean;
	specBlocks: readonly SheetBlock[];
	parts: readonly SheetPart[];
}

export interface KitLine {
	quantity: number;
	designators: string;
	value: string;
	/** Tolerance and ratings ("±1 % · 63 V · 0.25 W"), '' when none. */
	rating: string;
	package: string;
	notes: string;
}

/** One box to fill in at the bench: what to measure, what to expect, the unit of the answer. */
export interface BringupBox {
	what: string;
	expect: string;
	unit: string;
}

export interface BenchSheet {
	title: string;
	subtitle: string;
	url: string;
	/** Safety cautions, each said once (mains, stored charge, heat), then the note that nothing here certifies. */
	cautions: string[];
	/** DANGER and CAUTION checks of the spec blocks, most serious first. */
	warnings: { level: 'danger' | 'caution'; message: string }[];
	specs: { heading: string; rows: { label: string; value: string }[] }[];
	kits: { kind: string; label: string; count: number; lines: KitLine[] }[];
	/** Ticks before the first power-up. */
	before: string[];
	boxes: BringupBox[];
}

/** Largest DC offset at a speaker output usually accepted, mV (the measurements block's caution threshold; common practice, no single source). */
export const SHEET_OFFSET_MV = 50;

const n = (v: unknown) => (typeof v === 'number' && Number.isFinite(v) ? v : null);
const volts = (v: number) => `${v > 0 ? '+' : v < 0 ? '−' : ''}${Number(Math.abs(v).toPrecision(3))} V`;

function rating(p: SheetPart): string {
	return [p.tolerancePct !== null ? `±${p.tolerancePct} %` : '', p.ratingV !== null ? `${p.ratingV} V` : '', p.ratingW !== null ? `${p.ratingW} W` : '']
		.filter(Boolean)
		.join(' · ');
}

/** Parts grouped for kitting: one group per kind in the parts module's order, lines by value (then as listed). */
export function kitGroups(parts: readonly SheetPart[]): BenchSheet['kits'] {
	const order = (k: string) => {
		const i = (PART_KINDS as readonly string[]).indexOf(k);
		return i < 0 ? PART_KINDS.length : i;
	};
	const kinds = [...new Set(parts.map((p) => p.kind))].sort((a, b) => order(a) - order(b));
	return kinds.map((kind) => {
		const lines = parts
			.map((p, i) => ({ p, i }))
			.filter(({ p }) => p.kind === kind)
			.sort((a, b) => (a.p.value ?? Infinity) - (b.p.value ?? Infinity) || a.i - b.i)
			.map(({ p }) => ({
				quantity: p.quantity,
				designators: p.designators,
				value: formatPartValue(p.value, p.unit, p.valueText) || p.valueText || '—',
				rating: rating(p),
				package: p.package,
				notes: p.notes
			}));
		return { kind, label: PART_KIND_LABELS[kind as PartKind] ?? kind, count: lines.reduce((s, l) => s + l.quantity, 0), lines };
	});
}

/** The bring-up boxes: the bring-up block's own expectations, else the rails the amplifier or supply block states. */
export function bringupBoxes(blocks: readonly SheetBlock[]): BringupBox[] {
	const boxes: BringupBox[] = [];
	const bu = blocks.find((b) => b.kind === 'bringup');
	const amp = blocks.find((b) => b.kind === 'amplifier');
	const sup = blocks.find((b) => b.kind === 'supply');
	const rails = Array.isArray(bu?.data.rails) ? (bu!.data.rails as { label?: string; expectedV: number }[]) : [];
	if (rails.length) {
		for (const r of rails) boxes.push({ what: `Rail ${r.label ?? ''}`.trim(), expect: volts(r.expectedV), unit: 'V' });
	} else if (amp && n(amp.data.railV) !== null) {
		const v = n(amp.data.railV)!;
		if (amp.data.supply === 'single') boxes.push({ what: 'Supply', expect: volts(v), unit: 'V' });
		else boxes.push({ what: 'Positive rail', expect: volts(v), unit: 'V' }, { what: 'Negative rail', expect: volts(-v), unit: 'V' });
	} else if (sup && n(sup.derived.averageDcV) !== null) {
		const v = n(sup.derived.averageDcV)!;
		if (n(sup.derived.railCount) === 2) boxes.push({ what: 'Positive rail, loaded', expect: volts(v), unit: 'V' }, { what: 'Negative rail, loaded', expect: volts(-v), unit: 'V' });
		else boxes.push({ what: 'Rail, loaded', expect: volts(v), unit: 'V' });
	}
	if (sup && n(sup.derived.offLoadPeakDcV) !== null) boxes.push({ what: 'Rail off load (no amplifier connected)', expect: `about ${volts(n(sup.derived.offLoadPeakDcV)!)}`, unit: 'V' });
	const channels = Array.isArray(bu?.data.dcOffsetMv) && (bu!.data.dcOffsetMv as unknown[]).length ? (bu!.data.dcOffsetMv as unknown[]).length : (n(amp?.data.channels) ?? (amp ? 1 : 0));
	for (let c = 1; c <= channels; c++) boxes.push({ what: `DC offset, channel ${c} (no speaker)`, expect: `within ±${SHEET_OFFSET_MV} mV`, unit: 'mV' });
	const idle = Array.isArray(bu?.data.idleCurrent) ? (bu!.data.idleCurrent as { label?: string; expectedMa: number }[]) : [];
	for (const i of idle) boxes.push({ what: `Idle current ${i.label ?? ''}`.trim(), expect: `${Number(i.expectedMa.toPrecision(3))} mA`, unit: 'mA' });
	if (blocks.some((b) => b.kind === 'thermal')) boxes.push({ what: 'Heatsink after 30 min at idle', expect: 'warm, not too hot to touch', unit: '°C' });
	return boxes;
}

/** The whole sheet of a build as the viewer sees it (published revision for readers). */
export function benchSheet(input: SheetInput): BenchSheet {
	const checks = input.specBlocks.flatMap((b) => b.checks ?? []);
	const cautions = [...new Set([...(input.mainsPowered ? [`Mains powered. ${MAINS_BUILD_CAUTION}`] : []), ...checks.map((c) => c.caution).filter((c): c is string => !!c)])];
	cautions.push(NOT_A_CERTIFICATION);
	const warnings = checks
		.filter((c): c is typeof c & { level: 'danger' | 'caution' } => c.level === 'danger' || c.level === 'caution')
		.sort((a, b) => (a.level === b.level ? 0 : a.level === 'danger' ? -1 : 1))
		.map((c) => ({ level: c.level, message: c.message }));
	const specs = input.specBlocks.map((b) => ({
		heading: `${KIND_LABELS[b.kind] ?? b.kind}${b.title ? `: ${b.title}` : ''}`,
		rows: [...inReadingOrder(flatten(b.data)), ...inReadingOrder(flatten(b.derived))]
			.filter(([, v]) => v !== null && v !== undefined)
			.map(([k, v]) => ({ label: labelOf(k), value: showValue(k, v) }))
	}));
	return {
		title: input.title,
		subtitle: `by ${input.makerName}${input.revision > 0 ? ` · ${revisionLabel(input.revision)}` : ' · draft'}`,
		url: input.url,
		cautions,
		warnings,
		specs,
		kits: kitGroups(input.parts),
		before: [
			'Parts kitted and checked against the list (values, ratings, polarity of electrolytics)',
			'Wiring checked against the steps; no stray strands or solder bridges',
			...(input.mainsPowered ? ['Protective earth continuity measured from the mains inlet to the chassis'] : []),
			'First power-up through a current limiter (series lamp or limited bench supply)'
		],
		boxes: bringupBoxes(input.specBlocks)
	};
}
