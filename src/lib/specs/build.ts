/**
 * A whole build's spec blocks and parts list at once (API.md "POST /api/v1/spec-check/build"): each block derived
 * as on its own, except that an amplifier block inside a build whose supply block states the rails takes its
 * worst case from that supply's high-mains rail; then the cross checks between blocks and against the parts list.
 * Pure: the API endpoint and the build page's stored results both come from checkBuild().
 */
import { ZodError } from 'zod';
import { amplifierSpec, deriveAmplifier, CLAIMED_POWER_ALLOWANCE, type AmplifierDerived, type AmplifierRailContext, type AmplifierSpec } from './amplifier';
import { supplySpec, deriveSupply, transformerCheck, type SupplyDerived, type SupplySpec } from './supply';
import { thermalSpec, deriveThermal } from './thermal';
import { measurementsSpec, deriveMeasurements, type MeasurementsDerived } from './measurements';
import { bringupSpec, deriveBringup } from './bringup';
import { CHARGE_CAUTION, HEAT_CAUTION, MAINS_CAUTION, fmt, type Check } from './types';
import { SPEC_KINDS, isSpecKind, type SpecKind } from './kinds';
export { SPEC_KINDS, isSpecKind, type SpecKind };

/** A block as stored with a build or posted to spec-check/build. */
export interface SpecBlockInput {
	kind: string;
	data: unknown;
}

/**
 * A parts-list line as the cross checks need it (value in SI units, voltage rating in V). `railToRail`: the part
 * sits across both rails (compared with the rail-to-rail voltage instead of one rail).
 */
export interface PartLineInput {
	designators: string;
	kind: string;
	value: number | null;
	ratingV?: number | null;
	railToRail?: boolean;
	/** The fitted value as written ("T2A") and, on a substitution line, the design's ("T1.6A"). */
	valueText?: string | null;
	designValueText?: string | null;
}

/** Current rating written in a fuse's value: "T1.6A" → 1.6, "500 mA slow" → 0.5; null when none. fuseRatingA('T1.6A') → 1.6. */
export function fuseRatingA(text: string | null | undefined): number | null {
	const m = /(\d+(?:[.,]\d+)?)\s*(m?)A(?![a-z])/i.exec(String(text ?? ''));
	if (!m) return null;
	const v = Number(m[1].replace(',', '.')) * (m[2] ? 1e-3 : 1);
	return Number.isFinite(v) && v > 0 ? v : null;
}

/** One block's outcome: derived values and checks, or why it could not be checked. */
export type BlockOutcome =
	| { ok: true; kind: SpecKind; data: Record<string, unknown>; derived: Record<string, unknown>; checks: Check[] }
	| { ok: false; kind: string; error: ZodError | RangeError };

/** What checkBuild returns: one outcome per block (same order) and the cross checks. */
export interface BuildCheckResult {
	blocks: BlockOutcome[];
	cross: Check[];
}

/** Capacitor share of a cross check: a capacitor line is one whose kind says so. */
const isCapacitor = (kind: string) => /cap/i.test(kind);
/** Transistor lines (bipolar, MOSFET, JFET) are checked against the rail like capacitors. */
const isTransistor = (kind: string) => /transistor|mosfet|fet\b/i.test(kind);

/** The rails an amplifier block sees from a supply block (per side; see AmplifierRailContext). */
export function railContext(amp: Pick<AmplifierSpec, 'supply'>, supply: SupplyDerived, supplyBlock: number): AmplifierRailContext {
	const perSide = (v: number) => (amp.supply === 'split' ? v : (supply.railCount * v) / 2);
	return {
		supplyBlock,
		highMainsRailV: perSide(supply.highMainsPeakDcV),
		loadedRailV: perSide(supply.averageDcV),
		lowMainsRailV: perSide(supply.lowMainsAverageDcV)
	};
}

function parse(kind: string, data: unknown) {
	switch (kind) {
		case 'amplifier':
			return amplifierSpec.safeParse(data);
		case 'supply':
			return supplySpec.safeParse(data);
		case 'thermal':
			return thermalSpec.safeParse(data);
		case 'measurements':
			return measurementsSpec.safeParse(data);
		case 'bringup':
			return bringupSpec.safeParse(data);
		default:
			return { success: false as const, error: new RangeError(`unknown spec kind "${kind}"; use one of ${SPEC_KINDS.join(', ')}`) };
	}
}

function attempt(kind: SpecKind, data: Record<string, unknown>, run: () => { derived: object; checks: Check[] }): BlockOutcome {
	try {
		const r = run();
		return { ok: true, kind, data, derived: r.derived as Record<string, unknown>, checks: r.checks };
	} catch (e) {
		if (e instanceof RangeError) return { ok: false, kind, error: e };
		throw e;
	}
}

/**
 * Check a whole build. Blocks that fail their schema come back { ok: false } and take no part in the cross checks.
 * Cross checks (worst-case figures, API.md revision 2), with the block indexes they concern in `values`:
 * - cross.rails-beyond-device (danger): a supply's highMainsTotalDcV above an amplifier's device.maxSupplyV
 *   (not for amplifier blocks on regulated rails);
 * - cross.cap-below-rail (danger): a capacitor line's ratingV below the supply's highMainsPeakDcV (highMainsTotalDcV
 *   for a line across both rails);
 * - cross.thermal-power-below-worst (caution): a thermal block's powerW below 0.95 × an amplifier's designDissipationW
 *   per stage (halved when bridged);
 * - cross.measured-power-beyond-max (caution): measured power at ≤ 1 % THD above 1.05 × the amplifier's maxPowerW;
 * - cross.transformer-small (caution/note): the supply's VA against the amplifier blocks' output, when the supply block
 *   does not state amplifierDemandW itself;
 * - cross.rating-below-rail (danger): a transistor line's ratingV below the rail it sees (as cross.cap-below-rail);
 * - part.fuse-larger (caution): a fuse line fitted with a higher current rating than the design's.
 * Checks about one part line carry its index as values.line.
 */
export function checkBuild(blocks: readonly SpecBlockInput[], parts: readonly PartLineInput[] = []): BuildCheckResult {
	const parsed = blocks.map((b) => ({ kind: String(b?.kind), r: parse(String(b?.kind), b?.data) }));
	const outcomes: (BlockOutcome | null)[] = parsed.map((p) => (p.r.success ? null : { ok: false as const, kind: p.kind, error: p.r.error }));

	// Supplies first: the amplifier blocks' worst case depends on them.
	const supplies: { index: number; data: SupplySpec; derived: SupplyDerived }[] = [];
	parsed.forEach((p, index) => {
		if (p.kind !== 'supply' || !p.r.success) return;
		const data = p.r.data as SupplySpec;
		const o = attempt('supply', data as Record<string, unknown>, () => deriveSupply(data));
		outcomes[index] = o;
		if (o.ok) supplies.push({ index, data, derived: o.derived as SupplyDerived });
	});
	const top = supplies.length ? supplies.reduce((a, b) => (b.derived.highMainsPeakDcV > a.derived.highMainsPeakDcV ? b : a)) : null;

	// A speaker DC-protection circuit stated on any amplifier block covers the build's offset measurements.
	const protectedBuild = parsed.some((p) => p.kind === 'amplifier' && p.r.success && (p.r.data as AmplifierSpec).speakerProtection === true);
	const amps: { index: number; data: AmplifierSpec; derived: AmplifierDerived }[] = [];
	const thermals: { index: number; powerW: number }[] = [];
	const measured: { index: number; clipPowerW: number | null }[] = [];
	parsed.forEach((p, index) => {
		if (!p.r.success || p.kind === 'supply') return;
		const data = p.r.data as Record<string, unknown>;
		switch (p.kind) {
			case 'amplifier': {
				const a = data as AmplifierSpec;
				const ctx = top && !a.regulatedRails ? railContext(a, top.derived, top.index) : null;
				const o = attempt('amplifier', data, () => deriveAmplifier(a, ctx));
				outcomes[index] = o;
				if (o.ok) amps.push({ index, data: a, derived: o.derived as AmplifierDerived });
				break;
			}
			case 'thermal': {
				const o = attempt('thermal', data, () => deriveThermal(data as never));
				outcomes[index] = o;
				if (o.ok) thermals.push({ index, powerW: (data as { powerW: number }).powerW });
				break;
			}
			case 'measurements': {
				const o = attempt('measurements', data, () => deriveMeasurements(data as never, protectedBuild));
				outcomes[index] = o;
				if (o.ok) measured.push({ index, clipPowerW: (o.derived as MeasurementsDerived).clipPowerW });
				break;
			}
			case 'bringup':
				outcomes[index] = attempt('bringup', data, () => deriveBringup(data as never, protectedBuild));
				break;
		}
	});

	const cross: Check[] = [];
	parts.forEach((p, line) => {
		if (!p) return;
		const kind = String(p.kind);
		if (top && (isCapacitor(kind) || isTransistor(kind)) && typeof p.ratingV === 'number' && Number.isFinite(p.ratingV)) {
			const seesV = p.railToRail ? top.derived.highMainsTotalDcV : top.derived.highMainsPeakDcV;
			const cap = isCapacitor(kind);
			if (p.ratingV < seesV)
				cross.push({
					id: cap ? 'cross.cap-below-rail' : 'cross.rating-below-rail',
					level: 'danger',
					message: `${p.designators}: rated ${fmt(p.ratingV)} V, below the ${fmt(seesV)} V ${p.railToRail ? 'rail to rail' : 'rail'} the supply block reaches off load at +${fmt(top.data.mainsHighPct)} % mains. ${
						cap
							? 'A capacitor on the rail would be over-voltage; if this one never sees the rail (a feedback-leg or coupling capacitor), say so in its line.'
							: p.railToRail
								? 'The transistor can break down.'
								: 'An output transistor of a split supply sees the whole rail-to-rail voltage: check it against that too (write “rail to rail” in its line).'
					}`,
					values: { designators: p.designators, line, ratingV: p.ratingV, highMainsPeakDcV: top.derived.highMainsPeakDcV, seesV, railToRail: !!p.railToRail, supplyBlock: top.index },
					caution: CHARGE_CAUTION
				});
		}
		if (/fuse/i.test(kind) && p.designValueText) {
			const fitted = fuseRatingA(p.valueText);
			const design = fuseRatingA(p.designValueText);
			if (fitted !== null && design !== null && fitted > design)
				cross.push({
					id: 'part.fuse-larger',
					level: 'caution',
					message: `${p.designators}: a ${fmt(fitted)} A fuse is fitted where the design has ${fmt(design)} A. A larger fuse lets a fault run longer and hotter before it blows; fit the design's rating, or show why the larger one is needed.`,
					values: { designators: p.designators, line, ratingA: fitted, designRatingA: design },
					caution: MAINS_CAUTION
				});
		}
	});

	if (amps.length) {
		const modelled = amps.filter((a) => a.derived.maxPowerW !== null);
		if (modelled.length) {
			const ampMax = modelled.reduce((a, b) => (b.derived.maxPowerW! > a.derived.maxPowerW! ? b : a));
			const maxW = ampMax.derived.maxPowerW!;
			for (const m of measured) {
				if (m.clipPowerW !== null && m.clipPowerW > CLAIMED_POWER_ALLOWANCE * maxW)
					cross.push({
						id: 'cross.measured-power-beyond-max',
						level: 'caution',
						message: `The measurements show ${fmt(m.clipPowerW)} W at ≤ 1 % THD, more than the ${fmt(maxW)} W the amplifier block's rails can give into its load. Check the load, the rail voltage and the meter.`,
						values: { measuredPowerW: m.clipPowerW, maxPowerW: maxW, measurementsBlock: m.index, amplifierBlock: ampMax.index }
					});
			}
		}

		const demandW = modelled.reduce((sum, a) => sum + a.data.channels * (a.data.claimed?.powerW ?? a.derived.maxPowerW!), 0);
		for (const s of supplies) {
			if (!s.data.amplifierDemandW && demandW > 0) {
				const c = transformerCheck('cross.transformer-small', s.data.transformerVA, demandW);
				if (c) cross.push({ ...c, values: { ...c.values, supplyBlock: s.index } });
			}
			for (const a of amps) {
				if (a.data.regulatedRails) continue;
				const totalV = s.derived.highMainsTotalDcV;
				const max = a.data.device.maxSupplyV;
				if (totalV > max)
					cross.push({
						id: 'cross.rails-beyond-device',
						level: 'danger',
						message: `Off load at +${fmt(s.data.mainsHighPct)} % mains the supply block's rails total ${fmt(totalV)} V, above the amplifier device's ${fmt(max)} V maximum supply: the device can fail at switch-on or on a high-mains day.`,
						values: { highMainsTotalDcV: totalV, maxSupplyV: max, supplyBlock: s.index, amplifierBlock: a.index },
						caution: CHARGE_CAUTION
					});
			}
		}

		const perStage = amps
			.filter((a) => a.derived.designDissipationW !== null)
			.map((a) => ({ a, w: a.derived.designDissipationW! / (a.data.bridged ? 2 : 1) }));
		if (perStage.length) {
			const worst = perStage.reduce((x, y) => (y.w > x.w ? y : x));
			for (const t of thermals) {
				if (t.powerW < 0.95 * worst.w)
					cross.push({
						id: 'cross.thermal-power-below-worst',
						level: 'caution',
						message: `The thermal block uses ${fmt(t.powerW)} W per device, below the amplifier's ${fmt(worst.w)} W worst-case dissipation per ${worst.a.data.bridged ? 'stage' : 'channel'} (high mains, speaker at its minimum impedance, quiescent current included). Size the heatsink on the worst case; music derating is not a safety margin.`,
						values: { powerW: t.powerW, designDissipationW: worst.w, thermalBlock: t.index, amplifierBlock: worst.a.index },
						caution: HEAT_CAUTION
					});
			}
		}
	}
	return { blocks: outcomes.map((o, i) => o ?? { ok: false as const, kind: parsed[i].kind, error: new RangeError('not checked') }), cross };
}

/** The ZodError of a failed block, or null. */
export function blockZodError(o: BlockOutcome): ZodError | null {
	return !o.ok && o.error instanceof ZodError ? o.error : null;
}
