/**
 * Spec-block forms: each kind's fields as flat text inputs (so the forms work without JavaScript and values
 * can be typed in the trade's notation: `10000u`, `4k7`, `22k`), the zod schemas superforms validates the
 * text with, and the conversion text ⇄ block data. The block itself is validated by the kind's schema in
 * $lib/specs on the server; its issues are mapped back to these fields (a point list's issues to its line).
 */
import { z } from 'zod';
import { parseQuantity, parseValue, RECTIFIERS, type ValueKind } from '$lib/engineering';
import { SPEC_KINDS, TOPOLOGIES, CHASSIS, type SpecKind } from '$lib/specs';

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

/** Form schemas (one per kind, built once): every field is text; the block's own schema checks the values. */
export const specFormSchemas = Object.fromEntries(
	SPEC_KINDS.map((kind) => [
		kind,
		z.object({
			id: z.string().max(40).default(''),
			kind: z.literal(kind).default(kind),
			title: z.string().max(120, 'must be at most 120 characters').default(''),
			...Object.fromEntries(
				fieldsOf(kind).map((f) => [fieldName(f.path), z.string().max(f.type.t === 'rows' ? 200_000 : 200, 'is too long').default(f.initial ?? '')])
			)
		})
	])
) as unknown as Record<SpecKind, z.ZodObject<Record<string, z.ZodDefault<z.ZodString> | z.ZodLiteral<string>>>>;

/** A form issue: the input name and a message. */
export interface FormIssue {
	field: string;
	message: string;
}

/**
 * Read a plain number as typed: "35", "-12.5", "0,47", "1e3", "20k" (SI prefix where the unit takes one), with an
 * optional unit after it ("35 V", "1.5A", "0.01 %") — the engineering library's parseQuantity, as the bench tools.
 * readNumber('20k', 'Hz') → 20000. Null when unreadable.
 */
export function readNumber(text: string, unit = ''): number | null {
	const s = text.trim().replace(/\s*%$/, '');
	try {
		return parseQuantity(s, unit === '%' ? '' : unit);
	} catch {
		return null;
	}
}

const isOn = (s: string) => /^(on|true|yes|1)$/i.test(s.trim());
/** The sign an "each side ±" field may start with: ±, +-, +/- . */
const EACH_SIDE = /^\s*(?:±|\+\s*\/?\s*-)\s*/;

/** The number an "each side ±" text reads as, or null: eachSideValue('±30') → 30, eachSideValue('+-30 V') → 30. */
export function eachSideValue(text: string, unit = 'V'): number | null {
	const pm = EACH_SIDE.exec(text);
	const v = readNumber(pm ? text.slice(pm[0].length) : text, unit);
	return v !== null && (!pm || v >= 0) ? v : null;
}

/** Set a dot path in a plain object. */
function setPath(obj: Record<string, unknown>, path: string, value: unknown): void {
	const keys = path.split('.');
	let cur = obj;
	for (const k of keys.slice(0, -1)) {
		if (cur[k] === null || typeof cur[k] !== 'object') cur[k] = {};
		cur = cur[k] as Record<string, unknown>;
	}
	cur[keys[keys.length - 1]] = value;
}

/** Parsed rows of a points/rails textarea with the textarea line each came from. */
export interface RowsRead {
	rows: (string | number)[][];
	lines: number[];
	issues: FormIssue[];
}

/**
 * Read a textarea (or CSV) of rows: comma, semicolon or tab separated; blank lines skipped; a first line
 * without any number is taken as a header. Columns labelled "label" stay text (may be empty); the others
 * are numbers (SI prefixes allowed: 1k, 20k). Issues name the line: "line 3: "x" is not a number".
 * readRows('frequency,dB\n20,-0.5\n1k,0', ['frequency (Hz)', 'level (dB)'], 'points.response').rows → [[20,-0.5],[1000,0]].
 */
export function readRows(text: string, columns: readonly string[], field: string): RowsRead {
	const out: RowsRead = { rows: [], lines: [], issues: [] };
	const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\r|\n/);
	const numericCols = columns.map((c) => c !== 'label');
	let first = true;
	lines.forEach((raw, i) => {
		const lineNo = i + 1;
		const line = raw.trim();
		if (line === '' || line.startsWith('#')) return;
		const cells = line.split(/\s*[,;\t]\s*/);
		if (first) {
			first = false;
			if (cells.every((c) => readNumber(c) === null)) return; // header
		}
		if (out.rows.length >= 2000) {
			if (out.rows.length === 2000) out.issues.push({ field, message: `line ${lineNo}: at most 2000 rows` });
			return;
		}
		if (cells.length !== columns.length) {
			out.issues.push({ field, message: `line ${lineNo}: expected ${columns.length} values (${columns.join(', ')}), found ${cells.length}` });
			return;
		}
		const row: (string | number)[] = [];
		for (const [j, c] of cells.entries()) {
			if (!numericCols[j]) {
				row.push(c);
				continue;
			}
			const v = readNumber(c);
			if (v === null) {
				out.issues.push({ field, message: `line ${lineNo}: "${c}" is not a number (${columns[j]})` });
				return;
			}
			row.push(v);
		}
		out.rows.push(row);
		out.lines.push(lineNo);
	});
	return out;
}

/** Which list a measurements CSV holds, from its header: frequency,dB → response; power,THD → thd; else null. */
export function pointsShape(text: string): 'response' | 'thd' | null {
	const first = text.replace(/^\uFEFF/, '').split(/\r\n|\r|\n/).find((l) => l.trim() !== '');
	if (!first) return null;
	const h = first.toLowerCase().split(/\s*[,;\t]\s*/);
	if (h.length !== 2) return null;
	if (/freq|hz/.test(h[0]) && /db|level|gain/.test(h[1])) return 'response';
	if (/pow|^w$|watt|\(w\)/.test(h[0]) && /thd|dist|%/.test(h[1])) return 'thd';
	return null;
}

/** Where the list rows of a form came from, to put an issue on "line n" of the right textarea. */
export type LineMaps = Record<string, number[]>;

/**
 * Turn a form's text values into block data for `kind`. Text that is not even a number gives a form issue
 * here; ranges and required fields are the block schema's job. → { data, issues, lineMaps }.
 */
export function formToSpecData(kind: SpecKind, values: Record<string, unknown>): { data: Record<string, unknown>; issues: FormIssue[]; lineMaps: LineMaps } {
	const data: Record<string, unknown> = {};
	const issues: FormIssue[] = [];
	const lineMaps: LineMaps = {};
	const text = (f: SpecField) => {
		const v = values[fieldName(f.path)];
		return typeof v === 'string' ? v : '';
	};
	for (const section of SPEC_FORMS[kind]) {
		const fields = section.fields;
		if (section.group && fields.every((f) => text(f).trim() === '')) {
			// An optional group left blank: absent (the fuse group: no fuse).
			setPath(data, section.group, null);
			continue;
		}
		for (const f of fields) {
			const name = fieldName(f.path);
			const s = text(f).trim();
			const ty = f.type;
			if (ty.t === 'bool') {
				setPath(data, f.path, isOn(s));
				continue;
			}
			if (f.path === 'bleeder') {
				setPath(data, 'bleeder', s === 'fitted' ? true : null);
				continue;
			}
			if (f.path === 'bleeder.ohm') {
				if (s === '') continue;
				try {
					const v = parseValue(s, 'resistance').value;
					data.bleeder = { ohm: v };
				} catch (e) {
					issues.push({ field: name, message: (e as Error).message });
				}
				continue;
			}
			if (s === '') {
				if (!f.optional) setPath(data, f.path, undefined);
				continue;
			}
			switch (ty.t) {
				case 'number': {
					// "Each side ±" fields take ±30, +-30, +/-30 or 30; the text is kept to show back as typed.
					const v = ty.eachSide ? eachSideValue(s, ty.unit) : readNumber(s, ty.unit);
					if (v === null) issues.push({ field: name, message: `"${s}" is not a number${ty.unit ? ` (${ty.unit})` : ''}${ty.eachSide ? '; write ±30, +-30 or 30' : ''}` });
					else {
						setPath(data, f.path, v);
						if (ty.eachSide) setPath(data, `${f.path.replace(/V$/, '')}Text`, s);
					}
					break;
				}
				case 'value': {
					try {
						// A bare number is read in the field's own unit (Ω, F).
						setPath(data, f.path, parseValue(s, ty.kind).value);
					} catch (e) {
						issues.push({ field: name, message: (e as Error).message });
					}
					break;
				}
				case 'select':
					setPath(data, f.path, s);
					break;
				case 'list': {
					const parts = s.split(/\s*[,;]\s*|\s+/).filter(Boolean);
					const nums = parts.map((p) => readNumber(p, ty.unit));
					const bad = parts.findIndex((_, i) => nums[i] === null);
					if (bad >= 0) issues.push({ field: name, message: `value ${bad + 1} ("${parts[bad]}") is not a number` });
					else setPath(data, f.path, nums);
					break;
				}
				case 'rows': {
					const read = readRows(s, ty.columns, name);
					issues.push(...read.issues);
					lineMaps[f.path] = read.lines;
					const keys =
						f.path === 'points.response'
							? ['freqHz', 'db']
							: f.path === 'points.thd'
								? ['powerW', 'thdPct']
								: f.path === 'rails'
									? ['label', 'expectedV', 'measuredV']
									: ['label', 'expectedMa', 'measuredMa'];
					setPath(
						data,
						f.path,
						read.rows.map((r) =>
							Object.fromEntries(
								keys.map((k, i) => [k, k === 'label' ? (String(r[i]).trim() === '' ? undefined : r[i]) : r[i]]).filter(([, v]) => v !== undefined)
							)
						)
					);
					break;
				}
			}
		}
	}
	if (kind === 'supply' && data.fuse && typeof data.fuse === 'object' && (data.fuse as Record<string, unknown>).type === '')
		(data.fuse as Record<string, unknown>).type = undefined;
	return { data, issues, lineMaps };
}

const rowKeys: Record<string, string[]> = {
	'points.response': ['freqHz', 'db'],
	'points.thd': ['powerW', 'thdPct'],
	rails: ['label', 'expectedV', 'measuredV'],
	idleCurrent: ['label', 'expectedMa', 'measuredMa']
};
const rowHeaders: Record<string, string> = {
	'points.response': 'frequency,dB',
	'points.thd': 'power,THD',
	rails: '',
	idleCurrent: ''
};

function getPath(obj: unknown, path: string): unknown {
	return path.split('.').reduce<unknown>((cur, k) => (cur && typeof cur === 'object' ? (cur as Record<string, unknown>)[k] : undefined), obj);
}

/** Show a stored SI value in the trade's notation for a value field: 4700 Ω → "4k7", 1e-2 F → "10000u". */
export function valueToText(value: number, kind: ValueKind): string {
	const units: [number, string][] =
		kind === 'resistance'
			? [[1e6, 'M'], [1e3, 'k'], [1, 'R']]
			: kind === 'capacitance'
				? [[1e-6, 'u'], [1e-9, 'n'], [1e-12, 'p']]
				: [[1e-3, 'm'], [1e-6, 'u'], [1e-9, 'n']];
	for (const [scale, letter] of units) {
		if (Math.abs(value) >= scale || scale === units[units.length - 1][0]) {
			const m = Number((value / scale).toPrecision(6));
			return `${m}${letter}`;
		}
	}
	return String(value);
}

/** A stored block's data as form text, the inverse of formToSpecData (for editing). */
export function specDataToForm(kind: SpecKind, data: Record<string, unknown>): Record<string, string> {
	const out: Record<string, string> = {};
	for (const f of fieldsOf(kind)) {
		const name = fieldName(f.path);
		if (f.path === 'bleeder') {
			out[name] = data.bleeder ? 'fitted' : 'none';
			continue;
		}
		const v = getPath(data, f.path);
		const ty = f.type;
		const typed = ty.t === 'number' && ty.eachSide ? getPath(data, `${f.path.replace(/V$/, '')}Text`) : undefined;
		if (typeof typed === 'string' && typeof v === 'number' && eachSideValue(typed, ty.t === 'number' ? ty.unit : 'V') === v) out[name] = typed;
		else if (ty.t === 'bool') out[name] = v === true ? 'on' : '';
		else if (v === undefined || v === null) out[name] = '';
		else if (ty.t === 'value' && typeof v === 'number') out[name] = valueToText(v, ty.kind);
		else if (ty.t === 'list' && Array.isArray(v)) out[name] = v.join(', ');
		else if (ty.t === 'rows' && Array.isArray(v)) {
			const keys = rowKeys[f.path];
			const head = rowHeaders[f.path];
			out[name] = [head, ...v.map((r) => keys.map((k) => (r as Record<string, unknown>)[k] ?? '').join(','))].filter(Boolean).join('\n');
		} else out[name] = String(v);
	}
	return out;
}

/**
 * Put the block schema's issues on the form's inputs: the longest field path that starts the issue path
 * takes it; an issue inside a list names its line ("line 3: must be at most 200 dB"). Issues that match
 * no field go to '' (the form message).
 */
export function mapSpecIssues(kind: SpecKind, issues: readonly { path: string; message: string }[], lineMaps: LineMaps = {}): FormIssue[] {
	const paths = fieldsOf(kind)
		.map((f) => f.path)
		.sort((a, b) => b.length - a.length);
	const label = (p: string) => fieldsOf(kind).find((f) => f.path === p)?.type;
	return issues.map((i) => {
		const p = paths.find((fp) => i.path === fp || i.path.startsWith(`${fp}.`));
		if (!p) {
			// A group-level issue ("claimed" missing a field) goes to the group's first field.
			const groupField = fieldsOf(kind).find((f) => f.path.startsWith(`${i.path}.`));
			if (groupField && i.path) return { field: fieldName(groupField.path), message: i.message };
			return { field: '', message: i.path ? `${i.path}: ${i.message}` : i.message };
		}
		const rest = i.path.slice(p.length + 1).split('.').filter(Boolean);
		const ty = label(p);
		if (rest.length && /^\d+$/.test(rest[0])) {
			const idx = Number(rest[0]);
			if (ty?.t === 'rows') {
				const line = lineMaps[p]?.[idx] ?? idx + 1;
				const col = rest[1] ? ty.columns[rowKeys[p]?.indexOf(rest[1]) ?? -1] ?? rest[1] : 'row';
				return { field: fieldName(p), message: `line ${line}: ${col} ${i.message}` };
			}
			return { field: fieldName(p), message: `value ${idx + 1}: ${i.message}` };
		}
		return { field: fieldName(p), message: i.message };
	});
}
