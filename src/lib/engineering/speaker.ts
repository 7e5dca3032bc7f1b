/**
 * Loudspeaker load: combinations, the 80 % minimum-impedance convention, cable resistance and damping factor
 * (REFERENCE.md §7). Sources: a loudspeaker maker's glossary ("Impedance curve", 80 % rule);
 * a car-audio reference page on damping factor (DF = Zload / Zsource, cable form).
 */
import { InputRangeError } from './values';

/** Resistivity of copper at room temperature, Ω·m (handbook value). */
export const COPPER_RESISTIVITY_OHM_M = 1.72e-8;

function list(args: ReadonlyArray<number | readonly number[]>): number[] {
	const out: number[] = [];
	for (const a of args) Array.isArray(a) ? out.push(...a) : out.push(a as number);
	if (out.length === 0) throw new InputRangeError('loadsOhm', 'give at least one load');
	out.forEach((z, i) => {
		if (!(Number.isFinite(z) && z > 0)) throw new InputRangeError(`loadsOhm.${i}`, 'each load must be a finite impedance above 0 Ω');
	});
	return out;
}

/** Nominal impedance of speakers in parallel, 1/Σ(1/Zi), Ω. parallelLoadOhm(8, 4) → 2.667 Ω; also accepts one array. */
export function parallelLoadOhm(...loadsOhm: Array<number | readonly number[]>): number {
	return 1 / list(loadsOhm).reduce((a, z) => a + 1 / z, 0);
}

/** Nominal impedance of speakers in series, ΣZi, Ω. seriesLoadOhm(8, 8) → 16 Ω. */
export function seriesLoadOhm(...loadsOhm: Array<number | readonly number[]>): number {
	return list(loadsOhm).reduce((a, z) => a + z, 0);
}

/** Minimum impedance a speaker of this nominal rating may dip to by convention: 80 % of nominal, Ω. minimumImpedanceOhm(8) → 6.4 Ω. */
export function minimumImpedanceOhm(nominalOhm: number): number {
	if (!(Number.isFinite(nominalOhm) && nominalOhm > 0)) throw new InputRangeError('nominalOhm', 'nominalOhm must be above 0 Ω');
	return 0.8 * nominalOhm;
}

/**
 * Loop resistance of a two-conductor speaker cable, ρ·(2·lengthM)/A, Ω; lengthM is the one-way cable length.
 * cableResistanceOhm(5, 1.5) → 0.1147 Ω (copper).
 */
export function cableResistanceOhm(lengthM: number, areaMm2: number, resistivityOhmM = COPPER_RESISTIVITY_OHM_M): number {
	if (!(Number.isFinite(lengthM) && lengthM >= 0)) throw new InputRangeError('cableLengthM', 'cableLengthM must be 0 m or more');
	if (!(Number.isFinite(areaMm2) && areaMm2 > 0)) throw new InputRangeError('cableAreaMm2', 'cableAreaMm2 must be above 0 mm²');
	return (resistivityOhmM * 2 * lengthM) / (areaMm2 * 1e-6);
}

/** Inputs of dampingFactor(). */
export interface DampingInput {
	loadOhm: number;
	sourceOhm: number;
	/** One-way cable length. m. */
	cableLengthM?: number;
	/** Cross-section of each conductor. mm². */
	cableAreaMm2?: number;
}

/**
 * Damping factor Zload/(Zsource + Rcable) (resistive parts only). Without cable: 8 Ω / 0.02 Ω → 400;
 * with 5 m of 1.5 mm² twin copper → 59.4.
 */
export function dampingFactor(input: DampingInput): number {
	const { loadOhm, sourceOhm, cableLengthM, cableAreaMm2 } = input;
	if (!(Number.isFinite(loadOhm) && loadOhm > 0)) throw new InputRangeError('loadOhm', 'loadOhm must be above 0 Ω');
	if (!(Number.isFinite(sourceOhm) && sourceOhm >= 0)) throw new InputRangeError('sourceOhm', 'sourceOhm must be 0 Ω or more');
	let cable = 0;
	if (cableLengthM !== undefined || cableAreaMm2 !== undefined) {
		if (cableLengthM === undefined || cableAreaMm2 === undefined)
			throw new InputRangeError(cableLengthM === undefined ? 'cableLengthM' : 'cableAreaMm2', 'give both cableLengthM and cableAreaMm2');
		cable = cableResistanceOhm(cableLengthM, cableAreaMm2);
	}
	const total = sourceOhm + cable;
	if (!(total > 0)) throw new InputRangeError('sourceOhm', 'the source and cable resistance cannot both be zero');
	return loadOhm / total;
}
