/**
 * Capacitor-input linear supply: transformer → rectifier → reservoir (REFERENCE.md §4).
 * Sources: Horowitz & Hill, The Art of Electronics, ch. 1 rectifiers and filters (ripple ≈ I/(2·f·C) full wave);
 * RC discharge for bleeders (standard); transformer and capacitor-margin rules are common practice, no single source.
 * CAUTION: mains and stored charge can kill or burn. These numbers inform a design, they certify nothing —
 * defer to local codes and licensed practice.
 */
import { InputRangeError } from './values';
import { RECTIFIERS, type RectifierKind } from './choices';

/** Rectifier arrangements (API.md /tools/supply), kept in ./choices. */
export { RECTIFIERS, type RectifierKind };

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

/**
 * RMS-to-DC current ratio of the charging pulses of a full-wave capacitor-input rectifier: 1.8. Transformer makers'
 * rectifier design tables give the secondary AC current of a full-wave bridge with capacitor input as about 1.8 ×
 * the DC load current (a transformer maker's rectifier design guide; figure from memory — check the guide of the
 * transformer you buy). The real ratio depends on the winding resistance and the reservoir (Schade's curves);
 * 1.8 is the design-table figure for a well-sized supply.
 */
export const CAPACITOR_INPUT_FORM_FACTOR = 1.8;

/** Inputs of rectifierCurrents(). */
export interface RectifierCurrentsInput {
	rectifier: RectifierKind;
	/** DC load current per rail, A (both rails equally loaded for bridge-split). */
	loadCurrentA: number;
	/** RMS/DC ratio of the charging pulses (default CAPACITOR_INPUT_FORM_FACTOR). */
	formFactor?: number;
}

/** Currents of a capacitor-input rectifier at one DC load current per rail. */
export interface RectifierCurrents {
	/** RMS current in the winding that feeds one rail (each half of a centre-tapped winding), A. */
	secondaryRmsA: number;
	/** Peak current of one charging pulse through a diode, A. */
	peakDiodeCurrentA: number;
	/** Average current through one diode, A. */
	diodeAverageA: number;
	/** RMS ripple current in the reservoir of one rail, A. */
	rippleCurrentA: number;
	/** How long each charging pulse lasts, in degrees of the mains cycle. */
	conductionDeg: number;
}

/**
 * Secondary, diode and reservoir currents of a capacitor-input rectifier. Method: the charging current of one rail is
 * a train of pulses, one per ripple period (half a mains cycle, full wave), whose RMS is formFactor × the DC load
 * current (transformer makers' design tables, 1.8 for full wave); each pulse is taken as a triangle (the usual
 * conduction-angle approximation: charging starts where the rising sine meets the reservoir's valley and stops near
 * the crest). A triangle train of duty D (pulse width / period) has RMS/DC = 2/√(3D) and peak/DC = 2/D, so
 * D = 4/(3·k²) and the peak is 1.5·k²·I. Then, per winding: a bridge's winding and each half of a bridge-split
 * winding carry every pulse (RMS k·I); each half of a two-diode centre-tap winding carries every other one
 * (k·I/√2); a half-wave winding carries one pulse per mains cycle of the same width and twice the charge (√2·k·I,
 * peak 3·k²·I). The reservoir carries the pulses less the DC it delivers: √(RMS² − I²).
 * 3 A, bridge-split → secondaryRmsA 5.4, peakDiodeCurrentA 14.58, rippleCurrentA 4.49, conductionDeg 74.1.
 */
export function rectifierCurrents(input: RectifierCurrentsInput): RectifierCurrents {
	const { rectifier, loadCurrentA, formFactor = CAPACITOR_INPUT_FORM_FACTOR } = input;
	if (!(rectifier in DIODE_DROPS)) throw new InputRangeError('rectifier', `unknown rectifier "${String(rectifier)}"`);
	nonNeg('loadCurrentA', loadCurrentA, 'A');
	if (!(Number.isFinite(formFactor) && formFactor > 1 && formFactor <= 5))
		throw new InputRangeError('formFactor', 'formFactor must be above 1 and at most 5');
	const k = formFactor;
	const I = loadCurrentA;
	const duty = 4 / (3 * k * k);
	const conductionDeg = 180 * duty;
	if (rectifier === 'half-wave') {
		const rms = Math.SQRT2 * k * I;
		return { secondaryRmsA: rms, peakDiodeCurrentA: 3 * k * k * I, diodeAverageA: I, rippleCurrentA: Math.sqrt(Math.max(0, rms * rms - I * I)), conductionDeg };
	}
	const train = k * I;
	return {
		secondaryRmsA: rectifier === 'center-tap' ? train / Math.SQRT2 : train,
		peakDiodeCurrentA: 1.5 * k * k * I,
		diodeAverageA: I / 2,
		rippleCurrentA: Math.sqrt(Math.max(0, train * train - I * I)),
		conductionDeg
	};
}

/**
 * Rated RMS current of the winding that feeds one rail, from the transformer's VA when the winding's own rating is
 * not known: the VA spread over the whole secondary (two halves of secondaryVac for bridge-split and centre-tap,
 * one winding otherwise), assuming the transformer has no other secondary. windingRatingFromVaA(300, 25, 'bridge-split') → 6 A.
 */
export function windingRatingFromVaA(transformerVA: number, secondaryVac: number, rectifier: RectifierKind): number {
	pos('transformerVA', transformerVA, 'VA');
	pos('secondaryVac', secondaryVac, 'V');
	const halves = rectifier === 'bridge-split' || rectifier === 'center-tap' ? 2 : 1;
	return transformerVA / (halves * secondaryVac);
}

/** Inputs of railSag(): the supply, how the transformer sags, and the class AB amplifier it feeds. */
export interface RailSagInput {
	secondaryVac: number;
	rectifier: RectifierKind;
	diodeDropV?: number;
	mainsHz: number;
	/** Reservoir per rail, F. */
	capacitanceF: number;
	/** Off-load rise over the rated secondary, % (default 10). */
	regulationPct?: number;
	/** Rated RMS current of the winding that feeds one rail, A (the rail is at the rated secondary there). */
	windingRatedA: number;
	/** Mains relative to nominal, % (−10 for low mains; default 0). */
	mainsPct?: number;
	/** Class AB/B stages on these rails (channels). */
	channels: number;
	loadOhm: number;
	/** Output swing lost per side, V. */
	dropoutV?: number;
	/** Standing current drawn from each rail by all stages together, A. */
	quiescentA?: number;
}

/** One point of railSag(): output power per channel and the rail (per rail, average under load) at it. */
export interface RailSagPoint {
	powerW: number;
	railV: number;
	loadCurrentA: number;
}

/**
 * The rail under load, from idle to clipping (the supply bench tool's plot; REFERENCE.md §4.2 "the amp's clipping power
 * must be computed from the loaded rail"). Model: the crest falls linearly with the DC load from the off-load value
 * √2·Vac·(1 + reg) to the rated √2·Vac at the DC current that loads the winding to its rating (windingRatedA /
 * (RMS/DC ratio of rectifierCurrents)) — a straight-line regulation model (common practice, no single source); then
 * the diode drops and half the ripple I/(fr·C) come off. Each class B channel draws Vpk/(π·R) from each rail for a
 * sine of peak Vpk (REFERENCE.md §4.3); a one-rail supply feeds a capacitor-coupled stage whose swing is half the
 * rail. Clipping: where the peak swing plus the dropout meets the per-side rail. `points` run from idle to clipping.
 */
export function railSag(input: RailSagInput, steps = 40): { points: RailSagPoint[]; clipPowerW: number; clipRailV: number; idleRailV: number } {
	const { secondaryVac, rectifier, diodeDropV = 0.7, mainsHz, capacitanceF, regulationPct = REGULATION_ASSUMED_PCT, windingRatedA, mainsPct = 0, channels, loadOhm, dropoutV = 0, quiescentA = 0 } = input;
	pos('secondaryVac', secondaryVac, 'V');
	pos('capacitanceF', capacitanceF, 'F');
	pos('windingRatedA', windingRatedA, 'A');
	pos('loadOhm', loadOhm, 'Ω');
	pos('channels', channels, '');
	nonNeg('dropoutV', dropoutV, 'V');
	nonNeg('quiescentA', quiescentA, 'A');
	nonNeg('regulationPct', regulationPct, '%');
	if (!(Number.isFinite(mainsPct) && mainsPct > -100)) throw new InputRangeError('mainsPct', 'mainsPct must be above −100 %');
	const fr = rippleHz(rectifier, mainsHz);
	const drops = DIODE_DROPS[rectifier] * diodeDropV;
	const crest = Math.SQRT2 * secondaryVac * (1 + mainsPct / 100);
	const perWindingRatio = rectifierCurrents({ rectifier, loadCurrentA: 1 }).secondaryRmsA;
	const ratedDcA = windingRatedA / perWindingRatio;
	const reg = regulationPct / 100;
	const rail = (i: number) => crest * (1 + reg * Math.max(0, 1 - i / ratedDcA)) - drops - i / (fr * capacitanceF) / 2;
	const perSide = (v: number) => (RAIL_COUNT[rectifier] === 2 ? v : v / 2);
	const current = (vpk: number) => quiescentA + (channels * vpk) / (Math.PI * loadOhm);
	const idleRailV = rail(quiescentA);
	if (!(perSide(idleRailV) > dropoutV))
		throw new InputRangeError('dropoutV', 'the rail at idle does not clear the dropout: no output is possible');
	// f(vpk) = per-side rail − dropout − vpk falls as vpk rises: bisect for its zero.
	let lo = 0;
	let hi = perSide(idleRailV) - dropoutV;
	for (let n = 0; n < 60; n++) {
		const mid = (lo + hi) / 2;
		if (perSide(rail(current(mid))) - dropoutV - mid > 0) lo = mid;
		else hi = mid;
	}
	const clipVpk = lo;
	const clipPowerW = (clipVpk * clipVpk) / (2 * loadOhm);
	const points: RailSagPoint[] = [];
	for (let n = 0; n <= steps; n++) {
		const vpk = (clipVpk * n) / steps;
		const i = current(vpk);
		points.push({ powerW: (vpk * vpk) / (2 * loadOhm), railV: rail(i), loadCurrentA: i });
	}
	return { points, clipPowerW, clipRailV: rail(current(clipVpk)), idleRailV };
}
