/**
 * The spec-block forms' fields (label, type, hint, initial text) of each kind, without the zod schemas: the
 * build page reads them for the order of a block's inputs and must not pull zod into the browser. The schemas
 * and the text ⇄ data conversion live in $lib/schemas/spec-forms, which re-exports everything here.
 */
import { RECTIFIERS, TOPOLOGIES } from '$lib/engineering/choices';
import type { ValueKind } from '$lib/engineering';
import { CHASSIS, type SpecKind } from '$lib/specs/kinds';

/** How a field is typed and read. */
export type FieldType =
	| { t: 'number'; unit?: string; int?: boolean; eachSide?: boolean }
	| { t: 'value'; kind: ValueKind }
	| { t: 'select'; options: readonly (readonly [string, string])[] }
	| { t: 'bool' }
	| { t: 'list'; unit: string }
	| { t: 'rows'; columns: readonly string[]; example: string };

/** One input of a spec-block form. `path` is the dot path in the block's data; `group` names an optional sub-object. */
export interface SpecField {
	path: string;
	label: string;
	type: FieldType;
	hint?: string;
	placeholder?: string;
	/** Optional field: blank means absent (or the schema's default). */
	optional?: boolean;
	/** Initial text of a new block. */
	initial?: string;
}

/** Sections of a form, each a list of fields; a section with `group` is an optional sub-object (all blank → none). */
export interface SpecSection {
	title: string;
	group?: string;
	note?: string;
	fields: SpecField[];
}

const n = (unit?: string, int = false): FieldType => ({ t: 'number', unit, int });
const ohm: FieldType = { t: 'value', kind: 'resistance' };
const farad: FieldType = { t: 'value', kind: 'capacitance' };
const yesNo: FieldType = { t: 'bool' };
const sel = (values: readonly string[], labels: Record<string, string> = {}): FieldType => ({
	t: 'select',
	options: values.map((v) => [v, labels[v] ?? v] as const)
});

/** The forms of the five kinds. */
export const SPEC_FORMS: Record<SpecKind, SpecSection[]> = {
	amplifier: [
		{
			title: 'Output stage',
			fields: [
				{ path: 'channels', label: 'Channels', type: n('', true), initial: '2' },
				{ path: 'topology', label: 'Topology', type: sel(TOPOLOGIES, { 'class-ab-chip': 'class AB chip amp', 'class-ab-discrete': 'class AB discrete', 'class-a': 'class A', 'class-d': 'class D', valve: 'valve', other: 'other' }), initial: 'class-ab-chip' },
				{ path: 'supply', label: 'Supply', type: sel(['split', 'single'], { split: 'split (±V)', single: 'single (V)' }), initial: 'split' },
				{ path: 'railV', label: 'Rail voltage (split: each side ±)', type: { t: 'number', unit: 'V', eachSide: true }, hint: 'Split: each rail’s magnitude — ±28, +-28 or 28 for ±28 V. Single: the whole supply.', placeholder: '±28' },
				{ path: 'loadOhm', label: 'Nominal load', type: ohm, hint: 'e.g. 8R, 4R, 32R for headphones', placeholder: '8R' }
			]
		},
		{
			title: 'Device limits (from its data sheet)',
			fields: [
				{ path: 'device.maxSupplyV', label: 'Max total supply', type: n('V'), hint: 'V+ to V−', placeholder: '60' },
				{ path: 'device.dropoutV', label: 'Dropout per side', type: n('V'), placeholder: '3', initial: '3' },
				{ path: 'device.junctionMaxC', label: 'Junction max', type: n('°C'), placeholder: '150', initial: '150' },
				{ path: 'device.rthJcKPerW', label: 'Rth junction–case', type: n('K/W'), placeholder: '1' },
				{ path: 'device.minLoadOhm', label: 'Minimum load', type: ohm, placeholder: '4R' },
				{ path: 'device.maxOutputCurrentA', label: 'Peak output current rating', type: n('A'), optional: true, hint: 'Current limit or safe-area figure; blank if the data sheet gives none.', placeholder: '11' }
			]
		},
		{
			title: 'Worst case and topology details',
			note: 'Heat and ratings are checked at the worst case: rails at high mains off load, the speaker at 80 % of its nominal impedance, the quiescent current included.',
			fields: [
				{ path: 'quiescentA', label: 'Quiescent current per stage', type: n('A'), optional: true, hint: 'From the data sheet; 50m = 50 mA. Blank: 0.', placeholder: '0.05' },
				{ path: 'mainsHighPct', label: 'High-mains allowance', type: n('%'), optional: true, hint: 'Blank: 10 %.', placeholder: '10' },
				{ path: 'bridged', label: 'Two stages drive the load in bridge', type: yesNo },
				{ path: 'biasA', label: 'Class A bias current', type: n('A'), optional: true, hint: 'Class A only: the output stage’s standing current.', placeholder: '0.1' },
				{ path: 'classA', label: 'Class A stage', type: sel(['', 'push-pull', 'single-ended'], { '': '— (not class A)' }), optional: true, hint: 'Class A only. Blank: push-pull.' },
				{ path: 'efficiencyPct', label: 'Class D efficiency', type: n('%'), optional: true, hint: 'Class D only. Blank: 85 %.', placeholder: '85' },
				{ path: 'regulatedRails', label: 'Runs from regulated rails after the supply block', type: yesNo },
				{ path: 'speakerProtection', label: 'Speaker DC protection fitted', type: yesNo }
			]
		},
		{
			title: 'Gain network (optional)',
			group: 'gain',
			fields: [
				{ path: 'gain.rfOhm', label: 'Rf (feedback)', type: ohm, placeholder: '22k' },
				{ path: 'gain.riOhm', label: 'Ri (to ground)', type: ohm, placeholder: '680R' },
				{ path: 'gain.ciF', label: 'Ci (ground-leg capacitor)', type: farad, optional: true, placeholder: '47u' }
			]
		},
		{
			title: 'Input coupling (optional)',
			group: 'input',
			fields: [
				{ path: 'input.rOhm', label: 'Resistor to ground', type: ohm, placeholder: '22k' },
				{ path: 'input.cF', label: 'Coupling capacitor', type: farad, placeholder: '1u' }
			]
		},
		{
			title: 'Claimed output (optional)',
			group: 'claimed',
			fields: [
				{ path: 'claimed.powerW', label: 'Claimed power per channel', type: n('W'), placeholder: '40' },
				{ path: 'claimed.thdPct', label: 'At THD', type: n('%'), placeholder: '1' }
			]
		}
	],
	supply: [
		{
			title: 'Mains and transformer',
			fields: [
				{ path: 'mainsVac', label: 'Mains voltage', type: n('V'), placeholder: '230', initial: '230' },
				{ path: 'mainsHz', label: 'Mains frequency', type: n('Hz'), placeholder: '50', initial: '50' },
				{ path: 'transformerVA', label: 'Transformer rating', type: n('VA'), placeholder: '160' },
				{ path: 'secondaryVac', label: 'Secondary per rail (RMS, at rated load)', type: n('V'), placeholder: '20' },
				{ path: 'secondaryRatedA', label: 'Winding current rating (per rail winding)', type: n('A'), optional: true, hint: 'RMS, from the transformer’s data. Blank: the VA spread over the secondary.', placeholder: '3' },
				{ path: 'regulationPct', label: 'Transformer regulation', type: n('%'), optional: true, hint: 'Off-load rise over the rated secondary; from the transformer’s data. Blank: 10 % assumed.', placeholder: '7' },
				{ path: 'mainsHighPct', label: 'High-mains allowance', type: n('%'), optional: true, hint: 'Blank: 10 %.', placeholder: '10' },
				{ path: 'mainsLowPct', label: 'Low-mains allowance', type: n('%'), optional: true, hint: 'Blank: 10 %.', placeholder: '10' },
				{ path: 'mainsPowered', label: 'Mains powered', type: yesNo, initial: 'on' },
				{ path: 'softStart', label: 'Soft-start (inrush limiter) fitted', type: yesNo }
			]
		},
		{
			title: 'Rectifier and reservoir',
			fields: [
				{ path: 'rectifier', label: 'Rectifier', type: sel(RECTIFIERS, { bridge: 'bridge, one rail', 'bridge-split': 'bridge on a centre-tapped winding, ± rails', 'center-tap': 'two diodes, centre tap, one rail', 'half-wave': 'half-wave' }), initial: 'bridge-split' },
				{ path: 'diodeDropV', label: 'Diode drop', type: n('V'), optional: true, hint: 'Blank: 0.7 V.', placeholder: '0.7' },
				{ path: 'reservoirF', label: 'Reservoir per rail', type: farad, hint: 'All the reservoir capacitance of one rail, e.g. 10000u or 10m.', placeholder: '10000u' },
				{ path: 'capRatingV', label: 'Reservoir voltage rating', type: n('V'), placeholder: '50' },
				{ path: 'capRippleRatingA', label: 'Reservoir ripple-current rating (per rail)', type: n('A'), optional: true, hint: 'RMS at 100/120 Hz; add the ratings of parallel capacitors. Blank: not checked.', placeholder: '4.5' },
				{ path: 'loadCurrentA', label: 'Load current per rail', type: n('A'), placeholder: '1.5' },
				{ path: 'amplifierDemandW', label: 'Amplifier output it feeds (sum of rated powers)', type: n('W'), optional: true, placeholder: '80' }
			]
		},
		{
			title: 'Primary fuse',
			group: 'fuse',
			note: 'Leave both blank if there is no primary fuse (the checks will say so).',
			fields: [
				{ path: 'fuse.ratingA', label: 'Fuse rating', type: n('A'), placeholder: '1.6' },
				{ path: 'fuse.type', label: 'Fuse type', type: sel(['', 'slow', 'fast'], { '': '—', slow: 'slow (T, time-delay)', fast: 'fast (F)' }) }
			]
		},
		{
			title: 'Chassis and safety',
			fields: [
				{ path: 'chassis', label: 'Chassis', type: sel(CHASSIS), initial: 'metal' },
				{ path: 'protectiveEarth', label: 'Protective earth bonded to the chassis', type: yesNo, initial: 'on' },
				{ path: 'doubleInsulated', label: 'Double insulated', type: yesNo },
				{ path: 'bleeder', label: 'Bleeder', type: sel(['none', 'fitted'], { none: 'none', fitted: 'fitted' }), initial: 'none' },
				{ path: 'bleeder.ohm', label: 'Bleeder resistor (per rail)', type: ohm, optional: true, placeholder: '2k2' }
			]
		}
	],
	thermal: [
		{
			title: 'Heat path',
			fields: [
				{ path: 'powerW', label: 'Dissipation per device', type: n('W'), hint: 'Use the amplifier block’s design (worst-case) dissipation per stage.', placeholder: '31' },
				{ path: 'devices', label: 'Devices on this heatsink', type: n('', true), optional: true, hint: 'Each dissipating the figure above. Blank: 1.', placeholder: '1', initial: '1' },
				{ path: 'ambientC', label: 'Ambient (inside the case)', type: n('°C'), placeholder: '40', initial: '40' },
				{ path: 'junctionMaxC', label: 'Junction max', type: n('°C'), placeholder: '150', initial: '150' },
				{ path: 'rthJcKPerW', label: 'Rth junction–case', type: n('K/W'), placeholder: '1' },
				{ path: 'rthCsKPerW', label: 'Rth case–sink (insulator)', type: n('K/W'), placeholder: '0.4' },
				{ path: 'rthSaKPerW', label: 'Rth sink–ambient', type: n('K/W'), placeholder: '1.5' }
			]
		},
		{
			title: 'Mounting',
			fields: [
				{ path: 'tabAtRail', label: 'The device tab sits at a supply rail', type: yesNo },
				{ path: 'tabInsulated', label: 'The tab is insulated from the heatsink', type: yesNo },
				{ path: 'heatsinkBondedToChassis', label: 'The heatsink is bonded to the chassis', type: yesNo }
			]
		}
	],
	measurements: [
		{
			title: 'Measured values',
			fields: [
				{ path: 'dcOffsetMv', label: 'Output DC offset per channel', type: { t: 'list', unit: 'mV' }, hint: 'One number per channel, comma separated: 12, -8', placeholder: '12, -8' },
				{ path: 'noiseUv', label: 'Output noise (rms)', type: n('µV'), optional: true, placeholder: '90' },
				{ path: 'idleCurrentMa', label: 'Idle current', type: n('mA'), optional: true, placeholder: '40' },
				{ path: 'loadOhm', label: 'Measured into', type: ohm, optional: true, placeholder: '8R' },
				{ path: 'speakerProtection', label: 'A speaker DC-protection circuit is fitted', type: yesNo }
			]
		},
		{
			title: 'Points (type, paste, or upload a CSV below)',
			fields: [
				{ path: 'points.response', label: 'Frequency response: frequency, dB', type: { t: 'rows', columns: ['frequency (Hz)', 'level (dB)'], example: 'frequency,dB\n20,-0.4\n1k,0\n20k,-0.2' }, optional: true, hint: 'One point per line: frequency,dB (20, 1k, 20k …). A header line is optional.' },
				{ path: 'points.thd', label: 'THD against power: power, THD', type: { t: 'rows', columns: ['power (W)', 'THD (%)'], example: 'power,THD\n1,0.01\n10,0.02\n40,1' }, optional: true, hint: 'One point per line: power in W, THD in %.' }
			]
		}
	],
	bringup: [
		{
			title: 'First power-up',
			fields: [
				{ path: 'currentLimited', label: 'First start through a current limiter (series lamp, resistor or limited bench supply)', type: yesNo },
				{ path: 'rails', label: 'Rails: label, expected V, measured V', type: { t: 'rows', columns: ['label', 'expected (V)', 'measured (V)'], example: 'V+,28,28.4\nV-,-28,-28.1' }, optional: true, hint: 'One rail per line, e.g. V+,28,28.4' },
				{ path: 'dcOffsetMv', label: 'DC offset per channel, no speaker connected', type: { t: 'list', unit: 'mV' }, optional: true, placeholder: '6, -11' },
				{ path: 'speakerProtection', label: 'A speaker DC-protection circuit is fitted', type: yesNo },
				{ path: 'oscillationChecked', label: 'Checked for oscillation (scope on the output)', type: yesNo },
				{ path: 'oscillationFound', label: 'Oscillation found', type: yesNo },
				{ path: 'idleCurrent', label: 'Idle current: label, expected mA, measured mA', type: { t: 'rows', columns: ['label', 'expected (mA)', 'measured (mA)'], example: 'left,40,44\nright,40,39' }, optional: true }
			]
		},
		{
			title: 'Heat soak (optional)',
			group: 'heatSoak',
			fields: [
				{ path: 'heatSoak.minutes', label: 'Duration', type: n('min'), placeholder: '60' },
				{ path: 'heatSoak.sinkC', label: 'Heatsink temperature after', type: n('°C'), placeholder: '52' }
			]
		}
	]
};

/** Every field of a kind, in form order. */
export function fieldsOf(kind: SpecKind): SpecField[] {
	return SPEC_FORMS[kind].flatMap((s) => s.fields);
}

/** Form input name of a data path: 'device.maxSupplyV' → 'device__maxSupplyV' (dots would read as nesting). */
export const fieldName = (path: string) => path.replace(/\./g, '__');
