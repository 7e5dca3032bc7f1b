/**
 * Spec block "bring-up": the first power-up record — current-limited first start, measured rails against
 * expected, DC offset before speakers are connected, oscillation check, idle current, heat soak.
 * Every measured value is checked against its expectation (PRODUCT.md §4.3). Thresholds are common
 * practice, no single source, unless noted. First power-up involves mains and stored charge:
 * these checks certify nothing — defer to local codes and licensed practice.
 */
import { z } from 'zod';
import { CHARGE_CAUTION, HEAT_CAUTION, MAINS_CAUTION, flag, fmt, num, type Check, type SpecResult } from './types';
import { OFFSET_CAUTION_MV, OFFSET_DANGER_MV, speakerProtectionCheck } from './measurements';
import { SINK_TOUCH_C } from './thermal';

/** Rail deviation above which bringup.rail-mismatch is a caution: 10 % (mains tolerance ±10 %; common practice). */
export const RAIL_TOLERANCE_PCT = 10;
/** Idle-current deviation above which bringup.idle-current is a caution: 20 %; above 2 × expected a danger (common practice, no single source). */
export const IDLE_TOLERANCE_PCT = 20;
/** See IDLE_TOLERANCE_PCT. */
export const IDLE_DANGER_RATIO = 2;

const label = z.string({ error: 'must be text' }).max(60, 'at most 60 characters').optional();

/** Schema of a bring-up block; unknown keys are dropped. */
export const bringupSpec = z
	.object({
		/** First power-up through a current limiter (series lamp, series resistor or a current-limited bench supply). */
		currentLimited: flag(),
		rails: z
			.array(z.object({ label, expectedV: num(-2000, 2000, 'V'), measuredV: num(-2000, 2000, 'V') }))
			.max(16, 'at most 16 rails')
			.default([]),
		/** Output DC offset per channel with no speaker connected, mV. */
		dcOffsetMv: z.array(num(-100_000, 100_000, 'mV')).max(32, 'at most 32 channels').default([]),
		oscillationChecked: flag().default(false),
		oscillationFound: flag().default(false),
		idleCurrent: z
			.array(z.object({ label, expectedMa: num(0, 100_000, 'mA').refine((v) => v > 0, 'must be greater than 0 mA'), measuredMa: num(0, 100_000, 'mA') }))
			.max(32, 'at most 32 entries')
			.default([]),
		heatSoak: z.object({ minutes: num(0, 100_000, 'min'), sinkC: num(-40, 300, '°C') }).nullish(),
		/** A speaker DC-protection circuit is fitted (an amplifier block of the build saying so counts too). */
		speakerProtection: flag().optional()
	})
	.superRefine((d, ctx) => {
		d.rails.forEach((r, i) => {
			if (r.expectedV === 0) ctx.addIssue({ code: 'custom', path: ['rails', i, 'expectedV'], message: 'must not be 0 V' });
		});
	});

/** Parsed bring-up block. */
export type BringupSpec = z.output<typeof bringupSpec>;

/** Derived values of a bring-up block. */
export interface BringupDerived {
	[key: string]: number | null;
	/** Largest |measured − expected| / |expected| over the rails, %. */
	maxRailDeviationPct: number | null;
	maxAbsOffsetMv: number | null;
	/** Largest |measured − expected| / expected over the idle currents, %. */
	maxIdleDeviationPct: number | null;
}

/**
 * Derive a bring-up block. Rails expected ±35 V measured +35.4 / −29.0 V → bringup.rail-mismatch (caution, −17 %);
 * no current limiter → bringup.no-current-limit (caution).
 */
export function deriveBringup(data: BringupSpec, speakerProtection?: boolean): SpecResult<BringupDerived> {
	const checks: Check[] = [];
	const railDev = data.rails.map((r) => ({
		...r,
		deviationPct: (100 * (r.measuredV - r.expectedV)) / Math.abs(r.expectedV),
		reversed: r.measuredV !== 0 && Math.sign(r.measuredV) !== Math.sign(r.expectedV)
	}));
	const idleDev = data.idleCurrent.map((c) => ({ ...c, deviationPct: (100 * (c.measuredMa - c.expectedMa)) / c.expectedMa }));
	const absOffsets = data.dcOffsetMv.map(Math.abs);
	const derived: BringupDerived = {
		maxRailDeviationPct: railDev.length ? Math.max(...railDev.map((r) => Math.abs(r.deviationPct))) : null,
		maxAbsOffsetMv: absOffsets.length ? Math.max(...absOffsets) : null,
		maxIdleDeviationPct: idleDev.length ? Math.max(...idleDev.map((c) => Math.abs(c.deviationPct))) : null
	};

	if (!data.currentLimited)
		checks.push({
			id: 'bringup.no-current-limit',
			level: 'caution',
			message: 'The first power-up was not current limited. A series lamp, series resistor or current-limited bench supply turns a wiring fault into a glowing lamp instead of burnt parts; use one for the next first start.',
			values: { currentLimited: false },
			caution: MAINS_CAUTION
		});

	const name = (r: { label?: string }, i: number) => r.label ?? `rail ${i + 1}`;
	const reversed = railDev.map((r, i) => ({ r, i })).filter(({ r }) => r.reversed);
	const off = railDev.map((r, i) => ({ r, i })).filter(({ r }) => !r.reversed && Math.abs(r.deviationPct) > RAIL_TOLERANCE_PCT);
	if (reversed.length || off.length) {
		const worst = reversed[0] ?? off.reduce((a, b) => (Math.abs(b.r.deviationPct) > Math.abs(a.r.deviationPct) ? b : a));
		const parts = [...reversed, ...off].map(
			({ r, i }) => `${name(r, i)}: expected ${fmt(r.expectedV)} V, measured ${fmt(r.measuredV)} V${r.reversed ? ' (reversed polarity)' : ` (${fmt(r.deviationPct)} %)`}`
		);
		checks.push({
			id: 'bringup.rail-mismatch',
			level: reversed.length ? 'danger' : 'caution',
			message: `${reversed.length ? 'A rail has the wrong polarity — switch off and check the rectifier and reservoir wiring before anything else. ' : `A rail is more than ${RAIL_TOLERANCE_PCT} % off its expected value. `}${parts.join('; ')}.`,
			values: {
				rail: name(worst.r, worst.i),
				expectedV: worst.r.expectedV,
				measuredV: worst.r.measuredV,
				deviationPct: worst.r.deviationPct,
				tolerancePct: RAIL_TOLERANCE_PCT,
				railsOff: reversed.length + off.length
			},
			caution: CHARGE_CAUTION
		});
	}

	if (absOffsets.length) {
		const i = absOffsets.indexOf(Math.max(...absOffsets));
		if (absOffsets[i] > OFFSET_CAUTION_MV) {
			const danger = absOffsets[i] > OFFSET_DANGER_MV;
			checks.push({
				id: 'bringup.offset',
				level: danger ? 'danger' : 'caution',
				message: danger
					? `Channel ${i + 1} shows ${fmt(data.dcOffsetMv[i])} mV DC with no speaker connected, over ${OFFSET_DANGER_MV} mV: do not connect a speaker until the cause is found.`
					: `Channel ${i + 1} shows ${fmt(data.dcOffsetMv[i])} mV DC with no speaker connected, over ${OFFSET_CAUTION_MV} mV: find the cause before long listening.`,
				values: { channel: i + 1, offsetMv: data.dcOffsetMv[i], cautionMv: OFFSET_CAUTION_MV, dangerMv: OFFSET_DANGER_MV }
			});
		}
	}

	const protection = speakerProtectionCheck('bringup.speaker-protection', data.dcOffsetMv, data.speakerProtection === true || speakerProtection === true);
	if (protection) checks.push(protection);

	if (data.oscillationFound)
		checks.push({
			id: 'bringup.oscillation',
			level: 'danger',
			message: 'Oscillation was found: it heats the output stage and Zobel resistor and can destroy tweeters. Fix layout, decoupling or compensation before connecting speakers.',
			values: { oscillationChecked: data.oscillationChecked, oscillationFound: true },
			caution: HEAT_CAUTION
		});
	else if (!data.oscillationChecked)
		checks.push({
			id: 'bringup.oscillation',
			level: 'note',
			message: 'No oscillation check is recorded; look at the output on a scope (no input, then with a signal into the load).',
			values: { oscillationChecked: false, oscillationFound: false }
		});

	const idleOff = idleDev.map((c, i) => ({ c, i })).filter(({ c }) => Math.abs(c.deviationPct) > IDLE_TOLERANCE_PCT);
	if (idleOff.length) {
		const worst = idleOff.reduce((a, b) => (Math.abs(b.c.deviationPct) > Math.abs(a.c.deviationPct) ? b : a));
		const danger = idleOff.some(({ c }) => c.measuredMa > IDLE_DANGER_RATIO * c.expectedMa);
		checks.push({
			id: 'bringup.idle-current',
			level: danger ? 'danger' : 'caution',
			message: `${danger ? `An idle current is more than ${IDLE_DANGER_RATIO} × its expected value: switch off — the output stage can overheat or run away. ` : `An idle current is more than ${IDLE_TOLERANCE_PCT} % off its expected value. `}${idleOff
				.map(({ c, i }) => `${c.label ?? `entry ${i + 1}`}: expected ${fmt(c.expectedMa)} mA, measured ${fmt(c.measuredMa)} mA`)
				.join('; ')}.`,
			values: { expectedMa: worst.c.expectedMa, measuredMa: worst.c.measuredMa, deviationPct: worst.c.deviationPct, tolerancePct: IDLE_TOLERANCE_PCT },
			caution: HEAT_CAUTION
		});
	}

	if (data.heatSoak && data.heatSoak.sinkC > SINK_TOUCH_C)
		checks.push({
			id: 'bringup.heat-soak',
			level: 'note',
			message: `After ${fmt(data.heatSoak.minutes)} min the heatsink reached ${fmt(data.heatSoak.sinkC)} °C, too hot to touch comfortably (above ${SINK_TOUCH_C} °C, common practice).`,
			values: { minutes: data.heatSoak.minutes, sinkC: data.heatSoak.sinkC, limitC: SINK_TOUCH_C },
			caution: HEAT_CAUTION
		});
	return { derived, checks };
}
