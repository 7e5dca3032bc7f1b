/**
 * Levels and measurement figures makers report (REFERENCE.md §1.4, §9): dBV, dBu, dBW, dBm, THD, SNR,
 * idle current, −3 dB points. Definitions are standard; references: 0 dBV = 1 V rms, 0 dBu = √0.6 V rms
 * (1 mW into 600 Ω), 0 dBW = 1 W, 0 dBm = 1 mW.
 */
import { InputRangeError } from './values';

/** 0 dBu reference, √0.6 V rms ≈ 0.7746 V. */
export const DBU_REF_V = Math.sqrt(0.6);

function pos(field: string, v: number, unit: string): void {
	if (!(typeof v === 'number' && Number.isFinite(v) && v > 0))
		throw new InputRangeError(field, `${field} must be a finite number greater than 0 ${unit}`.trim());
}
function fin(field: string, v: number): void {
	if (!(typeof v === 'number' && Number.isFinite(v))) throw new InputRangeError(field, `${field} must be a finite number`);
}

/** Voltage ratio in dB, 20·log10(v2/v1). voltageRatioDb(2, 1) → 6.021 dB. */
export function voltageRatioDb(v2: number, v1: number): number {
	pos('v2', v2, '');
	pos('v1', v1, '');
	return 20 * Math.log10(v2 / v1);
}
/** Power ratio in dB, 10·log10(p2/p1). powerRatioDb(2, 1) → 3.010 dB. */
export function powerRatioDb(p2: number, p1: number): number {
	pos('p2', p2, '');
	pos('p1', p1, '');
	return 10 * Math.log10(p2 / p1);
}
/** Level re 1 V rms. dbV(22.63) → 27.09 dBV. */
export function dbV(vrms: number): number {
	pos('vrms', vrms, 'V');
	return 20 * Math.log10(vrms);
}
/** Level re √0.6 V rms. dbu(22.63) → 29.31 dBu. */
export function dbu(vrms: number): number {
	pos('vrms', vrms, 'V');
	return 20 * Math.log10(vrms / DBU_REF_V);
}
/** Power re 1 W. dbW(64) → 18.06 dBW. */
export function dbW(powerW: number): number {
	pos('powerW', powerW, 'W');
	return 10 * Math.log10(powerW);
}
/** Power re 1 mW. dbm(0.001) → 0 dBm. */
export function dbm(powerW: number): number {
	pos('powerW', powerW, 'W');
	return 10 * Math.log10(powerW / 1e-3);
}
/** V rms from dBV. vFromDbV(-10) → 0.3162 V. */
export function vFromDbV(db: number): number {
	fin('db', db);
	return 10 ** (db / 20);
}
/** V rms from dBu. vFromDbu(4) → 1.228 V. */
export function vFromDbu(db: number): number {
	fin('db', db);
	return DBU_REF_V * 10 ** (db / 20);
}
/** W from dBW. wFromDbW(3.0103) → 2 W. */
export function wFromDbW(db: number): number {
	fin('db', db);
	return 10 ** (db / 10);
}
/** W from dBm. wFromDbm(30) → 1 W. */
export function wFromDbm(db: number): number {
	fin('db', db);
	return 1e-3 * 10 ** (db / 10);
}

/** Sine power into a resistance from its rms voltage, V²/R, W. sinePowerW(22.63, 8) → 64 W. */
export function sinePowerW(vrms: number, loadOhm: number): number {
	if (!(Number.isFinite(vrms) && vrms >= 0)) throw new InputRangeError('vrms', 'vrms must be 0 V or more');
	pos('loadOhm', loadOhm, 'Ω');
	return (vrms * vrms) / loadOhm;
}
/** Sine rms voltage for a power into a resistance, √(P·R), V. vrmsForPowerW(100, 8) → 28.28 V. */
export function vrmsForPowerW(powerW: number, loadOhm: number): number {
	if (!(Number.isFinite(powerW) && powerW >= 0)) throw new InputRangeError('powerW', 'powerW must be 0 W or more');
	pos('loadOhm', loadOhm, 'Ω');
	return Math.sqrt(powerW * loadOhm);
}

/**
 * Total harmonic distortion √(ΣVn²)/V1 from rms harmonic amplitudes (2nd, 3rd, …), as % and dB.
 * thdPct([1e-3, 0.5e-3], 1) → { thdPct: 0.1118, thdDb: -59.03 }.
 */
export function thdPct(harmonicsV: readonly number[], fundamentalV: number): { thdPct: number; thdDb: number } {
	if (!Array.isArray(harmonicsV) || harmonicsV.length === 0) throw new InputRangeError('harmonicsV', 'give at least one harmonic');
	harmonicsV.forEach((h, i) => {
		if (!(Number.isFinite(h) && h >= 0)) throw new InputRangeError(`harmonicsV.${i}`, 'harmonic amplitudes must be 0 V or more');
	});
	pos('fundamentalV', fundamentalV, 'V');
	const ratio = Math.sqrt(harmonicsV.reduce((a, h) => a + h * h, 0)) / fundamentalV;
	return { thdPct: 100 * ratio, thdDb: ratio > 0 ? 20 * Math.log10(ratio) : -Infinity };
}

/** Convert a distortion percentage to dB, 20·log10(pct/100). pctToDb(0.1) → -60 dB. */
export function pctToDb(pct: number): number {
	pos('pct', pct, '%');
	return 20 * Math.log10(pct / 100);
}

/** Signal-to-noise ratio 20·log10(Vref/Vnoise) (state the reference and weighting beside it). snrDb(28.28, 100e-6) → 109.03 dB. */
export function snrDb(refV: number, noiseV: number): number {
	pos('refV', refV, 'V');
	pos('noiseV', noiseV, 'V');
	return 20 * Math.log10(refV / noiseV);
}

/** Idle (quiescent) current from the drop across an emitter resistor, I = V/Re, A. idleCurrentA(0.011, 0.22) → 0.05 A. */
export function idleCurrentA(dropV: number, emitterOhm: number): number {
	if (!Number.isFinite(dropV)) throw new InputRangeError('dropV', 'dropV must be finite');
	pos('emitterOhm', emitterOhm, 'Ω');
	return Math.abs(dropV) / emitterOhm;
}

/** One point of a frequency response. */
export interface ResponsePoint {
	freqHz: number;
	db: number;
}

/**
 * The −3 dB points of a measured response relative to the level at refHz (default 1 kHz, linear
 * interpolation in log frequency between neighbours); null where the data never falls 3 dB.
 * [{20,-3},{1000,0},{20000,-3}] → { lowHz: 20, highHz: 20000, refDb: 0 }.
 */
export function responseCornersHz(
	points: readonly ResponsePoint[],
	refHz = 1000
): { lowHz: number | null; highHz: number | null; refDb: number } {
	if (!Array.isArray(points) || points.length < 2) throw new InputRangeError('points', 'give at least two response points');
	points.forEach((p, i) => {
		if (!(Number.isFinite(p.freqHz) && p.freqHz > 0)) throw new InputRangeError(`points.${i}.freqHz`, 'freqHz must be above 0 Hz');
		if (!Number.isFinite(p.db)) throw new InputRangeError(`points.${i}.db`, 'db must be finite');
	});
	const sorted = [...points].sort((a, b) => a.freqHz - b.freqHz);
	let refIdx = 0;
	sorted.forEach((p, i) => {
		if (Math.abs(Math.log(p.freqHz / refHz)) < Math.abs(Math.log(sorted[refIdx].freqHz / refHz))) refIdx = i;
	});
	const refDb = sorted[refIdx].db;
	const target = refDb - 3;
	const cross = (a: ResponsePoint, b: ResponsePoint): number => {
		if (a.db === b.db) return a.freqHz;
		const t = (target - a.db) / (b.db - a.db);
		return Math.exp(Math.log(a.freqHz) + t * (Math.log(b.freqHz) - Math.log(a.freqHz)));
	};
	let lowHz: number | null = null;
	for (let i = refIdx; i > 0; i--) {
		if (sorted[i - 1].db <= target) {
			lowHz = cross(sorted[i - 1], sorted[i]);
			break;
		}
	}
	let highHz: number | null = null;
	for (let i = refIdx; i < sorted.length - 1; i++) {
		if (sorted[i + 1].db <= target) {
			highHz = cross(sorted[i], sorted[i + 1]);
			break;
		}
	}
	return { lowHz, highHz, refDb };
}
