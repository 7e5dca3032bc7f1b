/** Part kinds of a parts-list line, their labels and the spellings a CSV may use. */
import type { ValueKind } from '$lib/engineering';

/** Part kinds of a parts-list line. */
export const PART_KINDS = [
	'resistor',
	'capacitor',
	'inductor',
	'potentiometer',
	'jumper',
	'diode',
	'transistor',
	'ic',
	'regulator',
	'fuse',
	'transformer',
	'connector',
	'switch',
	'heatsink',
	'hardware',
	'other'
] as const;
/** One part kind. */
export type PartKind = (typeof PART_KINDS)[number];

/** Labels of the part kinds for selects and tables. */
export const PART_KIND_LABELS: Record<PartKind, string> = {
	resistor: 'Resistor',
	capacitor: 'Capacitor',
	inductor: 'Inductor',
	potentiometer: 'Potentiometer',
	jumper: 'Jumper (0 Ω link)',
	diode: 'Diode / rectifier',
	transistor: 'Transistor',
	ic: 'IC',
	regulator: 'Regulator',
	fuse: 'Fuse',
	transformer: 'Transformer',
	connector: 'Connector',
	switch: 'Switch',
	heatsink: 'Heatsink',
	hardware: 'Hardware',
	other: 'Other'
};

/** Spellings accepted for each kind (CSV import, case-insensitive). */
const KIND_SYNONYMS: Record<string, PartKind> = {
	r: 'resistor',
	res: 'resistor',
	resistor: 'resistor',
	resistors: 'resistor',
	c: 'capacitor',
	cap: 'capacitor',
	caps: 'capacitor',
	capacitor: 'capacitor',
	capacitors: 'capacitor',
	electrolytic: 'capacitor',
	l: 'inductor',
	ind: 'inductor',
	inductor: 'inductor',
	coil: 'inductor',
	choke: 'inductor',
	pot: 'potentiometer',
	potentiometer: 'potentiometer',
	trimmer: 'potentiometer',
	jumper: 'jumper',
	link: 'jumper',
	'wire link': 'jumper',
	'0r link': 'jumper',
	d: 'diode',
	diode: 'diode',
	rectifier: 'diode',
	bridge: 'diode',
	led: 'diode',
	q: 'transistor',
	transistor: 'transistor',
	mosfet: 'transistor',
	bjt: 'transistor',
	ic: 'ic',
	u: 'ic',
	chip: 'ic',
	'op-amp': 'ic',
	opamp: 'ic',
	regulator: 'regulator',
	reg: 'regulator',
	f: 'fuse',
	fuse: 'fuse',
	t: 'transformer',
	tr: 'transformer',
	transformer: 'transformer',
	j: 'connector',
	connector: 'connector',
	socket: 'connector',
	jack: 'connector',
	terminal: 'connector',
	sw: 'switch',
	switch: 'switch',
	relay: 'switch',
	heatsink: 'heatsink',
	'heat sink': 'heatsink',
	hardware: 'hardware',
	mech: 'hardware',
	mechanical: 'hardware',
	other: 'other'
};

/** Read a kind as typed or as found in a CSV ("Cap" → capacitor); null when unknown. */
export function normaliseKind(text: string): PartKind | null {
	const t = text.trim().toLowerCase().replace(/\s+/g, ' ');
	if ((PART_KINDS as readonly string[]).includes(t)) return t as PartKind;
	return KIND_SYNONYMS[t] ?? null;
}

/** The quantity a kind's value measures: resistor/potentiometer/jumper → resistance, capacitor → capacitance, inductor → inductance; others keep text (null). */
export function valueKindOf(kind: string): ValueKind | null {
	if (kind === 'resistor' || kind === 'potentiometer' || kind === 'jumper') return 'resistance';
	if (kind === 'capacitor') return 'capacitance';
	if (kind === 'inductor') return 'inductance';
	return null;
}
