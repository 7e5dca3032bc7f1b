/**
 * Spec block "power supply": schema, derived values and checks (API.md, PRODUCT.md §4.3, REFERENCE.md §4, §8).
 * CAUTION: mains wiring can kill. These checks flag and explain, they certify nothing —
 * defer to local codes and licensed practice.
 */
import { z } from 'zod';
import {
	DIODE_DROPS,
	RAIL_COUNT,
	RECTIFIERS,
	TRANSFORMER_VA_FACTOR,
	bleederPowerW,
	bleederTimeS,
	capMarginRatio,
	primaryCurrentA,
	primaryFuseRangeA,
	rectifierCurrents,
	storedEnergyJ,
	windingRatingFromVaA,
	supplyWorstCase,
	transformerVaNeeded,
	REGULATION_ASSUMED_PCT,
	MAINS_TOLERANCE_PCT,
	CAPACITOR_INPUT_FORM_FACTOR
} from '../engineering';
import { CHARGE_CAUTION, HEAT_CAUTION, MAINS_CAUTION, flag, fmt, num, oneOf, pos, type Check, type SpecResult } from './types';
import { CHASSIS } from './kinds';

/** Chassis materials (API.md); kept in ./kinds so pages can read them without the schemas. */
export { CHASSIS };

/** Capacitor margin asked for against the high-mains unloaded rail: 1.2 (API.md threshold; common practice 1.2–1.25). */
export const CAP_MARGIN = 1.2;
/**
 * IEC 62368-1 energy-source class limits for steady DC a person may touch, V: ES1 up to 60 V, ES2 up to 120 V
 * (as given by public summaries of the standard — verify against the standard before relying on them).
 * A supply whose rails together exceed them keeps a hazardous charge after switch-off unless it is bled.
 */
export const ES1_DC_LIMIT_V = 60;
/** See ES1_DC_LIMIT_V. */
export const ES2_DC_LIMIT_V = 120;
/** A primary fuse above this multiple of the full-load primary current protects little (API.md; common practice 1.5–3 ×). */
export const FUSE_MAX_RATIO = 3;
/**
 * Transformer size above which a soft-start (series NTC, or a resistor a relay shorts after a moment) is advised:
 * 300 VA. Source: an amplifier-project supply article recommends one above 300 VA (toroid inrush; REFERENCE.md §4.7).
 */
export const SOFT_START_VA = 300;
/** A fast fuse is noted from this transformer size up (inrush; API.md revision 2). VA. */
export const FAST_FUSE_NOTE_VA = 100;
/** Voltage a bleeder is timed to: 5 V (common practice, no single source; below any shock threshold but still able to spark). */
export const BLEEDER_SAFE_V = 5;

/**
 * Transformer rule (common practice, no single source; REFERENCE.md §4.5): VA ≈ 1.0–2.0 × the sum of the
 * amplifier's rated continuous output powers, 1.5 × the usual middle. Below 1.0 × → caution; 1.0–1.5 × → note
 * (fine for music, sags on full-power sine tests).
 */
export const TRANSFORMER_RULE = { lowFactor: 1.0, factor: TRANSFORMER_VA_FACTOR } as const;

/** Schema of a power-supply block; unknown keys are dropped. */
export const supplySpec = z
	.object({
		mainsVac: num(90, 270, 'V'),
		mainsHz: num(45, 65, 'Hz'),
		transformerVA: pos(10_000, 'VA'),
		/** RMS of the winding that feeds one rail, at full rated load. */
		secondaryVac: pos(1000, 'V'),
		rectifier: oneOf(RECTIFIERS),
		diodeDropV: num(0, 5, 'V').default(0.7),
		/** Per rail. */
		reservoirF: pos(10, 'F'),
		capRatingV: pos(1000, 'V'),
		/** Per rail. */
		loadCurrentA: num(0, 100, 'A'),
		fuse: z
			.object({ ratingA: pos(100, 'A'), type: oneOf(['slow', 'fast'] as const) }, { error: 'must be an object { ratingA, type } or null' })
			.nullable(),
		chassis: oneOf(CHASSIS),
		protectiveEarth: flag(),
		doubleInsulated: flag(),
		/** true / false, or { ohm } (one bleeder per rail), or null for none. */
		bleeder: z.union([z.boolean(), z.object({ ohm: pos(1e8, 'Ω') })], { error: 'must be true, false, { ohm } or null' }).nullable(),
		/** A soft-start (inrush limiter) is fitted. */
		softStart: flag().optional(),
		/** Whether the supply is mains powered (default true); a fuse is required only then. */
		mainsPowered: flag().default(true),
		/** Transformer regulation: off-load rise over the rated secondary, % (read the transformer's data; 10 assumed when absent). */
		regulationPct: num(0, 50, '%').nullish(),
		mainsHighPct: num(0, 25, '%').default(MAINS_TOLERANCE_PCT),
		mainsLowPct: num(0, 25, '%').default(MAINS_TOLERANCE_PCT),
		/** Sum of the rated continuous output powers this supply feeds, for the VA rule. W. */
		amplifierDemandW: pos(10_000, 'W').nullish(),
		/** Rated RMS current of the winding that feeds one rail (each half of a centre-tapped winding), A; from transformerVA when absent. */
		secondaryRatedA: pos(1000, 'A').nullish(),
		/** Ripple-current rating of one rail's reservoir at 100/120 Hz (add the ratings of parallel capacitors), A RMS. */
		capRippleRatingA: pos(1000, 'A').nullish()
	})
	.superRefine((d, ctx) => {
		const drops = DIODE_DROPS[d.rectifier] * d.diodeDropV;
		const lowPeak = Math.SQRT2 * d.secondaryVac * (1 - d.mainsLowPct / 100) - drops;
		if (!(lowPeak > 0))
			ctx.addIssue({ code: 'custom', path: ['diodeDropV'], message: 'the diode drops are larger than the secondary peak at low mains' });
		else {
			const peak = Math.SQRT2 * d.secondaryVac - drops;
			const ripple = d.loadCurrentA / ((d.rectifier === 'half-wave' ? 1 : 2) * d.mainsHz * d.reservoirF);
			if (ripple >= peak || ripple / 2 >= lowPeak)
				ctx.addIssue({ code: 'custom', path: ['reservoirF'], message: `too small: the ripple (${fmt(ripple)} Vpp) would swallow the ${fmt(lowPeak)} V rail at low mains` });
		}
	});

/** Parsed power-supply block. */
export type SupplySpec = z.output<typeof supplySpec>;

/** Derived values of a power-supply block (per rail unless named total). */
export interface SupplyDerived {
	[key: string]: number | null;
	/** √2·Vac − drops (as the bench tool): the rated full-load secondary's crest at nominal mains. */
	peakDcV: number;
	rippleVpp: number;
	/** peakDcV − rippleVpp/2 (as the bench tool). */
	averageDcV: number;
	/** √2·Vac·(1 + regulation) − drops. */
	offLoadPeakDcV: number;
	/** √2·Vac·(1 + regulation)·(1 + mains high) − drops. */
	highMainsPeakDcV: number;
	/** √2·Vac·(1 − mains low) − drops − ripple/2. */
	lowMainsAverageDcV: number;
	/** Rail to rail for bridge-split, else highMainsPeakDcV. */
	highMainsTotalDcV: number;
	/** Regulation used (the block's, or 10 % assumed). */
	regulationPct: number;
	/** capRatingV / highMainsPeakDcV. */
	highMainsCapMarginRatio: number;
	railCount: number;
	/** transformerVA / mainsVac. */
	primaryCurrentA: number;
	fuseMinA: number;
	fuseMaxA: number;
	/** All reservoirs together at the high-mains rail. */
	storedEnergyJ: number;
	vaNeeded: number | null;
	vaHeadroomRatio: number | null;
	bleederTimeS: number | null;
	bleederPowerW: number | null;
	/** RMS current in the winding feeding one rail at loadCurrentA (capacitor input, form factor 1.8). */
	secondaryRmsA: number;
	/** Peak current of one charging pulse through a diode. */
	peakDiodeCurrentA: number;
	/** RMS ripple current in one rail's reservoir. */
	rippleCurrentA: number;
	/** Average current through one diode. */
	diodeAverageA: number;
	/** Duration of each charging pulse, degrees of the mains cycle. */
	conductionDeg: number;
	/** Rated RMS current of that winding: secondaryRatedA, or transformerVA spread over the secondary. */
	windingRatedA: number;
	/** secondaryRmsA / windingRatedA. */
	windingLoadRatio: number;
}

/** VA rule check shared by the supply block and the cross-block check. transformerCheck('supply.transformer-small', 100, 100) → note. */
export function transformerCheck(id: string, transformerVA: number, demandW: number): Check | null {
	const needed = transformerVaNeeded(demandW, TRANSFORMER_RULE.factor);
	const values = { transformerVA, amplifierDemandW: demandW, vaNeeded: needed, ratio: transformerVA / demandW };
	if (transformerVA < TRANSFORMER_RULE.lowFactor * demandW)
		return {
			id,
			level: 'caution',
			message: `The ${fmt(transformerVA)} VA transformer is below the ${fmt(demandW)} W of rated output it feeds (rule of thumb: 1.0–2.0 × the output power, ${fmt(needed)} VA at 1.5 ×); expect sagging rails and a hot transformer.`,
			values,
			caution: MAINS_CAUTION
		};
	if (transformerVA < needed)
		return {
			id,
			level: 'note',
			message: `The ${fmt(transformerVA)} VA transformer is inside the usual 1.0–2.0 × range but below the common 1.5 × (${fmt(needed)} VA) for ${fmt(demandW)} W of output: fine for music, it will sag on full-power sine tests.`,
			values
		};
	return null;
}

/**
 * Derive a power-supply block (API.md "Checks, revision 2"). 230 V, 25-0-25 V (bridge-split, 0.8 V), 10 mF, 3 A,
 * 50 V caps, reg 7 % → peakDcV 34.56, rippleVpp 3.0, highMainsPeakDcV 40.81, highMainsCapMarginRatio 1.225 (no cap check).
 */
export function deriveSupply(data: SupplySpec): SpecResult<SupplyDerived> {
	const assumed = data.regulationPct === undefined || data.regulationPct === null;
	const regulationPct = assumed ? REGULATION_ASSUMED_PCT : data.regulationPct!;
	const rails = supplyWorstCase({
		secondaryVac: data.secondaryVac,
		rectifier: data.rectifier,
		diodeDropV: data.diodeDropV,
		mainsHz: data.mainsHz,
		loadCurrentA: data.loadCurrentA,
		capacitanceF: data.reservoirF,
		regulationPct,
		mainsHighPct: data.mainsHighPct,
		mainsLowPct: data.mainsLowPct
	});
	const highV = rails.highMainsPeakDcV;
	const railCount = RAIL_COUNT[data.rectifier];
	const fuseRange = primaryFuseRangeA(data.transformerVA, data.mainsVac);
	const ip = primaryCurrentA(data.transformerVA, data.mainsVac);
	const bleederOhm = typeof data.bleeder === 'object' && data.bleeder !== null ? data.bleeder.ohm : null;
	const vaNeeded = data.amplifierDemandW ? transformerVaNeeded(data.amplifierDemandW) : null;
	const currents = rectifierCurrents({ rectifier: data.rectifier, loadCurrentA: data.loadCurrentA });
	const ratingFromVa = data.secondaryRatedA === undefined || data.secondaryRatedA === null;
	const windingRatedA = ratingFromVa ? windingRatingFromVaA(data.transformerVA, data.secondaryVac, data.rectifier) : data.secondaryRatedA!;
	const derived: SupplyDerived = {
		peakDcV: rails.peakDcV,
		rippleVpp: rails.rippleVpp,
		averageDcV: rails.averageDcV,
		offLoadPeakDcV: rails.offLoadPeakDcV,
		highMainsPeakDcV: highV,
		lowMainsAverageDcV: rails.lowMainsAverageDcV,
		highMainsTotalDcV: rails.highMainsTotalDcV,
		regulationPct,
		highMainsCapMarginRatio: capMarginRatio(data.capRatingV, highV),
		railCount,
		primaryCurrentA: ip,
		fuseMinA: fuseRange.minA,
		fuseMaxA: fuseRange.maxA,
		storedEnergyJ: railCount * storedEnergyJ(data.reservoirF, highV),
		vaNeeded,
		vaHeadroomRatio: vaNeeded ? data.transformerVA / vaNeeded : null,
		bleederTimeS: bleederOhm ? bleederTimeS({ bleederOhm, capacitanceF: data.reservoirF, startV: highV, safeV: BLEEDER_SAFE_V }) : null,
		bleederPowerW: bleederOhm ? bleederPowerW(highV, bleederOhm) : null,
		secondaryRmsA: currents.secondaryRmsA,
		peakDiodeCurrentA: currents.peakDiodeCurrentA,
		rippleCurrentA: currents.rippleCurrentA,
		diodeAverageA: currents.diodeAverageA,
		conductionDeg: currents.conductionDeg,
		windingRatedA,
		windingLoadRatio: currents.secondaryRmsA / windingRatedA
	};

	const checks: Check[] = [];
	if (assumed)
		checks.push({
			id: 'supply.regulation-assumed',
			level: 'note',
			message: `No transformer regulation given: ${REGULATION_ASSUMED_PCT} % is assumed (common practice for small toroids; laminated cores run higher). The off-load rail is ${fmt(rails.offLoadPeakDcV)} V; enter the figure from the transformer's data to refine it.`,
			values: { regulationPct: REGULATION_ASSUMED_PCT, offLoadPeakDcV: rails.offLoadPeakDcV }
		});
	if (data.mainsPowered && data.chassis === 'none')
		checks.push({
			id: 'supply.no-enclosure',
			level: 'danger',
			message: 'A mains-powered supply with no enclosure leaves mains terminals within reach. Put it in an earthed metal case or a double-insulated one before it is used.',
			values: { chassis: 'none', mainsPowered: true },
			caution: MAINS_CAUTION
		});
	if (data.mainsPowered && data.fuse === null)
		checks.push({
			id: 'supply.no-fuse',
			level: 'danger',
			message: `No primary fuse: a mains-powered supply needs a time-delay fuse in the live conductor at the inlet, before the switch (about ${fmt(fuseRange.minA)}–${fmt(fuseRange.maxA)} A for ${fmt(data.transformerVA)} VA at ${fmt(data.mainsVac)} V; toroids may need more for inrush — ask the transformer maker).`,
			values: { fuse: null, transformerVA: data.transformerVA, mainsVac: data.mainsVac, fuseMinA: fuseRange.minA, fuseMaxA: fuseRange.maxA },
			caution: MAINS_CAUTION
		});
	if (data.mainsPowered && data.fuse && (data.fuse.ratingA > FUSE_MAX_RATIO * ip || data.fuse.ratingA < ip))
		checks.push({
			id: 'supply.fuse-size',
			level: 'caution',
			message:
				data.fuse.ratingA < ip
					? `The ${fmt(data.fuse.ratingA)} A fuse is below the ${fmt(ip)} A full-load primary current of a ${fmt(data.transformerVA)} VA transformer at ${fmt(data.mainsVac)} V: it will blow in normal use.`
					: `The ${fmt(data.fuse.ratingA)} A fuse is more than ${FUSE_MAX_RATIO} × the ${fmt(ip)} A full-load primary current of a ${fmt(data.transformerVA)} VA transformer at ${fmt(data.mainsVac)} V: a transformer fault may not blow it. About ${fmt(fuseRange.minA)}–${fmt(fuseRange.maxA)} A time-delay is usual (ask the transformer maker).`,
			values: { ratingA: data.fuse.ratingA, primaryCurrentA: ip, maxRatio: FUSE_MAX_RATIO, ratio: data.fuse.ratingA / ip },
			caution: MAINS_CAUTION
		});
	if (data.mainsPowered && data.fuse && data.fuse.type === 'fast' && data.transformerVA >= FAST_FUSE_NOTE_VA)
		checks.push({
			id: 'supply.fuse-type',
			level: 'note',
			message: `A fast fuse on the primary of a ${fmt(data.transformerVA)} VA transformer tends to blow at switch-on (inrush); a time-delay (T) fuse is the usual choice.`,
			values: { fuseType: 'fast', ratingA: data.fuse.ratingA, transformerVA: data.transformerVA },
			caution: MAINS_CAUTION
		});
	if (data.mainsPowered && data.transformerVA > SOFT_START_VA && data.softStart !== true)
		checks.push({
			id: 'supply.soft-start',
			level: 'note',
			message: `A ${fmt(data.transformerVA)} VA transformer (toroids especially) can draw many times its running current at switch-on: above ${SOFT_START_VA} VA a soft-start is usual, so the primary fuse can stay small.`,
			values: { transformerVA: data.transformerVA, softStartVA: SOFT_START_VA },
			caution: MAINS_CAUTION
		});
	if (data.mainsPowered && data.chassis === 'metal' && !data.protectiveEarth && !data.doubleInsulated)
		checks.push({
			id: 'supply.no-earth',
			level: 'danger',
			message: 'A metal chassis without protective earth and not double insulated can become live under a fault. Bond it to mains earth at a dedicated stud (never lift the earth to cure hum).',
			values: { chassis: data.chassis, protectiveEarth: false, doubleInsulated: false },
			caution: MAINS_CAUTION
		});
	else if (data.mainsPowered && data.chassis === 'metal' && !data.protectiveEarth && data.doubleInsulated)
		checks.push({
			id: 'supply.double-insulated-metal',
			level: 'note',
			message: 'Double insulation in a metal case needs double or reinforced insulation between every accessible metal part and mains; a metal-cased build is almost always a protectively earthed (Class I) design.',
			values: { chassis: data.chassis, protectiveEarth: false, doubleInsulated: true },
			caution: MAINS_CAUTION
		});
	if (data.mainsPowered && (data.chassis === 'plastic' || data.chassis === 'wood') && !data.doubleInsulated && !data.protectiveEarth)
		checks.push({
			id: 'supply.insulation',
			level: 'caution',
			message: `A ${data.chassis} case is not insulation by itself: screws, connectors, controls and any metal panel can reach mains under a fault. Either earth every accessible metal part or build to double insulation throughout.`,
			values: { chassis: data.chassis, protectiveEarth: false, doubleInsulated: false },
			caution: MAINS_CAUTION
		});
	if (data.capRatingV < highV)
		checks.push({
			id: 'supply.cap-rating',
			level: 'danger',
			message: `The ${fmt(data.capRatingV)} V reservoir capacitors are below the ${fmt(highV)} V rail they see off load at +${fmt(data.mainsHighPct)} % mains: they are over-voltage within normal mains tolerance and can vent or burst.`,
			values: { capRatingV: data.capRatingV, highMainsPeakDcV: highV, ratio: data.capRatingV / highV },
			caution: CHARGE_CAUTION
		});
	else if (data.capRatingV < CAP_MARGIN * highV)
		checks.push({
			id: 'supply.cap-rating',
			level: 'caution',
			message: `The ${fmt(data.capRatingV)} V reservoir capacitors have a thin margin: the rail reaches ${fmt(highV)} V off load at +${fmt(data.mainsHighPct)} % mains, and ${fmt(CAP_MARGIN)} × that is ${fmt(CAP_MARGIN * highV)} V (common practice).`,
			values: { capRatingV: data.capRatingV, highMainsPeakDcV: highV, ratio: data.capRatingV / highV, margin: CAP_MARGIN },
			caution: CHARGE_CAUTION
		});
	if (currents.secondaryRmsA > windingRatedA)
		checks.push({
			id: 'supply.winding-current',
			level: 'caution',
			message: `At ${fmt(data.loadCurrentA)} A per rail a capacitor-input rectifier draws about ${fmt(currents.secondaryRmsA)} A RMS from the winding (short charging pulses, peaks near ${fmt(currents.peakDiodeCurrentA)} A), above its ${fmt(windingRatedA)} A rating${ratingFromVa ? ` (${fmt(data.transformerVA)} VA over the secondary; state the winding's own rating if the transformer has other windings)` : ''}: the transformer runs hot and the rails sag more than its regulation figure says. Music averages far less than a sine test, but size for the test you will run.`,
			values: { secondaryRmsA: currents.secondaryRmsA, windingRatedA, ratio: currents.secondaryRmsA / windingRatedA, loadCurrentA: data.loadCurrentA, formFactor: CAPACITOR_INPUT_FORM_FACTOR, ratingFromVA: ratingFromVa },
			caution: HEAT_CAUTION
		});
	if (data.capRippleRatingA !== undefined && data.capRippleRatingA !== null && currents.rippleCurrentA > data.capRippleRatingA)
		checks.push({
			id: 'supply.ripple-current',
			level: 'caution',
			message: `Each rail's reservoir carries about ${fmt(currents.rippleCurrentA)} A RMS of ripple current at ${fmt(data.loadCurrentA)} A, above its ${fmt(data.capRippleRatingA)} A rating: it heats inside and ages early. Use capacitors with a higher ripple rating, or more of them in parallel (their ratings add).`,
			values: { rippleCurrentA: currents.rippleCurrentA, capRippleRatingA: data.capRippleRatingA, ratio: currents.rippleCurrentA / data.capRippleRatingA, loadCurrentA: data.loadCurrentA },
			caution: CHARGE_CAUTION
		});
	if (data.amplifierDemandW) {
		const c = transformerCheck('supply.transformer-small', data.transformerVA, data.amplifierDemandW);
		if (c) checks.push(c);
	}
	if (data.bleeder === null || data.bleeder === false) {
		const total = rails.highMainsTotalDcV;
		const level = total > ES2_DC_LIMIT_V ? 'danger' : total > ES1_DC_LIMIT_V ? 'caution' : 'note';
		checks.push({
			id: 'supply.no-bleeder',
			level,
			message:
				level === 'note'
					? `No bleeder: the reservoirs keep about ${fmt(derived.storedEnergyJ)} J after switch-off, enough to spark and burn even where the voltage is low.`
					: `No bleeder: the reservoirs keep up to ${fmt(total)} V${railCount === 2 ? ' rail to rail' : ''} after switch-off, above the ${level === 'danger' ? ES2_DC_LIMIT_V : ES1_DC_LIMIT_V} V DC limit of ${level === 'danger' ? 'IEC 62368-1 class ES2 (can injure)' : 'class ES1 (can hurt)'}, and about ${fmt(derived.storedEnergyJ)} J. Fit a bleeder across each reservoir.`,
			values: { highMainsTotalDcV: total, es1LimitV: ES1_DC_LIMIT_V, es2LimitV: ES2_DC_LIMIT_V, storedEnergyJ: derived.storedEnergyJ },
			caution: CHARGE_CAUTION
		});
	}
	return { derived, checks };
}
