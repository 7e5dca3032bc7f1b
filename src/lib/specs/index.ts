/**
 * Spec-block kinds: one zod schema and one derive function per kind, plus checks across blocks and the
 * parts list. Built on $lib/engineering; pure TypeScript, no I/O.
 */
import type { z } from 'zod';
import { amplifierSpec, deriveAmplifier, CLAIMED_POWER_ALLOWANCE, type AmplifierDerived } from './amplifier';
import { supplySpec, deriveSupply, transformerCheck, type SupplyDerived, type SupplySpec } from './supply';
import { thermalSpec, deriveThermal } from './thermal';
import { measurementsSpec, deriveMeasurements } from './measurements';
import { bringupSpec, deriveBringup } from './bringup';
import { CHARGE_CAUTION, HEAT_CAUTION, fmt, type Check, type SpecResult } from './types';
import type { AmplifierSpec } from './amplifier';

export * from './types';
export * from './amplifier';
export * from './supply';
export * from './thermal';
export * from './measurements';
export * from './bringup';

/** The spec-block kinds, in the order the UI lists them. */
export const SPEC_KINDS = ['amplifier', 'supply', 'thermal', 'measurements', 'bringup'] as const;
/** One spec-block kind. */
export type SpecKind = (typeof SPEC_KINDS)[number];

/** Schema of each kind. specSchemas.supply.parse(data) → the parsed supply block. */
export const specSchemas = {
	amplifier: amplifierSpec,
	supply: supplySpec,
	thermal: thermalSpec,
	measurements: measurementsSpec,
	bringup: bringupSpec
} as const satisfies Record<SpecKind, z.ZodType>;

/** True when `kind` is one of SPEC_KINDS. isSpecKind('supply') → true. */
export function isSpecKind(kind: unknown): kind is SpecKind {
	return typeof kind === 'string' && (SPEC_KINDS as readonly string[]).includes(kind);
}

/**
 * Validate a block with its kind's schema (throws the ZodError) and derive its values and checks.
 * runSpec('thermal', { powerW: 31.03, ambientC: 40, … }) → { derived: { junctionC: 130.0, … }, checks: [...] }.
 */
export function runSpec(kind: SpecKind, data: unknown): SpecResult {
	switch (kind) {
		case 'amplifier':
			return deriveAmplifier(amplifierSpec.parse(data));
		case 'supply':
			return deriveSupply(supplySpec.parse(data));
		case 'thermal':
			return deriveThermal(thermalSpec.parse(data));
		case 'measurements':
			return deriveMeasurements(measurementsSpec.parse(data));
		case 'bringup':
			return deriveBringup(bringupSpec.parse(data));
		default:
			throw new RangeError(`unknown spec kind "${String(kind)}"; use one of ${SPEC_KINDS.join(', ')}`);
	}
}

/** A block as stored with a build. */
export interface SpecBlockInput {
	kind: string;
	data: unknown;
}

/** A parts-list line as the cross checks need it (value in SI units, voltage rating in V). */
export interface PartLineInput {
	designators: string;
	kind: string;
	value: number | null;
	ratingV?: number | null;
}

/**
 * Checks across blocks and the parts list. Blocks that fail their schema are skipped (their own
 * validation reports them). Fires:
 * - cross.cap-below-rail (caution): a capacitor rated below the highest unloaded supply rail — it may
 *   legitimately sit where the voltage is low (feedback leg, input coupling), so the reviewer judges;
 * - cross.measured-power-beyond-max (caution): measured power at ≤ 1 % THD > 1.05 × the amplifier's maxPowerW;
 * - cross.transformer-small (caution/note): the supply's VA against the amplifier blocks' output (rule in supply.ts),
 *   when the supply block does not give amplifierDemandW itself;
 * - cross.rails-beyond-device: the supply's unloaded rails above the amplifier device's maximum supply —
 *   danger at nominal mains, caution only at high mains;
 * - cross.thermal-power-below-worst (caution): a thermal block's powerW below 0.95 × the amplifier's worst-case dissipation.
 * crossChecks([{ kind: 'supply', data }], [{ designators: 'C1,C2', kind: 'capacitor', value: 0.01, ratingV: 35 }]) → [cross.cap-below-rail].
 */
export function crossChecks(blocks: readonly SpecBlockInput[], parts: readonly PartLineInput[] = []): Check[] {
	const amps: { index: number; data: AmplifierSpec; derived: AmplifierDerived }[] = [];
	const supplies: { index: number; data: SupplySpec; derived: SupplyDerived }[] = [];
	const thermals: { index: number; powerW: number }[] = [];
	const measured: { index: number; clipPowerW: number | null }[] = [];
	blocks.forEach((b, index) => {
		if (!b || !isSpecKind(b.kind)) return;
		try {
			switch (b.kind) {
				case 'amplifier': {
					const r = amplifierSpec.safeParse(b.data);
					if (r.success) amps.push({ index, data: r.data, derived: deriveAmplifier(r.data).derived });
					break;
				}
				case 'supply': {
					const r = supplySpec.safeParse(b.data);
					if (r.success) supplies.push({ index, data: r.data, derived: deriveSupply(r.data).derived });
					break;
				}
				case 'thermal': {
					const r = thermalSpec.safeParse(b.data);
					if (r.success) thermals.push({ index, powerW: r.data.powerW });
					break;
				}
				case 'measurements': {
					const r = measurementsSpec.safeParse(b.data);
					if (r.success) measured.push({ index, clipPowerW: deriveMeasurements(r.data).derived.clipPowerW });
					break;
				}
			}
		} catch (err) {
			if (!(err instanceof RangeError)) throw err;
		}
	});

	const checks: Check[] = [];

	if (supplies.length) {
		const top = supplies.reduce((a, b) => (b.derived.peakDcV > a.derived.peakDcV ? b : a));
		for (const p of parts) {
			if (!p || !/cap/i.test(String(p.kind))) continue;
			if (typeof p.ratingV !== 'number' || !Number.isFinite(p.ratingV)) continue;
			if (p.ratingV < top.derived.peakDcV)
				checks.push({
					id: 'cross.cap-below-rail',
					level: 'caution',
					message: `${p.designators}: rated ${fmt(p.ratingV)} V, below the ${fmt(top.derived.peakDcV)} V unloaded rail of the supply block. Fine only if this capacitor never sees the rail (e.g. a feedback-leg or coupling capacitor); a capacitor on the rail would be over-voltage.`,
					values: { designators: p.designators, ratingV: p.ratingV, peakDcV: top.derived.peakDcV, supplyBlock: top.index },
					caution: CHARGE_CAUTION
				});
		}
	}

	if (amps.length) {
		const ampMax = amps.reduce((a, b) => (b.derived.maxPowerW > a.derived.maxPowerW ? b : a));
		for (const m of measured) {
			if (m.clipPowerW !== null && m.clipPowerW > CLAIMED_POWER_ALLOWANCE * ampMax.derived.maxPowerW)
				checks.push({
					id: 'cross.measured-power-beyond-max',
					level: 'caution',
					message: `The measurements show ${fmt(m.clipPowerW)} W at ≤ 1 % THD, more than the ${fmt(ampMax.derived.maxPowerW)} W the amplifier block's rails can give into its load. Check the load, the rail voltage and the meter.`,
					values: { measuredPowerW: m.clipPowerW, maxPowerW: ampMax.derived.maxPowerW, measurementsBlock: m.index, amplifierBlock: ampMax.index }
				});
		}

		const demandW = amps.reduce((sum, a) => sum + a.data.channels * (a.data.claimed?.powerW ?? a.derived.maxPowerW), 0);
		for (const s of supplies) {
			if (!s.data.amplifierDemandW) {
				const c = transformerCheck('cross.transformer-small', s.data.transformerVA, demandW);
				if (c) checks.push({ ...c, values: { ...c.values, supplyBlock: s.index } });
			}
			for (const a of amps) {
				const totalV = (s.derived.railCount === 2 ? 2 : 1) * s.derived.peakDcV;
				const highV = (s.derived.railCount === 2 ? 2 : 1) * s.derived.highMainsPeakDcV;
				const max = a.data.device.maxSupplyV;
				if (totalV > max || highV > max)
					checks.push({
						id: 'cross.rails-beyond-device',
						level: totalV > max ? 'danger' : 'caution',
						message:
							totalV > max
								? `The supply block's unloaded rails total ${fmt(totalV)} V, above the device's ${fmt(max)} V maximum supply.`
								: `At +${fmt(s.data.mainsHighPct)} % mains the supply block's unloaded rails reach ${fmt(highV)} V total, above the device's ${fmt(max)} V maximum supply.`,
						values: { unloadedTotalV: totalV, highMainsTotalV: highV, maxSupplyV: max, supplyBlock: s.index, amplifierBlock: a.index },
						caution: CHARGE_CAUTION
					});
			}
		}

		const worst = Math.max(...amps.map((a) => a.derived.worstDissipationW));
		for (const t of thermals) {
			if (t.powerW < 0.95 * worst)
				checks.push({
					id: 'cross.thermal-power-below-worst',
					level: 'caution',
					message: `The thermal block uses ${fmt(t.powerW)} W, below the amplifier's ${fmt(worst)} W worst-case dissipation per channel; size the heatsink on the worst case (music derating is not a safety margin).`,
					values: { powerW: t.powerW, worstDissipationW: worst, thermalBlock: t.index },
					caution: HEAT_CAUTION
				});
		}
	}
	return checks;
}
