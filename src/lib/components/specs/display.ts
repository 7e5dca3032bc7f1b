/**
 * How spec-block inputs, derived values and check values are shown: a label and a unit from the field name
 * (every numeric field name ends in its unit, API.md), numbers with 3 significant figures, component values
 * with an engineering prefix. Pure; used by SpecBlockView, CheckBadge and the spec editor.
 */
import { formatValue } from '$lib/engineering';
import { TOPOLOGY_LABELS } from '$lib/labels';
import { showCapacitance, sig } from '$lib/components/tools/display';

/** Display names of the spec-block kinds (PRODUCT.md §3). */
export const KIND_LABELS: Record<string, string> = {
	amplifier: 'Amplifier',
	supply: 'Power supply',
	thermal: 'Thermal',
	measurements: 'Measurements',
	bringup: 'Bring-up'
};

/** Labels of known fields; anything else is spelled out from its camelCase name. */
const LABELS: Record<string, string> = {
	channels: 'Channels',
	topology: 'Topology',
	supply: 'Supply',
	railV: 'Rail',
	loadOhm: 'Nominal load',
	'device.maxSupplyV': 'Device max supply (total)',
	'device.dropoutV': 'Device dropout per side',
	'device.junctionMaxC': 'Device junction max',
	'device.rthJcKPerW': 'Device Rth junction–case',
	'device.minLoadOhm': 'Device minimum load',
	'device.maxOutputCurrentA': 'Device peak output current',
	quiescentA: 'Quiescent current per stage',
	bridged: 'Bridged',
	biasA: 'Class A bias current',
	classA: 'Class A stage',
	efficiencyPct: 'Class D efficiency',
	regulatedRails: 'On regulated rails',
	speakerProtection: 'Speaker DC protection',
	'gain.rfOhm': 'Feedback resistor Rf',
	'gain.riOhm': 'Ground-leg resistor Ri',
	'gain.ciF': 'Ground-leg capacitor Ci',
	'input.rOhm': 'Input resistor to ground',
	'input.cF': 'Input coupling capacitor',
	'claimed.powerW': 'Claimed output power',
	'claimed.thdPct': 'Claimed at THD',
	railLimitPowerW: 'Sine power the rails allow',
	biasLimitPowerW: 'Sine power the class A bias allows',
	maxPowerW: 'Max sine power',
	peakVoltageV: 'Peak output voltage',
	peakCurrentA: 'Peak output current',
	rmsVoltageV: 'RMS output voltage at max power',
	worstDissipationW: 'Textbook worst-case dissipation per channel (stated rail, nominal load)',
	designDissipationW: 'Design dissipation per channel (high mains, minimum impedance, quiescent)',
	totalDesignDissipationW: 'Design dissipation, all channels',
	totalSupplyV: 'Total supply',
	highMainsRailV: 'Rail at high mains, off load',
	highMainsTotalV: 'Total supply at high mains',
	minImpedanceOhm: 'Speaker minimum impedance (80 %)',
	worstPeakCurrentA: 'Peak output current, worst case',
	loadedRailPowerW: 'Sine power at the supply’s loaded rail',
	lowMainsPowerW: 'Sine power at low mains',
	caseMaxC: 'Hottest case allowed',
	supplyPowerW: 'Supply power at claimed output',
	dissipationW: 'Dissipation at claimed output',
	efficiency: 'Efficiency at claimed output',
	gain: 'Voltage gain',
	gainDb: 'Voltage gain in dB',
	inputCornerHz: 'Input high-pass corner',
	feedbackCornerHz: 'Feedback high-pass corner',
	lowCornerHz: 'Overall low corner',
	mainsVac: 'Mains',
	mainsHz: 'Mains frequency',
	transformerVA: 'Transformer',
	secondaryVac: 'Secondary per rail',
	rectifier: 'Rectifier',
	diodeDropV: 'Diode drop',
	reservoirF: 'Reservoir per rail',
	capRatingV: 'Reservoir voltage rating',
	loadCurrentA: 'Load current per rail',
	fuse: 'Primary fuse',
	'fuse.ratingA': 'Primary fuse rating',
	'fuse.type': 'Primary fuse type',
	chassis: 'Chassis',
	protectiveEarth: 'Protective earth bonded to chassis',
	doubleInsulated: 'Double insulated',
	bleeder: 'Bleeder',
	'bleeder.ohm': 'Bleeder resistor',
	mainsPowered: 'Mains powered',
	softStart: 'Soft-start fitted',
	regulationPct: 'Transformer regulation',
	mainsHighPct: 'High-mains allowance',
	mainsLowPct: 'Low-mains allowance',
	amplifierDemandW: 'Amplifier output fed',
	peakDcV: 'Peak DC rail at rated load',
	rippleVpp: 'Ripple',
	averageDcV: 'Average DC rail under load',
	offLoadPeakDcV: 'Rail off load',
	highMainsPeakDcV: 'Rail off load at high mains',
	lowMainsAverageDcV: 'Loaded rail at low mains',
	highMainsTotalDcV: 'Rail to rail at high mains',
	highMainsCapMarginRatio: 'Capacitor margin at high mains',
	railCount: 'Rails',
	primaryCurrentA: 'Primary current',
	fuseMinA: 'Suggested fuse from',
	fuseMaxA: 'Suggested fuse up to',
	storedEnergyJ: 'Stored energy',
	vaNeeded: 'Transformer VA needed',
	vaHeadroomRatio: 'VA headroom',
	bleederTimeS: 'Bleeder discharge time',
	bleederPowerW: 'Bleeder dissipation',
	secondaryRatedA: 'Winding current rating',
	capRippleRatingA: 'Reservoir ripple-current rating',
	secondaryRmsA: 'Winding current (RMS) at the load current',
	peakDiodeCurrentA: 'Peak diode current',
	diodeAverageA: 'Average current per diode',
	rippleCurrentA: 'Reservoir ripple current (RMS)',
	conductionDeg: 'Charging pulse length',
	windingRatedA: 'Winding rating used',
	windingLoadRatio: 'Winding load (current / rating)',
	powerW: 'Dissipation per device',
	devices: 'Devices on the heatsink',
	ambientC: 'Ambient',
	junctionMaxC: 'Junction max',
	rthJcKPerW: 'Rth junction–case',
	rthCsKPerW: 'Rth case–sink',
	rthSaKPerW: 'Rth sink–ambient',
	tabAtRail: 'Tab at a supply rail',
	tabInsulated: 'Tab insulated',
	heatsinkBondedToChassis: 'Heatsink bonded to chassis',
	junctionC: 'Junction temperature',
	caseC: 'Case temperature',
	sinkC: 'Heatsink temperature',
	requiredRthSaKPerW: 'Largest heatsink Rth (at the limit)',
	requiredRthSaForMarginKPerW: 'Largest heatsink Rth (with margin)',
	feasible: 'A heatsink can hold the junction',
	headroomC: 'Headroom to junction max',
	dcOffsetMv: 'DC offset per channel',
	noiseUv: 'Output noise',
	idleCurrentMa: 'Idle current',
	maxAbsOffsetMv: 'Largest DC offset',
	clipPowerW: 'Power at ≤ 1 % THD',
	maxMeasuredPowerW: 'Highest measured power',
	responseLowHz: 'Response low corner (−3 dB)',
	responseHighHz: 'Response high corner (−3 dB)',
	snr1WDb: 'SNR re 1 W',
	currentLimited: 'First start current limited',
	oscillationChecked: 'Oscillation checked',
	oscillationFound: 'Oscillation found',
	'heatSoak.minutes': 'Heat soak time',
	'heatSoak.sinkC': 'Heatsink after heat soak',
	maxRailDeviationPct: 'Largest rail deviation',
	maxIdleDeviationPct: 'Largest idle-current deviation'
};

/** Unit suffixes of field names, longest first (API.md: every numeric field name ends in its unit). */
const UNIT_SUFFIXES: ReadonlyArray<readonly [RegExp, string]> = [
	[/KPerW$/, 'K/W'],
	[/Ohm$/, 'Ω'],
	[/Vac$/, 'V AC'],
	[/Vpp$/, 'Vpp'],
	[/VA$/, 'VA'],
	[/Hz$/, 'Hz'],
	[/Db$/, 'dB'],
	[/Pct$/, '%'],
	[/Deg$/, '°'],
	[/Ratio$/, '×'],
	[/Mv$/, 'mV'],
	[/Ma$/, 'mA'],
	[/Uv$/, 'µV'],
	[/minutes$/, 'min'],
	[/[a-z]C$/, '°C'],
	[/[a-z]W$/, 'W'],
	[/[a-z]V$/, 'V'],
	[/[a-z]A$/, 'A'],
	[/[a-z]F$/, 'F'],
	[/[a-z]S$/, 's'],
	[/[a-z]J$/, 'J']
];

/** The unit a field name ends in, or '' (unitOf('rthSaKPerW') → 'K/W', unitOf('device.maxSupplyV') → 'V'). */
export function unitOf(key: string): string {
	const last = key.split('.').pop() ?? key;
	if (last === 'efficiency') return '%';
	if (last === 'ohm') return 'Ω';
	if (last === 'vaNeeded') return 'VA';
	for (const [re, unit] of UNIT_SUFFIXES) if (re.test(last)) return unit;
	return '';
}

/** A readable label for a field key (labelOf('maxPowerW') → 'Max sine power'). */
export function labelOf(key: string): string {
	if (LABELS[key]) return LABELS[key];
	const last = key.split('.');
	const words = last
		.map((p) => (/^\d+$/.test(p) ? `#${Number(p) + 1}` : p))
		.join(' ')
		.replace(/(KPerW|Ohm|Vac|Vpp|VA|Hz|Db|Pct|Ratio|Mv|Ma|Uv|C|W|V|A|F|S|J)$/, '')
		.replace(/([a-z])([A-Z])/g, '$1 $2')
		.toLowerCase()
		.trim();
	return words.charAt(0).toUpperCase() + words.slice(1);
}

/**
 * 3 significant figures, the same rounding as the bench tools (sig): sig3(31.0296) → "31"; sig3(12345) → "12,300";
 * very large or small numbers in exponent form, sig3(1.234e-4) → "1.23e-4".
 */
export function sig3(x: number): string {
	if (!Number.isFinite(x)) return String(x);
	const r = Number(x.toPrecision(3));
	return Math.abs(r) >= 1e6 || (Math.abs(r) < 1e-3 && r !== 0) ? r.toExponential(2) : sig(r, 3);
}

/** Readable names of the enumerated spec-block inputs (stored values stay the API's). */
const CHOICE_LABELS: Record<string, Record<string, string>> = {
	topology: TOPOLOGY_LABELS,
	supply: { split: 'split (± rails)', single: 'single rail' },
	classA: { 'push-pull': 'push-pull', 'single-ended': 'single-ended' },
	rectifier: {
		bridge: 'bridge, one rail',
		'bridge-split': 'bridge on a centre tap, ± rails',
		'center-tap': 'two diodes, centre tap',
		'half-wave': 'half-wave'
	},
	type: { slow: 'slow (time-delay)', fast: 'fast' },
	chassis: { metal: 'metal', plastic: 'plastic', wood: 'wood', none: 'no chassis' }
};

/**
 * A value with its unit for display: ohms, farads and henries with an engineering prefix ("4.7 kΩ", "100 nF";
 * reservoirs of 1 mF and more also in µF, "10 000 µF (10 mF)"),
 * efficiency 0–1 as percent, booleans as yes/no, others with 3 significant figures ("31 W").
 */
export function showValue(key: string, value: unknown): string {
	if (value === null || value === undefined) return '—';
	if (typeof value === 'string') {
		const last = key.split('.').pop() ?? key;
		return CHOICE_LABELS[last]?.[value] ?? value;
	}
	if (typeof value === 'boolean') return value ? 'yes' : 'no';
	if (typeof value === 'number') {
		const unit = unitOf(key);
		const last = key.split('.').pop() ?? key;
		if (last === 'efficiency') return `${sig3(value * 100)} %`;
		if (last === 'gain') return `${sig3(value)} ×`;
		if (unit === 'F' && value >= 1e-3) return showCapacitance(value);
		if (unit === 'F' || unit === 'Ω') {
			try {
				return formatValue(value, unit === 'Ω' ? 'ohm' : unit);
			} catch {
				return String(value);
			}
		}
		if (unit === '×') return `${sig3(value)} ×`;
		if (unit === '°') return `${sig3(value)}°`;
		return unit ? `${sig3(value)} ${unit}` : sig3(value);
	}
	if (Array.isArray(value)) return value.length ? value.map((v) => showValue(key, v)).join(', ') : '—';
	if (typeof value === 'object') return JSON.stringify(value);
	return String(value);
}

/** Input rows of a block for display: flattened, with a rail typed as "±30" shown as typed in railV's row. */
export function inputRows(data: Record<string, unknown> | null | undefined): [string, unknown][] {
	const d = data ?? {};
	const typed = typeof d.railText === 'string' ? d.railText.trim() : '';
	return flatten(d)
		.filter(([k]) => k !== 'railText')
		.map(([k, v]): [string, unknown] => (k === 'railV' && typed && typeof v === 'number' && /^(?:±|\+\s*\/?\s*-)?\s*[\d.,]+\s*V?$/i.test(typed) ? [k, /V$/i.test(typed) ? typed : `${typed} V`] : [k, v]));
}

/**
 * Flatten a block's nested data into [dotted key, value] rows for display; arrays of numbers stay one row,
 * arrays of objects (points, rails) are left out (they have their own tables and plots).
 * flatten({ device: { maxSupplyV: 60 } }) → [['device.maxSupplyV', 60]].
 */
export function flatten(data: unknown, prefix = ''): [string, unknown][] {
	if (data === null || typeof data !== 'object' || Array.isArray(data)) return prefix ? [[prefix, data]] : [];
	const rows: [string, unknown][] = [];
	for (const [k, v] of Object.entries(data as Record<string, unknown>)) {
		const key = prefix ? `${prefix}.${k}` : k;
		if (Array.isArray(v)) {
			if (v.every((x) => typeof x === 'number' || typeof x === 'string')) rows.push([key, v]);
		} else if (v !== null && typeof v === 'object') rows.push(...flatten(v, key));
		else rows.push([key, v]);
	}
	return rows;
}

const ORDER = Object.keys(LABELS);

/**
 * Sort [key, value] rows into a reading order: first by `preferred` (e.g. the form's field order), then by
 * the order of the label table, else alphabetically (jsonb storage reorders object keys).
 */
export function inReadingOrder<T>(rows: [string, T][], preferred: readonly string[] = []): [string, T][] {
	const rank = (k: string) => {
		const p = preferred.indexOf(k);
		if (p >= 0) return p;
		const o = ORDER.indexOf(k);
		return o >= 0 ? preferred.length + o : preferred.length + ORDER.length;
	};
	return [...rows].sort((a, b) => rank(a[0]) - rank(b[0]) || a[0].localeCompare(b[0]));
}

/** Check levels, most serious first, and their labels. */
export const LEVELS = ['danger', 'caution', 'note'] as const;
/** Label of a check level. */
export const LEVEL_LABEL: Record<string, string> = { note: 'Note', caution: 'Caution', danger: 'Danger' };

/** Sort checks most serious first (danger, caution, note), stable otherwise. */
export function bySeverity<T extends { level: string }>(checks: readonly T[]): T[] {
	const rank = (l: string) => {
		const i = (LEVELS as readonly string[]).indexOf(l);
		return i < 0 ? LEVELS.length : i;
	};
	return [...checks].sort((a, b) => rank(a.level) - rank(b.level));
}

/**
 * Whether any of these blocks draws plots: a measurements block with response or THD points (the spec block
 * view then needs the line-plot component). hasPlots([{ kind: 'measurements', data: { points: { thd: [p] } } }]) → true.
 */
export function hasPlots(blocks: readonly { kind: string; data: unknown }[]): boolean {
	return blocks.some((b) => {
		if (b.kind !== 'measurements') return false;
		const points = (b.data as { points?: { response?: unknown; thd?: unknown } } | null)?.points;
		return (Array.isArray(points?.response) && points.response.length > 0) || (Array.isArray(points?.thd) && points.thd.length > 0);
	});
}
