/**
 * Spec block "measurements": schema, derived values and checks (API.md, PRODUCT.md §4.3, REFERENCE.md §7.4, §9).
 */
import { z } from 'zod';
import { responseCornersHz, snrDb, vrmsForPowerW } from '../engineering';
import { flag, fmt, num, pos, type Check, type SpecResult } from './types';

/** |DC offset| above which measure.dc-offset is a caution: 50 mV; above 100 mV a danger (API.md; common practice). */
export const OFFSET_CAUTION_MV = 50;
/** See OFFSET_CAUTION_MV. */
export const OFFSET_DANGER_MV = 100;
/**
 * Measured |DC offset| above which a speaker DC-protection circuit is recommended: 50 mV, the top of the "good"
 * range (REFERENCE.md §7.4; common practice, no single source). An offset beyond it is not yet harmful, but it shows
 * a stage with less margin, and a drifting offset can mean a failing part; a protection circuit that disconnects
 * the speaker at about 1–2 V DC is what stops a failed output stage putting the rail on it.
 */
export const SPEAKER_PROTECTION_OFFSET_MV = 50;

/** The check measure.speaker-protection / bringup.speaker-protection: null when the offset is within the level or protection is fitted. */
export function speakerProtectionCheck(id: string, offsetsMv: readonly number[], protectedAlready: boolean | undefined): Check | null {
	if (protectedAlready === true || !offsetsMv.length) return null;
	const abs = offsetsMv.map(Math.abs);
	const i = abs.indexOf(Math.max(...abs));
	if (!(abs[i] > SPEAKER_PROTECTION_OFFSET_MV)) return null;
	return {
		id,
		level: 'note',
		message: `Channel ${i + 1} measures ${fmt(offsetsMv[i])} mV DC, above the ${SPEAKER_PROTECTION_OFFSET_MV} mV at which a speaker DC-protection circuit is recommended (common practice): one that disconnects the speaker at about 1–2 V DC protects it if an output stage fails, which a fuse is too slow to do.`,
		values: { channel: i + 1, offsetMv: offsetsMv[i], protectionAboveMv: SPEAKER_PROTECTION_OFFSET_MV, speakerProtection: false }
	};
}

/** THD at which "clipping" is read: 1 % (common practice; the US amplifier rating rule uses 1 % THD+N). */
export const CLIP_THD_PCT = 1;

/** Schema of a measurements block; unknown keys are dropped. */
export const measurementsSpec = z.object({
	/** One signed value per channel, mV. */
	dcOffsetMv: z.array(num(-100_000, 100_000, 'mV'), { error: 'must be a list of numbers (mV, one per channel)' }).min(1, 'needs at least one channel').max(32, 'at most 32 channels'),
	points: z
		.object({
			response: z.array(z.object({ freqHz: pos(1e7, 'Hz'), db: num(-200, 200, 'dB') })).max(2000, 'at most 2000 points').optional(),
			thd: z.array(z.object({ powerW: num(0, 10_000, 'W'), thdPct: num(0, 100, '%') })).max(2000, 'at most 2000 points').optional()
		})
		.nullish(),
	/** Output noise, rms, µV (state bandwidth and weighting with it). */
	noiseUv: pos(1e7, 'µV').nullish(),
	/** Idle (quiescent) current, mA. */
	idleCurrentMa: num(0, 100_000, 'mA').nullish(),
	/** Load the measurements were made into, Ω (for SNR re 1 W). */
	loadOhm: num(0.5, 100_000, 'Ω').nullish(),
	/** A speaker DC-protection circuit is fitted (an amplifier block of the build saying so counts too). */
	speakerProtection: flag().optional()
});

/** Parsed measurements block. */
export type MeasurementsSpec = z.output<typeof measurementsSpec>;

/** Derived values of a measurements block. */
export interface MeasurementsDerived {
	[key: string]: number | null;
	maxAbsOffsetMv: number;
	/** Highest measured power at ≤ 1 % THD (the clipping point), W. */
	clipPowerW: number | null;
	/** Highest measured power of any THD point, W. */
	maxMeasuredPowerW: number | null;
	responseLowHz: number | null;
	responseHighHz: number | null;
	/** SNR re 1 W into loadOhm, from noiseUv. */
	snr1WDb: number | null;
}

/**
 * Derive a measurements block. dcOffsetMv [12, -64] → maxAbsOffsetMv 64, measure.dc-offset (caution, channel 2) and
 * measure.speaker-protection (note). `speakerProtection`: the build says elsewhere that protection is fitted.
 */
export function deriveMeasurements(data: MeasurementsSpec, speakerProtection?: boolean): SpecResult<MeasurementsDerived> {
	const abs = data.dcOffsetMv.map(Math.abs);
	const thd = data.points?.thd ?? [];
	const clip = thd.filter((p) => p.thdPct <= CLIP_THD_PCT).map((p) => p.powerW);
	const response = data.points?.response ?? [];
	const corners = response.length >= 2 ? responseCornersHz(response) : null;
	const derived: MeasurementsDerived = {
		maxAbsOffsetMv: Math.max(...abs),
		clipPowerW: clip.length ? Math.max(...clip) : null,
		maxMeasuredPowerW: thd.length ? Math.max(...thd.map((p) => p.powerW)) : null,
		responseLowHz: corners?.lowHz ?? null,
		responseHighHz: corners?.highHz ?? null,
		snr1WDb: data.noiseUv && data.loadOhm ? snrDb(vrmsForPowerW(1, data.loadOhm), data.noiseUv * 1e-6) : null
	};
	const checks: Check[] = [];
	const worst = abs.indexOf(Math.max(...abs));
	const offsetMv = data.dcOffsetMv[worst];
	if (abs[worst] > OFFSET_CAUTION_MV) {
		const danger = abs[worst] > OFFSET_DANGER_MV;
		checks.push({
			id: 'measure.dc-offset',
			level: danger ? 'danger' : 'caution',
			message: danger
				? `Channel ${worst + 1} has ${fmt(offsetMv)} mV DC at the output, over ${OFFSET_DANGER_MV} mV: investigate before connecting a speaker (a drifting offset can mean a failing part).`
				: `Channel ${worst + 1} has ${fmt(offsetMv)} mV DC at the output, over ${OFFSET_CAUTION_MV} mV: acceptable for most woofers but worth finding the cause.`,
			values: {
				channel: worst + 1,
				offsetMv,
				cautionMv: OFFSET_CAUTION_MV,
				dangerMv: OFFSET_DANGER_MV,
				channelsOver: abs.filter((a) => a > OFFSET_CAUTION_MV).length
			}
		});
	}
	const protection = speakerProtectionCheck('measure.speaker-protection', data.dcOffsetMv, data.speakerProtection === true || speakerProtection === true);
	if (protection) checks.push(protection);
	return { derived, checks };
}
