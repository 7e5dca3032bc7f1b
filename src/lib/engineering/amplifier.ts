/**
 * Class B / AB output stage into a resistive load, gain and corner frequencies.
 * Model (REFERENCE.md §1–2, §5): continuous sine, resistive load, rails do not sag, quiescent current ignored.
 * Sources: power-amp IC datasheet thermal method ("Determining Maximum Power Dissipation" eq. for
 * worst-case and at-output dissipation, total-supply form); Horowitz & Hill, The Art of Electronics;
 * the class-B efficiency derivation η = (π/4)·(Vpk/Vrail) (textbook result).
 */
import { InputRangeError } from './values';
import { minimumImpedanceOhm } from './speaker';
import { TOPOLOGIES, type Topology } from './choices';

/** "split": ±railV; "single": one supply of railV, treated as a split supply of railV/2 (output capacitor coupled). */
export type SupplyKind = 'split' | 'single';

/** Inputs of amplifierOutput (API.md /tools/amplifier). */
export interface AmplifierInput {
	supply: SupplyKind;
	/** split: each rail's magnitude; single: the whole supply. V. */
	railV: number;
	loadOhm: number;
	/** Output swing lost per side (saturation / "clipping voltage"). V. */
	dropoutV?: number;
	/** An output power to evaluate supply power, dissipation and efficiency at. W. */
	outputW?: number;
}

/** Outputs of amplifierOutput (API.md). */
export interface AmplifierOutput {
	maxPowerW: number;
	peakVoltageV: number;
	peakCurrentA: number;
	rmsVoltageV: number;
	worstDissipationW: number;
	supplyPowerW?: number;
	dissipationW?: number;
	efficiency?: number;
}

function positive(field: string, v: number, unit: string): void {
	if (!(typeof v === 'number' && Number.isFinite(v) && v > 0))
		throw new InputRangeError(field, `${field} must be a finite number greater than 0 ${unit}`.trim());
}

/** Per-side rail of a supply: split → railV, single → railV/2. railPerSideV('single', 40) → 20. */
export function railPerSideV(supply: SupplyKind, railV: number): number {
	if (supply !== 'split' && supply !== 'single') throw new InputRangeError('supply', 'supply must be "split" or "single"');
	positive('railV', railV, 'V');
	return supply === 'split' ? railV : railV / 2;
}

/** Total supply V+ − V− (what a device's maximum supply rating compares with). totalSupplyV('split', 35) → 70. */
export function totalSupplyV(supply: SupplyKind, railV: number): number {
	return 2 * railPerSideV(supply, railV);
}

/**
 * Class B worst-case dissipation per channel, 2·Vrail²/(π²·RL), Vrail = one rail of a split supply
 * (≡ Vtotal²/(2π²·RL), the datasheet's total-supply form). Occurs at Vpk = 2·Vrail/π.
 * worstCaseDissipationW(35, 8) → 31.03 W.
 */
export function worstCaseDissipationW(railV: number, loadOhm: number): number {
	positive('railV', railV, 'V');
	positive('loadOhm', loadOhm, 'Ω');
	return (2 * railV * railV) / (Math.PI * Math.PI * loadOhm);
}

/**
 * Maximum undistorted sine output and class B dissipation (API.md /tools/amplifier).
 * Vpk = Vrail − dropoutV; P = Vpk²/(2·RL); at outputW: Pin = 2·Vrail·Vpk/(π·RL), Pd = Pin − P, η = P/Pin.
 * worstDissipationW uses the full rail (dropout ignored). outputW > maxPowerW → InputRangeError('outputW').
 * ±35 V, 8 Ω, dropoutV 3 → maxPowerW 64, peakCurrentA 4, rmsVoltageV 22.63; at outputW 64: supplyPowerW 89.13, efficiency 0.718.
 */
export function amplifierOutput(input: AmplifierInput): AmplifierOutput {
	const { supply, railV, loadOhm, dropoutV = 0, outputW } = input;
	const rail = railPerSideV(supply, railV);
	positive('loadOhm', loadOhm, 'Ω');
	if (!(Number.isFinite(dropoutV) && dropoutV >= 0)) throw new InputRangeError('dropoutV', 'dropoutV must be 0 V or more');
	const peakVoltageV = rail - dropoutV;
	if (!(peakVoltageV > 0))
		throw new InputRangeError(
			'dropoutV',
			`dropoutV (${dropoutV} V) must be less than the ${supply === 'single' ? 'half-supply' : 'rail'} voltage (${rail} V)`
		);
	const maxPowerW = (peakVoltageV * peakVoltageV) / (2 * loadOhm);
	const out: AmplifierOutput = {
		maxPowerW,
		peakVoltageV,
		peakCurrentA: peakVoltageV / loadOhm,
		rmsVoltageV: peakVoltageV / Math.SQRT2,
		worstDissipationW: worstCaseDissipationW(rail, loadOhm)
	};
	if (outputW !== undefined) {
		positive('outputW', outputW, 'W');
		if (outputW > maxPowerW * (1 + 1e-9))
			throw new InputRangeError(
				'outputW',
				`outputW (${outputW} W) is above the ${maxPowerW.toFixed(2)} W these rails can give into ${loadOhm} Ω`
			);
		const vpk = Math.min(peakVoltageV, Math.sqrt(2 * outputW * loadOhm));
		const supplyPowerW = (2 * rail * vpk) / (Math.PI * loadOhm);
		out.supplyPowerW = supplyPowerW;
		out.dissipationW = supplyPowerW - outputW;
		out.efficiency = outputW / supplyPowerW;
	}
	return out;
}

/** Amplifier topologies (API.md), kept in ./choices. */
export { TOPOLOGIES, type Topology };

/** Mains rise a worst-case figure designs for when none is given: +10 % (usual design figure; national limits from memory). */
export const MAINS_HIGH_PCT = 10;
/** Class D efficiency assumed when none is given, % (API.md revision 2 default). */
export const CLASS_D_EFFICIENCY_PCT = 85;

/** Inputs of stageWorstCase(): one amplifier stage (channel) and the conditions it sees (API.md "Checks, revision 2"). */
export interface StageInput {
	topology: Topology;
	supply: SupplyKind;
	/** split: each rail's magnitude; single: the whole supply. V (nominal, as stated). */
	railV: number;
	/** Nominal load, Ω. */
	loadOhm: number;
	/** Output swing lost per side, V. */
	dropoutV?: number;
	/** Mains above nominal designed for, % (default 10). */
	mainsHighPct?: number;
	/** Standing current one stage draws from the rails (datasheet), A. */
	quiescentA?: number;
	/** Two stages drive the load in bridge. */
	bridged?: boolean;
	/** Class A output-stage standing current, A (required for class-a). */
	biasA?: number | null;
	classA?: 'push-pull' | 'single-ended';
	/** Class D efficiency, % (default 85). */
	efficiencyPct?: number;
	/**
	 * The per-side rail at high mains when something better than railV·(1 + mainsHighPct/100) is known —
	 * in a build, the supply block's off-load rail at high mains. V.
	 */
	highMainsRailV?: number | null;
}

/** Outputs of stageWorstCase(); null where the topology is not modelled (valve). */
export interface StageWorstCase {
	/** Per-side rail V (nominal). */
	railV: number;
	/** Per-side rail at high mains, off load (Vhi). */
	highMainsRailV: number;
	/** Total supply at high mains, 2·Vhi (what device.maxSupplyV compares with). */
	highMainsTotalV: number;
	/** 0.8 × the nominal load (IEC 60268-5 convention). */
	minImpedanceOhm: number;
	/** (V−d)²/(2R), bridged 2(V−d)²/R. */
	railLimitPowerW: number | null;
	/** Class A: push-pull 2·biasA²·R, single-ended biasA²·R/2. */
	biasLimitPowerW: number | null;
	maxPowerW: number | null;
	/** Textbook worst case at the stated rail and nominal load. */
	worstDissipationW: number | null;
	/** Worst case at Vhi and the minimum impedance, quiescent included; per channel (both stages when bridged). */
	designDissipationW: number | null;
	/** Peak output current at Vhi into the minimum impedance, (Vhi − d)/Rmin (bridged 2(Vhi − d)/Rmin). A. */
	worstPeakCurrentA: number | null;
}

/**
 * Worst-case figures of one amplifier stage (API.md "Checks, revision 2"). Let V = per-side rail, d = dropout,
 * R = load, Rmin = 0.8·R, Vhi = V·(1 + mainsHighPct/100) (or the given highMainsRailV), Vtot = 2·Vhi.
 * - class AB/B (class-ab-chip, class-ab-discrete, other): worstDissipationW 2V²/(π²R) (bridged 8V²/(π²R)),
 *   designDissipationW 2Vhi²/(π²Rmin) + q·Vtot (bridged 8Vhi²/(π²Rmin) + 2q·Vtot);
 * - class-a: maxPowerW min(rail limit, bias limit), worst 2V·biasA (idle is hottest), design Vtot·biasA + q·Vtot;
 * - class-d: worst P·(100/η − 1), design the same at Vhi and Rmin plus q·Vtot (2× bridged);
 * - valve: the output transformer is not modelled → power and dissipation null.
 * Sources: power-amp IC datasheet eq. for worst-case dissipation (total-supply form); IEC 60268-5 80 % minimum
 * impedance (via a loudspeaker maker's glossary); class A bias limits are the textbook results for a push-pull
 * stage (peak load current 2·Ibias) and a single-ended stage (peak load current Ibias).
 * stageWorstCase({ topology: 'class-ab-chip', supply: 'split', railV: 35, loadOhm: 8 }).designDissipationW → 46.93 W.
 */
export function stageWorstCase(input: StageInput): StageWorstCase {
	const {
		topology,
		supply,
		railV,
		loadOhm,
		dropoutV = 0,
		mainsHighPct = MAINS_HIGH_PCT,
		quiescentA = 0,
		bridged = false,
		biasA = null,
		classA = 'push-pull',
		efficiencyPct = CLASS_D_EFFICIENCY_PCT,
		highMainsRailV = null
	} = input;
	const V = railPerSideV(supply, railV);
	positive('loadOhm', loadOhm, 'Ω');
	if (!(Number.isFinite(dropoutV) && dropoutV >= 0 && dropoutV < V))
		throw new InputRangeError('dropoutV', `dropoutV must be 0 V or more and below the ${V} V rail`);
	if (!(Number.isFinite(mainsHighPct) && mainsHighPct >= 0)) throw new InputRangeError('mainsHighPct', 'mainsHighPct must be 0 % or more');
	if (!(Number.isFinite(quiescentA) && quiescentA >= 0)) throw new InputRangeError('quiescentA', 'quiescentA must be 0 A or more');
	if (topology === 'class-a' && bridged) throw new InputRangeError('bridged', 'a class A stage cannot be bridged here; give one stage');
	const Vhi = highMainsRailV ?? V * (1 + mainsHighPct / 100);
	positive('highMainsRailV', Vhi, 'V');
	const Vtot = 2 * Vhi;
	const R = loadOhm;
	const Rmin = minimumImpedanceOhm(R);
	const k = bridged ? 2 : 1; // stages per channel
	const pi2 = Math.PI * Math.PI;
	const sinePowerW = (v: number, r: number) => (bridged ? (2 * (v - dropoutV) ** 2) / r : (v - dropoutV) ** 2 / (2 * r));
	const classBWorstW = (v: number, r: number) => ((bridged ? 8 : 2) * v * v) / (pi2 * r);
	const quiescentW = k * quiescentA * Vtot;
	const base = { railV: V, highMainsRailV: Vhi, highMainsTotalV: Vtot, minImpedanceOhm: Rmin };
	const peak = Math.max(0, Vhi - dropoutV);
	const worstPeakCurrentA = ((bridged ? 2 : 1) * peak) / Rmin;

	if (topology === 'valve')
		return { ...base, railLimitPowerW: null, biasLimitPowerW: null, maxPowerW: null, worstDissipationW: null, designDissipationW: null, worstPeakCurrentA: null };

	const railLimitPowerW = sinePowerW(V, R);
	if (topology === 'class-a') {
		if (biasA === null || !(Number.isFinite(biasA) && biasA > 0)) throw new InputRangeError('biasA', 'a class A stage needs its bias current biasA (A)');
		const biasLimitPowerW = classA === 'single-ended' ? (biasA * biasA * R) / 2 : 2 * biasA * biasA * R;
		return {
			...base,
			railLimitPowerW,
			biasLimitPowerW,
			maxPowerW: Math.min(railLimitPowerW, biasLimitPowerW),
			worstDissipationW: 2 * V * biasA,
			designDissipationW: Vtot * biasA + quiescentW,
			worstPeakCurrentA: Math.min(worstPeakCurrentA, classA === 'single-ended' ? biasA : 2 * biasA)
		};
	}
	if (topology === 'class-d') {
		if (!(Number.isFinite(efficiencyPct) && efficiencyPct > 0 && efficiencyPct <= 100))
			throw new InputRangeError('efficiencyPct', 'efficiencyPct must be above 0 and at most 100 %');
		const loss = 100 / efficiencyPct - 1;
		return {
			...base,
			railLimitPowerW,
			biasLimitPowerW: null,
			maxPowerW: railLimitPowerW,
			worstDissipationW: railLimitPowerW * loss,
			designDissipationW: sinePowerW(Vhi, Rmin) * loss + quiescentW,
			worstPeakCurrentA
		};
	}
	return {
		...base,
		railLimitPowerW,
		biasLimitPowerW: null,
		maxPowerW: railLimitPowerW,
		worstDissipationW: classBWorstW(V, R),
		designDissipationW: classBWorstW(Vhi, Rmin) + quiescentW,
		worstPeakCurrentA
	};
}

/** One point of designDissipationCurve(): sine output power of one stage and its dissipation, W. */
export interface DissipationPoint {
	outputW: number;
	dissipationW: number;
}

/**
 * Dissipation of one class B/AB stage against its sine output, at the worst-case conditions designDissipationW uses
 * (the rail at high mains Vhi, the speaker at its minimum impedance Rmin, the quiescent current included), from idle
 * to clipping at (Vhi − d)²/(2·Rmin): Pd(Vpk) = 2·Vhi·Vpk/(π·Rmin) − Vpk²/(2·Rmin) + q·Vtot (the datasheet method at a
 * given output, REFERENCE.md §2.2). Its highest point, at Vpk = 2·Vhi/π when the swing reaches it, is
 * stageWorstCase(...).designDissipationW — so a plot of this curve and the headline figure agree.
 * Not bridged; class AB/B topologies only. designDissipationCurve({ topology: 'class-ab-chip', supply: 'split', railV: 35, loadOhm: 8 }) peaks at 46.93 W.
 */
export function designDissipationCurve(input: StageInput, steps = 60): { points: DissipationPoint[]; designDissipationW: number; maxOutputW: number } {
	if (input.bridged) throw new InputRangeError('bridged', 'the dissipation curve is for one stage; give it unbridged');
	if (!(input.topology === 'class-ab-chip' || input.topology === 'class-ab-discrete' || input.topology === 'other'))
		throw new InputRangeError('topology', 'the dissipation curve models class AB/B stages');
	const w = stageWorstCase(input);
	const Vhi = w.highMainsRailV;
	const Rmin = w.minImpedanceOhm;
	const d = input.dropoutV ?? 0;
	const q = (input.quiescentA ?? 0) * w.highMainsTotalV;
	const top = Math.max(0, Vhi - d);
	const at = (vpk: number): DissipationPoint => ({
		outputW: (vpk * vpk) / (2 * Rmin),
		dissipationW: (2 * Vhi * vpk) / (Math.PI * Rmin) - (vpk * vpk) / (2 * Rmin) + q
	});
	const vpks = Array.from({ length: steps + 1 }, (_, i) => (top * i) / steps);
	const peak = (2 * Vhi) / Math.PI;
	if (peak < top) vpks.push(peak);
	vpks.sort((a, b) => a - b);
	return { points: vpks.map(at), designDissipationW: w.designDissipationW!, maxOutputW: (top * top) / (2 * Rmin) };
}

/** Non-inverting stage gain Av = 1 + Rf/Ri, and 20·log10(Av). nonInvertingGain(22e3, 1e3) → { gain: 23, gainDb: 27.23 }. */
export function nonInvertingGain(rfOhm: number, riOhm: number): { gain: number; gainDb: number } {
	if (!(Number.isFinite(rfOhm) && rfOhm >= 0)) throw new InputRangeError('rfOhm', 'rfOhm must be 0 Ω or more');
	positive('riOhm', riOhm, 'Ω');
	const gain = 1 + rfOhm / riOhm;
	return { gain, gainDb: 20 * Math.log10(gain) };
}

/** First-order RC corner 1/(2π·R·C) in Hz. rcCornerHz(22e3, 1e-6) → 7.234 Hz. */
export function rcCornerHz(rOhm: number, cF: number): number {
	positive('rOhm', rOhm, 'Ω');
	positive('cF', cF, 'F');
	return 1 / (2 * Math.PI * rOhm * cF);
}

function flatten(args: ReadonlyArray<number | readonly number[]>): number[] {
	const out: number[] = [];
	for (const a of args) {
		if (Array.isArray(a)) out.push(...a);
		else out.push(a as number);
	}
	out.forEach((f, i) => {
		if (!(Number.isFinite(f) && f > 0)) throw new InputRangeError(`cornersHz.${i}`, 'each corner must be a finite frequency above 0 Hz');
	});
	if (out.length === 0) throw new InputRangeError('cornersHz', 'give at least one corner');
	return out;
}

/**
 * Overall −3 dB frequency of cascaded first-order high-pass sections with the given corners (Hz),
 * solving ∏ f²/(f² + fi²) = 1/2. Two equal corners f0 → 1.554·f0 (= f0/√(√2 − 1), derived).
 * cascadeHighPassHz(10, 10) → 15.54 Hz; also accepts one array.
 */
export function cascadeHighPassHz(...cornersHz: Array<number | readonly number[]>): number {
	const fs = flatten(cornersHz);
	// |H|² = ∏ 1/(1 + (fi/f)²) decreases as f falls; bisection on log f.
	const gain2 = (f: number) => fs.reduce((g, fi) => g / (1 + (fi / f) ** 2), 1);
	let lo = Math.min(...fs) * 0.5;
	let hi = Math.max(...fs) * fs.length * 4;
	for (let i = 0; i < 200; i++) {
		const mid = Math.sqrt(lo * hi);
		if (gain2(mid) < 0.5) lo = mid;
		else hi = mid;
	}
	return Math.sqrt(lo * hi);
}

/**
 * Overall −3 dB frequency of cascaded first-order low-pass sections (Hz), solving ∏ 1/(1 + (f/fi)²) = 1/2.
 * Two equal corners f0 → 0.644·f0. cascadeLowPassHz(100e3, 100e3) → 64.36 kHz.
 */
export function cascadeLowPassHz(...cornersHz: Array<number | readonly number[]>): number {
	const fs = flatten(cornersHz);
	const gain2 = (f: number) => fs.reduce((g, fi) => g / (1 + (f / fi) ** 2), 1);
	let lo = Math.min(...fs) / (fs.length * 4);
	let hi = Math.max(...fs) * 2;
	for (let i = 0; i < 200; i++) {
		const mid = Math.sqrt(lo * hi);
		if (gain2(mid) < 0.5) hi = mid;
		else lo = mid;
	}
	return Math.sqrt(lo * hi);
}

/** Inputs of zobel(): the series R–C network from output to ground and the signal across it. */
export interface ZobelInput {
	rOhm: number;
	cF: number;
	outputVrms: number;
	freqHz: number;
}

/**
 * Output Zobel (Boucherot) network: pole 1/(2π·R·C) and the resistor's dissipation at a sine of
 * outputVrms and freqHz, P = I²·R with I = V/√(R² + Xc²). HF oscillation can dissipate far more.
 * zobel({ rOhm: 2.7, cF: 1e-7, outputVrms: 22.63, freqHz: 20e3 }) → { poleHz: 589.5e3, resistorW: 0.218 }.
 */
export function zobel(input: ZobelInput): { poleHz: number; resistorW: number } {
	const { rOhm, cF, outputVrms, freqHz } = input;
	positive('rOhm', rOhm, 'Ω');
	positive('cF', cF, 'F');
	if (!(Number.isFinite(outputVrms) && outputVrms >= 0)) throw new InputRangeError('outputVrms', 'outputVrms must be 0 V or more');
	positive('freqHz', freqHz, 'Hz');
	const xc = 1 / (2 * Math.PI * freqHz * cF);
	const i = outputVrms / Math.sqrt(rOhm * rOhm + xc * xc);
	return { poleHz: rcCornerHz(rOhm, cF), resistorW: i * i * rOhm };
}
