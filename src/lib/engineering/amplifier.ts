/**
 * Class B / AB output stage into a resistive load, gain and corner frequencies.
 * Model (REFERENCE.md §1–2, §5): continuous sine, resistive load, rails do not sag, quiescent current ignored.
 * Sources: power-amp IC datasheet thermal method ("Determining Maximum Power Dissipation" eq. for
 * worst-case and at-output dissipation, total-supply form); Horowitz & Hill, The Art of Electronics;
 * the class-B efficiency derivation η = (π/4)·(Vpk/Vrail) (textbook result).
 */
import { InputRangeError } from './values';

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
