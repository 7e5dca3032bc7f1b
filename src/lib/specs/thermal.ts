/**
 * Spec block "thermal": schema, derived values and checks (API.md, PRODUCT.md §4.3, REFERENCE.md §3, §8).
 * Source of the method: power-amp IC datasheet thermal method ("Determining the Correct Heat Sink").
 * Heat can burn and destroy parts; these checks certify nothing — defer to local codes and licensed practice.
 */
import { z } from 'zod';
import { heatsink } from '../engineering';
import { HEAT_CAUTION, MAINS_CAUTION, flag, fmt, num, type Check, type SpecResult } from './types';

/** Design margin below junctionMaxC inside which thermal.junction-near-limit is a caution: 25 °C (API.md; common practice 125 °C on a 150 °C part). */
export const JUNCTION_MARGIN_C = 25;
/** Heatsink temperature above which it is too hot to touch comfortably: 70 °C (common practice, no single source; touch limits are set in product-safety standards). */
export const SINK_TOUCH_C = 70;

/** Schema of a thermal block (`devices` devices of powerW each on one heatsink); unknown keys are dropped. */
export const thermalSpec = z.object({
	/** Dissipation of each device, W (use the amplifier block's designDissipationW per stage). */
	powerW: num(0, 2000, 'W'),
	/** Devices sharing the heatsink, each dissipating powerW. */
	devices: z.number({ error: 'must be a whole number' }).int('must be a whole number').min(1, 'must be at least 1').max(64, 'must be at most 64').default(1),
	ambientC: num(-40, 100, '°C'),
	junctionMaxC: num(50, 250, '°C'),
	rthJcKPerW: num(0, 50, 'K/W'),
	rthCsKPerW: num(0, 20, 'K/W'),
	rthSaKPerW: num(0, 100, 'K/W'),
	tabAtRail: flag(),
	tabInsulated: flag(),
	heatsinkBondedToChassis: flag()
});

/** Parsed thermal block. */
export type ThermalSpec = z.output<typeof thermalSpec>;

/** Derived values of a thermal block (per device unless named otherwise). */
export interface ThermalDerived {
	[key: string]: number | boolean | null;
	junctionC: number;
	caseC: number;
	/** Ta + devices·powerW·Rθsa. */
	sinkC: number;
	/** Largest Rθsa that keeps each junction at junctionMaxC (bench-tool name, margin 0); ≤ 0: none can. */
	requiredRthSaKPerW: number | null;
	/** requiredRthSaKPerW > 0 (true without dissipation). */
	feasible: boolean;
	/** Largest Rθsa that keeps each junction JUNCTION_MARGIN_C below junctionMaxC. */
	requiredRthSaForMarginKPerW: number | null;
	/** junctionMaxC − junctionC. */
	headroomC: number;
}

/**
 * Derive a thermal block; temperatures and requirements come from $lib/engineering heatsink().
 * 31.03 W, 40 °C, Rθ 1.0 + 0.4 + 1.5 → junctionC 130.0 (caution at a 150 °C limit),
 * requiredRthSaKPerW 2.145, requiredRthSaForMarginKPerW 1.339.
 */
export function deriveThermal(data: ThermalSpec): SpecResult<ThermalDerived> {
	const base = {
		ambientC: data.ambientC,
		junctionMaxC: data.junctionMaxC,
		rthJcKPerW: data.rthJcKPerW,
		rthCsKPerW: data.rthCsKPerW,
		devices: data.devices
	};
	const hasPower = data.powerW > 0;
	const at = hasPower ? heatsink({ ...base, powerW: data.powerW, rthSaKPerW: data.rthSaKPerW }) : null;
	const withMargin = hasPower ? heatsink({ ...base, powerW: data.powerW, marginC: JUNCTION_MARGIN_C }) : null;
	const sinkC = at?.sinkC ?? data.ambientC;
	const caseC = at?.caseC ?? data.ambientC;
	const junctionC = at?.junctionC ?? data.ambientC;
	const derived: ThermalDerived = {
		junctionC,
		caseC,
		sinkC,
		requiredRthSaKPerW: at?.requiredRthSaKPerW ?? null,
		feasible: at?.feasible ?? true,
		requiredRthSaForMarginKPerW: withMargin?.requiredRthSaKPerW ?? null,
		headroomC: data.junctionMaxC - junctionC
	};
	const checks: Check[] = [];
	const values = { junctionC, junctionMaxC: data.junctionMaxC, marginC: JUNCTION_MARGIN_C, powerW: data.powerW, devices: data.devices };
	if (at && !at.feasible)
		checks.push({
			id: 'thermal.impossible',
			level: 'danger',
			message: `No heatsink can hold the junction at ${fmt(data.junctionMaxC)} °C: the junction–case and case–sink path alone takes it to ${fmt(data.ambientC + data.powerW * (data.rthJcKPerW + data.rthCsKPerW))} °C at ${fmt(data.powerW)} W and ${fmt(data.ambientC)} °C ambient. Lower the rails, raise the load, or spread the heat over more devices.`,
			values: { ...values, requiredRthSaKPerW: at.requiredRthSaKPerW },
			caution: HEAT_CAUTION
		});
	if (junctionC >= data.junctionMaxC) {
		const r = derived.requiredRthSaForMarginKPerW;
		checks.push({
			id: 'thermal.junction-near-limit',
			level: 'danger',
			message: `The junction reaches ${fmt(junctionC)} °C, at or over its ${fmt(data.junctionMaxC)} °C limit: the device will shut down or fail. ${r !== null && r > 0 ? `Use a larger heatsink (≤ ${fmt(r)} K/W for a ${JUNCTION_MARGIN_C} °C margin), lower rails or a higher load.` : `No heatsink gives a ${JUNCTION_MARGIN_C} °C margin at this dissipation: lower the rails, raise the load or share the heat over more devices.`}`,
			values,
			caution: HEAT_CAUTION
		});
	} else if (junctionC > data.junctionMaxC - JUNCTION_MARGIN_C)
		checks.push({
			id: 'thermal.junction-near-limit',
			level: 'caution',
			message: `The junction reaches ${fmt(junctionC)} °C, within ${JUNCTION_MARGIN_C} °C of its ${fmt(data.junctionMaxC)} °C limit. Design for a margin, not for the shutdown point.`,
			values,
			caution: HEAT_CAUTION
		});
	if (data.tabAtRail && !data.tabInsulated && data.heatsinkBondedToChassis)
		checks.push({
			id: 'thermal.tab-to-chassis',
			level: 'danger',
			message: 'The device tab sits at a supply rail and touches a heatsink bonded to the chassis with no insulator: that shorts the rail to chassis. Fit an insulator and shoulder washer and check with an ohmmeter before power-up.',
			values: { tabAtRail: true, tabInsulated: false, heatsinkBondedToChassis: true },
			caution: MAINS_CAUTION
		});
	else if (data.tabAtRail && !data.tabInsulated && !data.heatsinkBondedToChassis)
		checks.push({
			id: 'thermal.live-heatsink',
			level: 'caution',
			message: 'The heatsink sits at a supply rail (tab not insulated): keep it out of reach and away from the chassis and other sinks, or insulate the tab.',
			values: { tabAtRail: true, tabInsulated: false, heatsinkBondedToChassis: false },
			caution: HEAT_CAUTION
		});
	if (sinkC > SINK_TOUCH_C)
		checks.push({
			id: 'thermal.sink-hot',
			level: 'note',
			message: `The heatsink runs at about ${fmt(sinkC)} °C, too hot to touch comfortably (above ${SINK_TOUCH_C} °C, common practice); keep it inside the case or guarded.`,
			values: { sinkC, limitC: SINK_TOUCH_C },
			caution: HEAT_CAUTION
		});
	return { derived, checks };
}
