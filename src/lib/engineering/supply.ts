/**
 * Capacitor-input linear supply: transformer → rectifier → reservoir (REFERENCE.md §4).
 * Sources: Horowitz & Hill, The Art of Electronics, ch. 1 rectifiers and filters (ripple ≈ I/(2·f·C) full wave);
 * RC discharge for bleeders (standard); transformer and capacitor-margin rules are common practice, no single source.
 * CAUTION: mains and stored charge can kill or burn. These numbers inform a design, they certify nothing —
 * defer to local codes and licensed practice.
 */
import { InputRangeError } from './values';

/** Rectifier arrangements (API.md /tools/supply). */
export type RectifierKind = 'bridge' | 'bridge-split' | 'center-tap' | 'half-wave';
/** All rectifier kinds. */
export const RECTIFIERS = ['bridge', 'bridge-split', 'center-tap', 'half-wave'] as const;

/** Diode drops in each rail's charging path: bridge 2, bridge-split 1, centre-tap 1, half-wave 1. */
export const DIODE_DROPS: Readonly<Record<RectifierKind, number>> = {
	bridge: 2,
	'bridge-split': 1,
	'center-tap': 1,
	'half-wave': 1
};

/** Rails a rectifier makes: bridge-split gives ± rails, the others one. */
export const RAIL_COUNT: Readonly<Record<RectifierKind, number>> = {
	bridge: 1,
	'bridge-split': 2,
	'center-tap': 1,
	'half-wave': 1
};

/** Ripple frequency as a multiple of mains: 2 for full wave, 1 for half wave. rippleHz('bridge', 50) → 100. */
export function rippleHz(rectifier: RectifierKind, mainsHz: number): number {
	if (!(rectifier in DIODE_DROPS)) throw new InputRangeError('rectifier', `unknown rectifier "${String(rectifier)}"`);
	pos('mainsHz', mainsHz, 'Hz');
	return rectifier === 'half-wave' ? mainsHz : 2 * mainsHz;
}

function pos(field: string, v: number, unit: string): void {
	if (!(typeof v === 'number' && Number.isFinite(v) && v > 0))
		throw new InputRangeError(field, `${field} must be a finite number greater than 0 ${unit}`);
}
function nonNeg(field: string, v: number, unit: string): void {
	if (!(typeof v === 'number' && Number.isFinite(v) && v >= 0))
		throw new InputRangeError(field, `${field} must be a finite number of 0 ${unit} or more`);
}

/** Inputs of supplyRails(). */
export interface SupplyRailsInput {
	/** RMS of the winding that feeds one rail (each half of a centre-tapped winding). V. */
	secondaryVac: number;
	rectifier: RectifierKind;
	/** Forward drop per diode. V. */
	diodeDropV?: number;
	mainsHz: number;
	/** Per rail. A. */
	loadCurrentA: number;
	/** Per rail. F. */
	capacitanceF: number;
}

/** Outputs of supplyRails(): per rail. */
export interface SupplyRailsOutput {
	/** Unloaded DC rail √2·Vac − n·Vf. V. */
	peakDcV: number;
	/** I/(fr·C), fr = 2f full wave, f half wave. V peak-to-peak. */
	rippleVpp: number;
	/** peakDcV − rippleVpp/2. V. */
	averageDcV: number;
}

/** Unloaded DC rail √2·Vac − n·Vf, V. unloadedRailV(25, 'bridge-split', 0.8) → 34.56 V. */
export function unloadedRailV(secondaryVac: number, rectifier: RectifierKind, diodeDropV = 0.7): number {
	pos('secondaryVac', secondaryVac, 'V');
	nonNeg('diodeDropV', diodeDropV, 'V');
	const n = DIODE_DROPS[rectifier];
	if (n === undefined) throw new InputRangeError('rectifier', `unknown rectifier "${String(rectifier)}"`);
	const v = Math.SQRT2 * secondaryVac - n * diodeDropV;
	if (!(v > 0))
		throw new InputRangeError('diodeDropV', `the diode drops (${n} × ${diodeDropV} V) eat the whole ${secondaryVac} V secondary`);
	return v;
}

/**
 * Rails of a capacitor-input supply (API.md /tools/supply), per rail. Assumes constant load current
 * discharging the reservoir for a whole ripple period (slightly pessimistic), ESR ignored.
 * 25 V, bridge-split, 0.8 V, 50 Hz, 3 A, 10 mF → peakDcV 34.56, rippleVpp 3.0, averageDcV 33.06.
 */
export function supplyRails(input: SupplyRailsInput): SupplyRailsOutput {
	const { secondaryVac, rectifier, diodeDropV = 0.7, mainsHz, loadCurrentA, capacitanceF } = input;
	const peakDcV = unloadedRailV(secondaryVac, rectifier, diodeDropV);
	nonNeg('loadCurrentA', loadCurrentA, 'A');
	pos('capacitanceF', capacitanceF, 'F');
	const rippleVpp = loadCurrentA / (rippleHz(rectifier, mainsHz) * capacitanceF);
	if (rippleVpp >= peakDcV)
		throw new InputRangeError(
			'capacitanceF',
			`the ripple (${rippleVpp.toFixed(1)} Vpp) would exceed the ${peakDcV.toFixed(1)} V rail: capacitanceF is far too small for loadCurrentA`
		);
	return { peakDcV, rippleVpp, averageDcV: peakDcV - rippleVpp / 2 };
}

/** Regulation assumed when a transformer's is not known: 10 % (common practice for small toroids; laminated cores run higher). */
export const REGULATION_ASSUMED_PCT = 10;
/** Mains above and below nominal designed for: ±10 % (usual design figure; national limits from memory). */
export const MAINS_TOLERANCE_PCT = 10;

/** Inputs of supplyWorstCase(): the bench tool's inputs plus regulation and mains tolerance. */
export interface SupplyWorstCaseInput extends SupplyRailsInput {
	/** Transformer regulation, off-load rise over the full-load rating, % (default 10). */
	regulationPct?: number;
	/** Mains above nominal, % (default 10). */
	mainsHighPct?: number;
	/** Mains below nominal, % (default 10). */
	mainsLowPct?: number;
}

/** Outputs of supplyWorstCase(), per rail unless named total. */
export interface SupplyWorstCaseOutput extends SupplyRailsOutput {
	/** √2·Vac·(1 + reg) − drops: off load at nominal mains. */
	offLoadPeakDcV: number;
	/** √2·Vac·(1 + reg)·(1 + mains high) − drops: what the capacitors and devices must withstand. */
	highMainsPeakDcV: number;
	/** √2·Vac·(1 − mains low) − drops − ripple/2: the loaded rail at low mains. */
	lowMainsAverageDcV: number;
	/** highMainsPeakDcV × 2 for bridge-split (rail to rail), else highMainsPeakDcV. */
	highMainsTotalDcV: number;
	regulationPct: number;
	mainsHighPct: number;
	mainsLowPct: number;
}

/**
 * Rails of a capacitor-input supply at the conditions that matter (API.md "Checks, revision 2"): the bench tool's
 * peakDcV / rippleVpp / averageDcV (full-load secondary, nominal mains) plus the off-load, high-mains and
 * low-mains rails. The secondary rating is at full load; off load it rises by the regulation figure.
 * 25 V, bridge-split, 0.8 V, reg 7 %, +10 % → highMainsPeakDcV 40.81 V, highMainsTotalDcV 81.62 V.
 */
export function supplyWorstCase(input: SupplyWorstCaseInput): SupplyWorstCaseOutput {
	const { regulationPct = REGULATION_ASSUMED_PCT, mainsHighPct = MAINS_TOLERANCE_PCT, mainsLowPct = MAINS_TOLERANCE_PCT } = input;
	nonNeg('regulationPct', regulationPct, '%');
	nonNeg('mainsHighPct', mainsHighPct, '%');
	nonNeg('mainsLowPct', mainsLowPct, '%');
	if (mainsLowPct >= 100) throw new InputRangeError('mainsLowPct', 'mainsLowPct must be below 100 %');
	const rails = supplyRails(input);
	const drops = DIODE_DROPS[input.rectifier] * (input.diodeDropV ?? 0.7);
	const crest = Math.SQRT2 * input.secondaryVac;
	const offLoadPeakDcV = crest * (1 + regulationPct / 100) - drops;
	const highMainsPeakDcV = crest * (1 + regulationPct / 100) * (1 + mainsHighPct / 100) - drops;
	const lowMainsAverageDcV = crest * (1 - mainsLowPct / 100) - drops - rails.rippleVpp / 2;
	if (!(lowMainsAverageDcV > 0))
		throw new InputRangeError('capacitanceF', 'at low mains the ripple would take the whole rail: capacitanceF is far too small for loadCurrentA');
	return {
		...rails,
		offLoadPeakDcV,
		highMainsPeakDcV,
		lowMainsAverageDcV,
		highMainsTotalDcV: RAIL_COUNT[input.rectifier] * highMainsPeakDcV,
		regulationPct,
		mainsHighPct,
		mainsLowPct
	};
}

/** Inputs of reservoirForRippleF(). */
export interface ReservoirInput {
	loadCurrentA: number;
	mainsHz: number;
	rippleVpp: number;
	rectifier?: RectifierKind;
}

/** Reservoir capacitance for a ripple target, C = I/(fr·Vpp), F. reservoirForRippleF({ loadCurrentA: 2, mainsHz: 50, rippleVpp: 2 }) → 0.01 F (10 000 µF). */
export function reservoirForRippleF(input: ReservoirInput): number {
	const { loadCurrentA, mainsHz, rippleVpp, rectifier = 'bridge' } = input;
	nonNeg('loadCurrentA', loadCurrentA, 'A');
	pos('rippleVpp', rippleVpp, 'V');
	return loadCurrentA / (rippleHz(rectifier, mainsHz) * rippleVpp);
}

/**
 * Capacitor voltage margin = rating / rail (common practice: ≥ 1.2 against the high-mains rail; < 1 is over-voltage).
 * capMarginRatio(50, 40.81) → 1.225.
 */
export function capMarginRatio(capRatingV: number, railV: number): number {
	pos('capRatingV', capRatingV, 'V');
	pos('railV', railV, 'V');
	return capRatingV / railV;
}

/** Multiplier of the transformer VA rule (common practice, no single source: 1.0–2.0 × the sum of output powers, 1.5 the middle). */
export const TRANSFORMER_VA_FACTOR = 1.5;

/**
 * Transformer VA for a class AB amplifier by the rule of thumb VA ≈ factor × Σ rated output power
 * (factor 1.5 by default; common practice, no single source). transformerVaNeeded([50, 50]) → 150 VA.
 */
export function transformerVaNeeded(outputPowersW: number | readonly number[], factor = TRANSFORMER_VA_FACTOR): number {
	const list = typeof outputPowersW === 'number' ? [outputPowersW] : [...outputPowersW];
	if (list.length === 0) throw new InputRangeError('outputPowersW', 'give at least one output power');
	list.forEach((p, i) => nonNeg(`outputPowersW.${i}`, p, 'W'));
	pos('factor', factor, '');
	return factor * list.reduce((a, b) => a + b, 0);
}

/** Inputs of bleederTimeS(). */
export interface BleederInput {
	bleederOhm: number;
	capacitanceF: number;
	startV: number;
	/** Voltage considered discharged. V. */
	safeV: number;
}

/** Time for a bleeder to discharge a reservoir from startV to safeV, t = R·C·ln(V0/Vsafe), s. 4.7 kΩ, 10 mF, 50 V → 5 V: 108.2 s. */
export function bleederTimeS(input: BleederInput): number {
	const { bleederOhm, capacitanceF, startV, safeV } = input;
	pos('bleederOhm', bleederOhm, 'Ω');
	pos('capacitanceF', capacitanceF, 'F');
	pos('startV', startV, 'V');
	pos('safeV', safeV, 'V');
	if (safeV >= startV) return 0;
	return bleederOhm * capacitanceF * Math.log(startV / safeV);
}

/** Bleeder dissipation at a rail, P = V²/R, W (choose a part rated well above it). bleederPowerW(50, 4700) → 0.532 W. */
export function bleederPowerW(railV: number, bleederOhm: number): number {
	nonNeg('railV', railV, 'V');
	pos('bleederOhm', bleederOhm, 'Ω');
	return (railV * railV) / bleederOhm;
}

/** Energy stored in a capacitor, E = ½·C·V², J. storedEnergyJ(0.01, 40) → 8 J. */
export function storedEnergyJ(capacitanceF: number, voltageV: number): number {
	nonNeg('capacitanceF', capacitanceF, 'F');
	if (!Number.isFinite(voltageV)) throw new InputRangeError('voltageV', 'voltageV must be finite');
	return 0.5 * capacitanceF * voltageV * voltageV;
}

/** Full-load primary current Ip = VA/Vmains, A. primaryCurrentA(160, 230) → 0.696 A. */
export function primaryCurrentA(transformerVA: number, mainsVac: number): number {
	pos('transformerVA', transformerVA, 'VA');
	pos('mainsVac', mainsVac, 'V');
	return transformerVA / mainsVac;
}

/**
 * Usual time-delay primary fuse range, 1.5–3 × full-load primary current (common practice, no single source;
 * toroids may need more for inrush — ask the transformer maker). primaryFuseRangeA(160, 230) → { minA: 1.04, maxA: 2.09 }.
 */
export function primaryFuseRangeA(transformerVA: number, mainsVac: number): { minA: number; maxA: number } {
	const ip = primaryCurrentA(transformerVA, mainsVac);
	return { minA: 1.5 * ip, maxA: 3 * ip };
}
