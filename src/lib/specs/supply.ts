/**
 * Spec block "power supply": schema, derived values and checks (API.md, PRODUCT.md §4.3, REFERENCE.md §4, §8).
 * CAUTION: mains wiring can kill. These checks flag and explain, they certify nothing —
 * defer to local codes and licensed practice.
 */
import { z } from 'zod';
import {
	RAIL_COUNT,
	RECTIFIERS,
	TRANSFORMER_VA_FACTOR,
	bleederPowerW,
	bleederTimeS,
	capMarginRatio,
	highMainsRailV,
	primaryCurrentA,
	primaryFuseRangeA,
	storedEnergyJ,
	supplyRails,
	transformerVaNeeded,
	unloadedRailV
} from '../engineering';
import { CHARGE_CAUTION, MAINS_CAUTION, flag, fmt, num, oneOf, pos, type Check, type SpecResult } from './types';

/** Chassis materials (API.md). */
export const CHASSIS = ['metal', 'plastic', 'wood', 'none'] as const;

/** Capacitor margin asked for against the high-mains unloaded rail: 1.2 (API.md threshold; common practice 1.2–1.25). */
export const CAP_MARGIN = 1.2;
/** Mains rise designed for when mainsHighPct is not given: +10 % (usual design figure; national limits from memory). */
export const MAINS_HIGH_PCT = 10;
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
		/** Whether the supply is mains powered (default true); a fuse is required only then. */
		mainsPowered: flag().default(true),
		/** Transformer regulation: off-load rise over the rated secondary. % (read the transformer's data). */
		regulationPct: num(0, 50, '%').default(0),
		mainsHighPct: num(0, 25, '%').default(MAINS_HIGH_PCT),
		/** Sum of the rated continuous output powers this supply feeds, for the VA rule. W. */
		amplifierDemandW: pos(10_000, 'W').nullish()
	})
	.superRefine((d, ctx) => {
		const drops = d.rectifier === 'bridge' ? 2 : 1;
		if (Math.SQRT2 * d.secondaryVac <= drops * d.diodeDropV)
			ctx.addIssue({ code: 'custom', path: ['diodeDropV'], message: 'the diode drops are larger than the secondary peak' });
		else {
			const peak = Math.SQRT2 * d.secondaryVac - drops * d.diodeDropV;
			const ripple = d.loadCurrentA / ((d.rectifier === 'half-wave' ? 1 : 2) * d.mainsHz * d.reservoirF);
			if (ripple >= peak)
				ctx.addIssue({ code: 'custom', path: ['reservoirF'], message: `too small: the ripple (${fmt(ripple)} Vpp) would exceed the ${fmt(peak)} V rail` });
		}
	});

/** Parsed power-supply block. */
export type SupplySpec = z.output<typeof supplySpec>;

/** Derived values of a power-supply block (per rail unless named total). */
export interface SupplyDerived {
	[key: string]: number | null;
	peakDcV: number;
	rippleVpp: number;
	averageDcV: number;
	highMainsPeakDcV: number;
	capMarginRatio: number;
	highMainsCapMarginRatio: number;
	railCount: number;
	primaryCurrentA: number;
	fuseMinA: number;
	fuseMaxA: number;
	/** All reservoirs together at the high-mains unloaded rail. */
	storedEnergyJ: number;
	vaNeeded: number | null;
	vaHeadroomRatio: number | null;
	bleederTimeS: number | null;
	bleederPowerW: number | null;
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
 * Derive a power-supply block. 230 V, 25-0-25 V (bridge-split, 0.8 V), 10 mF, 3 A, 50 V caps, reg 7 %
 * → peakDcV 34.56, rippleVpp 3.0, highMainsPeakDcV 40.81, highMainsCapMarginRatio 1.225 (no cap check).
 */
export function deriveSupply(data: SupplySpec): SpecResult<SupplyDerived> {
	const rails = supplyRails({
		secondaryVac: data.secondaryVac,
		rectifier: data.rectifier,
		diodeDropV: data.diodeDropV,
		mainsHz: data.mainsHz,
		loadCurrentA: data.loadCurrentA,
		capacitanceF: data.reservoirF
	});
	// Off-load at nominal mains includes the transformer's regulation when given.
	const unloadedV = unloadedRailV(data.secondaryVac * (1 + data.regulationPct / 100), data.rectifier, data.diodeDropV);
	const highV = highMainsRailV({
		secondaryVac: data.secondaryVac,
		rectifier: data.rectifier,
		diodeDropV: data.diodeDropV,
		regulationPct: data.regulationPct,
		mainsHighPct: data.mainsHighPct
	});
	const railCount = RAIL_COUNT[data.rectifier];
	const fuseRange = primaryFuseRangeA(data.transformerVA, data.mainsVac);
	const bleederOhm = typeof data.bleeder === 'object' && data.bleeder !== null ? data.bleeder.ohm : null;
	const vaNeeded = data.amplifierDemandW ? transformerVaNeeded(data.amplifierDemandW) : null;
	const derived: SupplyDerived = {
		peakDcV: unloadedV,
		rippleVpp: rails.rippleVpp,
		averageDcV: unloadedV - rails.rippleVpp / 2,
		highMainsPeakDcV: highV,
		capMarginRatio: capMarginRatio(data.capRatingV, unloadedV),
		highMainsCapMarginRatio: capMarginRatio(data.capRatingV, highV),
		railCount,
		primaryCurrentA: primaryCurrentA(data.transformerVA, data.mainsVac),
		fuseMinA: fuseRange.minA,
		fuseMaxA: fuseRange.maxA,
		storedEnergyJ: railCount * storedEnergyJ(data.reservoirF, highV),
		vaNeeded,
		vaHeadroomRatio: vaNeeded ? data.transformerVA / vaNeeded : null,
		bleederTimeS: bleederOhm ? bleederTimeS({ bleederOhm, capacitanceF: data.reservoirF, startV: highV, safeV: BLEEDER_SAFE_V }) : null,
		bleederPowerW: bleederOhm ? bleederPowerW(highV, bleederOhm) : null
	};

	const checks: Check[] = [];
	if (data.mainsPowered && data.fuse === null)
		checks.push({
			id: 'supply.no-fuse',
			level: 'danger',
			message: `No primary fuse: a mains-powered supply needs a time-delay fuse in the live conductor at the inlet, before the switch (about ${fmt(fuseRange.minA)}–${fmt(fuseRange.maxA)} A for ${fmt(data.transformerVA)} VA at ${fmt(data.mainsVac)} V; toroids may need more for inrush — ask the transformer maker).`,
			values: { fuse: null, transformerVA: data.transformerVA, mainsVac: data.mainsVac, fuseMinA: fuseRange.minA, fuseMaxA: fuseRange.maxA },
			caution: MAINS_CAUTION
		});
	else if (data.mainsPowered && data.fuse && data.fuse.type === 'fast')
		checks.push({
			id: 'supply.fuse-type',
			level: 'note',
			message: 'A fast fuse on a transformer primary tends to blow at switch-on (inrush); a time-delay (T) fuse is the usual choice.',
			values: { fuseType: 'fast', ratingA: data.fuse.ratingA },
			caution: MAINS_CAUTION
		});
	if (data.chassis === 'metal' && !data.protectiveEarth && !data.doubleInsulated)
		checks.push({
			id: 'supply.no-earth',
			level: 'danger',
			message: 'A metal chassis without protective earth and not double insulated can become live under a fault. Bond it to mains earth at a dedicated stud (never lift the earth to cure hum).',
			values: { chassis: data.chassis, protectiveEarth: false, doubleInsulated: false },
			caution: MAINS_CAUTION
		});
	else if (data.chassis === 'metal' && !data.protectiveEarth && data.doubleInsulated)
		checks.push({
			id: 'supply.double-insulated-metal',
			level: 'note',
			message: 'Double insulation in a metal case needs double or reinforced insulation between every accessible metal part and mains; a metal-cased build is almost always a protectively earthed (Class I) design.',
			values: { chassis: data.chassis, protectiveEarth: false, doubleInsulated: true },
			caution: MAINS_CAUTION
		});
	if (data.capRatingV < unloadedV)
		checks.push({
			id: 'supply.cap-rating',
			level: 'danger',
			message: `The ${fmt(data.capRatingV)} V reservoir capacitors are below the ${fmt(unloadedV)} V unloaded rail: they are over-voltage at normal mains and can vent or burst.`,
			values: { capRatingV: data.capRatingV, peakDcV: unloadedV, highMainsPeakDcV: highV, ratio: data.capRatingV / unloadedV },
			caution: CHARGE_CAUTION
		});
	else if (data.capRatingV < CAP_MARGIN * highV)
		checks.push({
			id: 'supply.cap-rating',
			level: 'caution',
			message: `The ${fmt(data.capRatingV)} V reservoir capacitors have a thin margin: the unloaded rail reaches ${fmt(highV)} V at +${fmt(data.mainsHighPct)} % mains, and ${fmt(CAP_MARGIN)} × that is ${fmt(CAP_MARGIN * highV)} V (common practice).`,
			values: { capRatingV: data.capRatingV, peakDcV: unloadedV, highMainsPeakDcV: highV, ratio: data.capRatingV / highV, margin: CAP_MARGIN },
			caution: CHARGE_CAUTION
		});
	if (data.amplifierDemandW) {
		const c = transformerCheck('supply.transformer-small', data.transformerVA, data.amplifierDemandW);
		if (c) checks.push(c);
	}
	if (data.bleeder === null || data.bleeder === false)
		checks.push({
			id: 'supply.no-bleeder',
			level: 'note',
			message: `No bleeder: the reservoirs keep about ${fmt(derived.storedEnergyJ)} J after switch-off, enough to spark and burn even where the voltage is low.`,
			values: { storedEnergyJ: derived.storedEnergyJ, highMainsPeakDcV: highV },
			caution: CHARGE_CAUTION
		});
	return { derived, checks };
}
