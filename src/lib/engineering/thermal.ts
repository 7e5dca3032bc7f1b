/**
 * Steady-state thermal chain junction → case → sink → ambient (REFERENCE.md §3).
 * Source: power-amp IC datasheet thermal method ("Determining the Correct Heat Sink": temperatures add
 * like voltages across series resistances; required Rθsa = (Tj − Ta)/Pd − (Rθjc + Rθcs)).
 * Heat can burn and can destroy parts: these numbers inform a design, they do not certify it —
 * defer to local codes and licensed practice.
 */
import { InputRangeError } from './values';

/** Inputs of heatsink(); temperatures °C, resistances K/W (= °C/W), power W. */
export interface HeatsinkInput {
	/** Dissipation of each device. W. */
	powerW: number;
	ambientC: number;
	junctionMaxC: number;
	rthJcKPerW: number;
	rthCsKPerW: number;
	rthSaKPerW?: number;
	/** Design margin below junctionMaxC. °C. */
	marginC?: number;
	/** Devices sharing the one heatsink, each dissipating powerW (default 1). */
	devices?: number;
}

/** Outputs of heatsink(). */
export interface HeatsinkOutput {
	/**
	 * Largest sink-to-ambient resistance that keeps each junction at junctionMaxC − marginC,
	 * (Tj,target − Ta − P·(Rθjc + Rθcs)) / (n·P); ≤ 0 means no heatsink can (feasible false).
	 */
	requiredRthSaKPerW: number;
	/** requiredRthSaKPerW > 0. */
	feasible: boolean;
	/** Heatsink temperature Ta + n·P·Rθsa, at the given heatsink — or, without one, at the required heatsink (an ideal one, Rθsa 0, when none can do it). */
	sinkC: number;
	/** sinkC + P·Rθcs. */
	caseC: number;
	/** sinkC + P·(Rθjc + Rθcs). */
	junctionC: number;
	devices: number;
}

function finite(field: string, v: number, min: number, unit: string, strict = false): void {
	if (!(typeof v === 'number' && Number.isFinite(v) && (strict ? v > min : v >= min)))
		throw new InputRangeError(field, `${field} must be a finite number ${strict ? 'greater than' : 'of at least'} ${min} ${unit}`);
}

/** Inputs of junctionTempC(). */
export interface JunctionInput {
	powerW: number;
	ambientC: number;
	rthJcKPerW: number;
	rthCsKPerW: number;
	rthSaKPerW: number;
}

/** Junction temperature Tj = Ta + Pd·(Rθjc + Rθcs + Rθsa), °C. junctionTempC({ powerW: 31.03, ambientC: 40, rthJcKPerW: 1, rthCsKPerW: 0.4, rthSaKPerW: 1.5 }) → 130.0 °C. */
export function junctionTempC(input: JunctionInput): number {
	const { powerW, ambientC, rthJcKPerW, rthCsKPerW, rthSaKPerW } = input;
	finite('powerW', powerW, 0, 'W');
	finite('ambientC', ambientC, -273.15, '°C');
	finite('rthJcKPerW', rthJcKPerW, 0, 'K/W');
	finite('rthCsKPerW', rthCsKPerW, 0, 'K/W');
	finite('rthSaKPerW', rthSaKPerW, 0, 'K/W');
	return ambientC + powerW * (rthJcKPerW + rthCsKPerW + rthSaKPerW);
}

/**
 * Required heatsink Rθsa and the temperatures along the path, for `devices` devices of powerW each on one
 * heatsink (the heatsink carries their sum; each junction adds its own P·(Rθjc + Rθcs)):
 * Rθsa ≤ (Tj,target − Ta − P·(Rθjc + Rθcs)) / (n·P), Tj,target = junctionMaxC − marginC. With one device this is
 * the datasheet form (Tj − Ta)/Pd − (Rθjc + Rθcs). A requirement ≤ 0 means no heatsink can do it (feasible false):
 * lower the rails, raise the load, or spread the heat over more devices or heatsinks.
 * heatsink({ powerW: 39.72, ambientC: 25, junctionMaxC: 150, rthJcKPerW: 1, rthCsKPerW: 0.2 }) → requiredRthSaKPerW 1.947.
 */
export function heatsink(input: HeatsinkInput): HeatsinkOutput {
	const { powerW, ambientC, junctionMaxC, rthJcKPerW, rthCsKPerW, rthSaKPerW, marginC = 0, devices = 1 } = input;
	finite('powerW', powerW, 0, 'W', true);
	finite('ambientC', ambientC, -273.15, '°C');
	finite('junctionMaxC', junctionMaxC, -273.15, '°C');
	finite('rthJcKPerW', rthJcKPerW, 0, 'K/W');
	finite('rthCsKPerW', rthCsKPerW, 0, 'K/W');
	finite('marginC', marginC, 0, '°C');
	if (!(Number.isInteger(devices) && devices >= 1)) throw new InputRangeError('devices', 'devices must be a whole number of at least 1');
	const targetC = junctionMaxC - marginC;
	const requiredRthSaKPerW = (targetC - ambientC - powerW * (rthJcKPerW + rthCsKPerW)) / (devices * powerW);
	const feasible = requiredRthSaKPerW > 0;
	let sa: number;
	if (rthSaKPerW !== undefined) {
		finite('rthSaKPerW', rthSaKPerW, 0, 'K/W');
		sa = rthSaKPerW;
	} else sa = feasible ? requiredRthSaKPerW : 0;
	const sinkC = ambientC + devices * powerW * sa;
	const caseC = sinkC + powerW * rthCsKPerW;
	return { requiredRthSaKPerW, feasible, sinkC, caseC, junctionC: caseC + powerW * rthJcKPerW, devices };
}

/** Device power allowed at a case temperature, (Tjmax − Tcase)/Rθjc in W (datasheet derating form); 0 when the case is at or above Tjmax. deratedPowerW(150, 100, 1) → 50 W. */
export function deratedPowerW(junctionMaxC: number, caseC: number, rthJcKPerW: number): number {
	finite('junctionMaxC', junctionMaxC, -273.15, '°C');
	finite('caseC', caseC, -273.15, '°C');
	finite('rthJcKPerW', rthJcKPerW, 0, 'K/W', true);
	return Math.max(0, (junctionMaxC - caseC) / rthJcKPerW);
}

/** How a device is mounted on its heatsink. */
export type InterfaceKind =
	| 'bare-dry'
	| 'grease'
	| 'mica-grease'
	| 'silicone-pad'
	| 'small-tab-grease'
	| 'small-tab-insulated';

/** One row of the case-to-sink table. */
export interface CaseToSinkEntry {
	/** Value to use in calculations, K/W: the conservative (highest) end of the range. */
	rthCsKPerW: number;
	/** Published or remembered range, K/W. */
	rangeKPerW: readonly [number, number];
	description: string;
	source: string;
}

/**
 * Typical case-to-sink thermal resistance by mounting (REFERENCE.md §3.3), for large-tab power packages
 * unless the key says "small-tab". The value used is the upper (worse) end of the range: a thinner
 * margin on paper is safer than a junction hotter than computed. CASE_TO_SINK_KPERW['mica-grease'].rthCsKPerW → 0.5.
 */
export const CASE_TO_SINK_KPERW: Readonly<Record<InterfaceKind, CaseToSinkEntry>> = {
	'bare-dry': {
		rthCsKPerW: 1.5,
		rangeKPerW: [0.5, 1.5],
		description: 'bare metal to metal, no compound: at least 0.5 K/W and often much worse',
		source: 'monolithic power amplifier IC datasheet family, "Heat Sinking" section'
	},
	grease: {
		rthCsKPerW: 0.2,
		rangeKPerW: [0.1, 0.2],
		description: 'thermal compound, no insulator, flat surfaces',
		source: 'monolithic power amplifier IC datasheets, "Heat Sinking" and heat-sink worked example (0.2 K/W)'
	},
	'mica-grease': {
		rthCsKPerW: 0.5,
		rangeKPerW: [0.3, 0.5],
		description: '50 µm (2 mil) mica washer with compound on both faces',
		source: 'monolithic power amplifier IC datasheet family, "Heat Sinking" section'
	},
	'silicone-pad': {
		rthCsKPerW: 0.8,
		rangeKPerW: [0.4, 0.8],
		description: 'silicone-rubber pad, dry (vendor claim); pads degrade and should be replaced when the part is removed',
		source: 'monolithic power amplifier IC datasheet family, "Heat Sinking" section (vendors claim about 0.5 K/W)'
	},
	'small-tab-grease': {
		rthCsKPerW: 1.0,
		rangeKPerW: [0.5, 1.0],
		description: 'small tab package (TO-220 class), compound, no insulator',
		source: 'heat-sink maker selection worked example'
	},
	'small-tab-insulated': {
		rthCsKPerW: 4.0,
		rangeKPerW: [1.5, 4.0],
		description: 'small tab package (TO-220 class) on a mica or pad insulator',
		source: 'from memory'
	}
};
