/**
 * Spec block "amplifier": schema, derived values and checks (API.md "Spec checking" and "Checks, revision 2").
 * A check that protects a part uses the worst condition the part sees in normal use: the rail at +10 % mains off
 * load, the loudspeaker at 80 % of its nominal impedance (IEC 60268-5), the quiescent current included. Nominal
 * figures stay beside them. Formulas live in $lib/engineering (stageWorstCase, amplifierOutput).
 */
import { z } from 'zod';
import {
	TOPOLOGIES,
	MAINS_HIGH_PCT,
	CLASS_D_EFFICIENCY_PCT,
	amplifierOutput,
	cascadeHighPassHz,
	nonInvertingGain,
	rcCornerHz,
	stageWorstCase,
	minimumImpedanceOhm
} from '../engineering';
import { HEAT_CAUTION, flag, fmt, num, oneOf, pos, type Check, type SpecResult } from './types';

export { TOPOLOGIES };

/** Allowance before a claimed power counts as beyond the rails: 5 % (API.md threshold; measurement slack, common practice). */
export const CLAIMED_POWER_ALLOWANCE = 1.05;
/** Highest rail a non-valve block may state, V; a valve block may state up to VALVE_RAIL_MAX_V (API.md revision 2). */
export const RAIL_MAX_V = 200;
/** See RAIL_MAX_V. */
export const VALVE_RAIL_MAX_V = 1000;
/**
 * DC at a speaker terminal at which a protection circuit usually disconnects it: about 1–2 V (common practice, no
 * single source); a failed direct-coupled output stage can put the whole rail there, which a fuse is too slow to stop.
 */
export const SPEAKER_PROTECTION_TRIP_V = 1;
/** Topologies whose direct-coupled output stage is usually discrete (speaker DC protection recommended; common practice). */
const DISCRETE = new Set(['class-ab-discrete', 'class-a']);

/** Schema of an amplifier block; unknown keys are dropped. */
export const amplifierSpec = z
	.object({
		channels: z.number({ error: 'must be a whole number' }).int('must be a whole number').min(1, 'must be at least 1').max(32, 'must be at most 32'),
		topology: oneOf(TOPOLOGIES),
		supply: oneOf(['split', 'single'] as const),
		/** split: each rail's magnitude; single: the whole supply. Up to 200 V, valve blocks up to 1000 V. */
		railV: pos(VALVE_RAIL_MAX_V, 'V'),
		/** railV as the maker typed it ("±30", "+-30", "30"), shown back in its place; display only. */
		railText: z
			.string({ error: 'must be text' })
			.max(24, 'at most 24 characters')
			.refine((s) => !/[\u0000-\u001f\u007f]/.test(s), 'must not contain control characters')
			.optional(),
		/** Nominal load per channel. */
		loadOhm: num(0.5, 100_000, 'Ω'),
		device: z.object({
			/** Largest total supply V+ − V−. */
			maxSupplyV: pos(2 * VALVE_RAIL_MAX_V, 'V'),
			dropoutV: num(0, 100, 'V'),
			junctionMaxC: num(50, 250, '°C'),
			rthJcKPerW: num(0, 50, 'K/W'),
			minLoadOhm: num(0, 100_000, 'Ω'),
			/** Peak output current the device is rated for (current limit or SOA), A. */
			maxOutputCurrentA: pos(1000, 'A').nullish()
		}, { error: (iss) => (iss.input === undefined ? 'required: the output device’s ratings { maxSupplyV, dropoutV, junctionMaxC, rthJcKPerW, minLoadOhm } from its datasheet' : 'must be an object { maxSupplyV, dropoutV, junctionMaxC, rthJcKPerW, minLoadOhm }') }),
		gain: z
			.object({ rfOhm: num(0, 1e8, 'Ω'), riOhm: pos(1e8, 'Ω'), ciF: pos(1, 'F').optional() }, { error: 'must be an object { rfOhm, riOhm, ciF? } or null' })
			.nullish(),
		/** Input coupling high-pass: resistor to ground and series capacitor. */
		input: z.object({ rOhm: pos(1e9, 'Ω'), cF: pos(1, 'F') }, { error: 'must be an object { rOhm, cF } or null' }).nullish(),
		claimed: z.object({ powerW: pos(10_000, 'W'), thdPct: num(0, 100, '%') }, { error: 'must be an object { powerW, thdPct } or null' }).nullish(),
		/** Mains above nominal the worst case designs for, %. */
		mainsHighPct: num(0, 25, '%').default(MAINS_HIGH_PCT),
		/** Standing current one amplifier stage draws from the rails (datasheet), A. */
		quiescentA: num(0, 20, 'A').default(0),
		/** Two stages drive the load in bridge. */
		bridged: flag().default(false),
		/** Class A: the output stage's standing current, A (required for class-a). */
		biasA: pos(20, 'A').nullish(),
		/** Class A only (push-pull when absent). */
		classA: oneOf(['push-pull', 'single-ended'] as const).optional(),
		/** Class D efficiency, % (85 when absent). */
		efficiencyPct: num(1, 100, '%').optional(),
		/** A speaker DC-protection circuit is fitted. */
		speakerProtection: flag().optional(),
		/**
		 * The stage runs from regulated rails after the build's supply block: the supply's raw rails then do not
		 * reach it, so the build's worst case keeps this block's own railV·(1 + mainsHighPct/100).
		 */
		regulatedRails: flag().default(false)
	})
	.superRefine((d, ctx) => {
		if (d.topology !== 'valve' && d.railV > RAIL_MAX_V)
			ctx.addIssue({ code: 'custom', path: ['railV'], message: `must be at most ${RAIL_MAX_V} V (valve blocks up to ${VALVE_RAIL_MAX_V} V)` });
		const rail = d.supply === 'split' ? d.railV : d.railV / 2;
		if (d.device.dropoutV >= rail)
			ctx.addIssue({
				code: 'custom',
				path: ['device', 'dropoutV'],
				message: `must be less than the ${d.supply === 'split' ? 'rail' : 'half-supply'} voltage (${rail} V)`
			});
		if (d.topology === 'class-a' && d.bridged)
			ctx.addIssue({ code: 'custom', path: ['bridged'], message: 'a class A block cannot be bridged: describe one stage' });
		if (d.topology === 'class-a' && (d.biasA === undefined || d.biasA === null))
			ctx.addIssue({ code: 'invalid_type', expected: 'number', path: ['biasA'], message: 'required for a class A stage (its standing current, A)' });
	});

/** Parsed amplifier block. */
export type AmplifierSpec = z.output<typeof amplifierSpec>;

/**
 * What a build knows about the rails an amplifier block sees (from its supply block): the per-side rail at high
 * mains off load, and the loaded rails at nominal and low mains. Inside a build the worst case uses these.
 */
export interface AmplifierRailContext {
	/** Index of the supply block the figures come from. */
	supplyBlock: number;
	/** Per-side rail at high mains, off load (supply highMainsPeakDcV, halved for a single-supply amplifier on a one-rail supply). */
	highMainsRailV: number;
	/** Per-side loaded rail at nominal mains (supply averageDcV). */
	loadedRailV: number;
	/** Per-side loaded rail at low mains (supply lowMainsAverageDcV). */
	lowMainsRailV: number;
}

/** Derived values of an amplifier block (null where the topology is not modelled or the block lacks the inputs). */
export interface AmplifierDerived {
	[key: string]: number | null;
	/** Output-stage limit of the stated rails, (V−d)²/(2R) (bridged 2(V−d)²/R). */
	railLimitPowerW: number | null;
	/** Class A: what the bias allows. */
	biasLimitPowerW: number | null;
	maxPowerW: number | null;
	peakVoltageV: number | null;
	peakCurrentA: number | null;
	rmsVoltageV: number | null;
	/** Per channel, textbook worst case at the stated rail and nominal load. */
	worstDissipationW: number | null;
	/** Per channel, at high mains and minimum impedance with the quiescent current: what heatsinks are sized on. */
	designDissipationW: number | null;
	/** channels × designDissipationW. */
	totalDesignDissipationW: number | null;
	/** Nominal total supply V+ − V−. */
	totalSupplyV: number;
	/** Per-side rail at high mains (off load). */
	highMainsRailV: number;
	/** Total supply at high mains. */
	highMainsTotalV: number;
	/** 0.8 × loadOhm. */
	minImpedanceOhm: number;
	/** Peak output current at high mains into the minimum impedance. */
	worstPeakCurrentA: number | null;
	/** Hottest the case may run at the design dissipation without passing junctionMaxC: Tjmax − Pd·Rθjc (per device; halved Pd when bridged). */
	caseMaxC: number | null;
	/** In a build: clipping power at the supply's loaded rail, and at low mains. */
	loadedRailPowerW: number | null;
	lowMainsPowerW: number | null;
	supplyPowerW: number | null;
	dissipationW: number | null;
	efficiency: number | null;
	gain: number | null;
	gainDb: number | null;
	inputCornerHz: number | null;
	feedbackCornerHz: number | null;
	/** Overall −3 dB low corner of the input and feedback high-passes together. */
	lowCornerHz: number | null;
}

const sineLimitW = (v: number, d: number, r: number, bridged: boolean) => {
	const pk = Math.max(0, v - d);
	return bridged ? (2 * pk * pk) / r : (pk * pk) / (2 * r);
};

/**
 * Derive an amplifier block; `rails` (in a build) replaces the block's own high-mains estimate with its supply
 * block's. ±35 V, 8 Ω, dropout 3 V → maxPowerW 64, worstDissipationW 31.03, designDissipationW 46.93;
 * claimed 80 W → amp.power-beyond-rails (caution).
 */
export function deriveAmplifier(data: AmplifierSpec, rails?: AmplifierRailContext | null): SpecResult<AmplifierDerived> {
	const w = stageWorstCase({
		topology: data.topology,
		supply: data.supply,
		railV: data.railV,
		loadOhm: data.loadOhm,
		dropoutV: data.device.dropoutV,
		mainsHighPct: data.mainsHighPct,
		quiescentA: data.quiescentA,
		bridged: data.bridged,
		biasA: data.biasA ?? null,
		classA: data.classA ?? 'push-pull',
		efficiencyPct: data.efficiencyPct ?? CLASS_D_EFFICIENCY_PCT,
		highMainsRailV: rails?.highMainsRailV ?? null
	});
	const modelled = data.topology !== 'valve';
	const k = data.bridged ? 2 : 1;
	const peakVoltageV = modelled ? k * (w.railV - data.device.dropoutV) : null;
	const claimed = data.claimed ?? null;
	let atClaimed: { supplyPowerW: number; dissipationW: number; efficiency: number } | null = null;
	const classB = data.topology === 'class-ab-chip' || data.topology === 'class-ab-discrete' || data.topology === 'other';
	if (classB && !data.bridged && claimed && w.maxPowerW !== null && claimed.powerW <= w.maxPowerW) {
		const r = amplifierOutput({ supply: data.supply, railV: data.railV, loadOhm: data.loadOhm, dropoutV: data.device.dropoutV, outputW: claimed.powerW });
		atClaimed = { supplyPowerW: r.supplyPowerW!, dissipationW: r.dissipationW!, efficiency: r.efficiency! };
	}
	const g = data.gain ? nonInvertingGain(data.gain.rfOhm, data.gain.riOhm) : null;
	const inputCornerHz = data.input ? rcCornerHz(data.input.rOhm, data.input.cF) : null;
	const feedbackCornerHz = data.gain?.ciF ? rcCornerHz(data.gain.riOhm, data.gain.ciF) : null;
	const corners = [inputCornerHz, feedbackCornerHz].filter((x): x is number => x !== null);
	const cap = (p: number) => (w.biasLimitPowerW === null ? p : Math.min(p, w.biasLimitPowerW));
	const loadedRailPowerW = modelled && rails ? cap(sineLimitW(rails.loadedRailV, data.device.dropoutV, data.loadOhm, data.bridged)) : null;
	const lowMainsPowerW = modelled && rails ? cap(sineLimitW(rails.lowMainsRailV, data.device.dropoutV, data.loadOhm, data.bridged)) : null;
	const derived: AmplifierDerived = {
		railLimitPowerW: w.railLimitPowerW,
		biasLimitPowerW: w.biasLimitPowerW,
		maxPowerW: w.maxPowerW,
		peakVoltageV,
		peakCurrentA: peakVoltageV === null ? null : peakVoltageV / data.loadOhm,
		rmsVoltageV: peakVoltageV === null ? null : peakVoltageV / Math.SQRT2,
		worstDissipationW: w.worstDissipationW,
		designDissipationW: w.designDissipationW,
		totalDesignDissipationW: w.designDissipationW === null ? null : data.channels * w.designDissipationW,
		totalSupplyV: 2 * w.railV,
		highMainsRailV: w.highMainsRailV,
		highMainsTotalV: w.highMainsTotalV,
		minImpedanceOhm: w.minImpedanceOhm,
		worstPeakCurrentA: w.worstPeakCurrentA,
		caseMaxC: w.designDissipationW === null ? null : data.device.junctionMaxC - (w.designDissipationW / k) * data.device.rthJcKPerW,
		loadedRailPowerW,
		lowMainsPowerW,
		supplyPowerW: atClaimed?.supplyPowerW ?? null,
		dissipationW: atClaimed?.dissipationW ?? null,
		efficiency: atClaimed?.efficiency ?? null,
		gain: g?.gain ?? null,
		gainDb: g?.gainDb ?? null,
		inputCornerHz,
		feedbackCornerHz,
		lowCornerHz: corners.length ? cascadeHighPassHz(corners) : null
	};

	const checks: Check[] = [];
	const pm = data.supply === 'split' ? '±' : '';
	if (rails)
		checks.push({
			id: 'amp.rails-from-supply',
			level: 'note',
			message: `In this build the worst-case figures use the supply block's off-load rail at high mains, ${pm}${fmt(data.supply === 'split' ? rails.highMainsRailV : 2 * rails.highMainsRailV)} V, instead of the stated ${pm}${fmt(data.railV)} V + ${fmt(data.mainsHighPct)} %.`,
			values: { railV: data.railV, highMainsRailV: rails.highMainsRailV, supplyBlock: rails.supplyBlock }
		});
	if (!modelled)
		checks.push({
			id: 'amp.not-modelled',
			level: 'note',
			message: 'A valve output stage works through its output transformer, which these checks do not model: no output power or dissipation is computed and the claimed power is not checked. The rail rating is still checked.',
			values: { topology: data.topology }
		});
	if (claimed && w.railLimitPowerW !== null && claimed.powerW > CLAIMED_POWER_ALLOWANCE * w.railLimitPowerW)
		checks.push({
			id: 'amp.power-beyond-rails',
			level: 'caution',
			message: `The claimed ${fmt(claimed.powerW)} W is more than the ${fmt(w.railLimitPowerW)} W a ${pm}${fmt(data.railV)} V supply can give into ${fmt(data.loadOhm)} Ω with ${fmt(data.device.dropoutV)} V dropout${data.bridged ? ' in bridge' : ''} (sine, rails not sagging). Check the rail, the load and the measurement.`,
			values: { claimedPowerW: claimed.powerW, railLimitPowerW: w.railLimitPowerW, ratio: claimed.powerW / w.railLimitPowerW, allowance: CLAIMED_POWER_ALLOWANCE }
		});
	if (claimed && w.biasLimitPowerW !== null && claimed.powerW > CLAIMED_POWER_ALLOWANCE * w.biasLimitPowerW)
		checks.push({
			id: 'amp.power-beyond-bias',
			level: 'caution',
			message: `The claimed ${fmt(claimed.powerW)} W is more than the ${fmt(w.biasLimitPowerW)} W a ${data.classA ?? 'push-pull'} class A stage biased at ${fmt(data.biasA! * 1000)} mA can give into ${fmt(data.loadOhm)} Ω; above that it leaves class A (or clips, single-ended).`,
			values: { claimedPowerW: claimed.powerW, biasLimitPowerW: w.biasLimitPowerW, biasA: data.biasA ?? null, allowance: CLAIMED_POWER_ALLOWANCE }
		});
	if (claimed && loadedRailPowerW !== null && lowMainsPowerW !== null && w.railLimitPowerW !== null && claimed.powerW <= CLAIMED_POWER_ALLOWANCE * w.railLimitPowerW) {
		if (claimed.powerW > CLAIMED_POWER_ALLOWANCE * loadedRailPowerW)
			checks.push({
				id: 'amp.power-beyond-supply',
				level: 'caution',
				message: `The claimed ${fmt(claimed.powerW)} W is more than the ${fmt(loadedRailPowerW)} W the supply block's loaded rail (${pm}${fmt(rails!.loadedRailV)} V, ripple included) can give into ${fmt(data.loadOhm)} Ω; the rails sag under load.`,
				values: { claimedPowerW: claimed.powerW, loadedRailPowerW, loadedRailV: rails!.loadedRailV, supplyBlock: rails!.supplyBlock }
			});
		else if (claimed.powerW > CLAIMED_POWER_ALLOWANCE * lowMainsPowerW)
			checks.push({
				id: 'amp.power-beyond-supply',
				level: 'note',
				message: `At low mains the supply block's loaded rail falls to ${pm}${fmt(rails!.lowMainsRailV)} V, enough for ${fmt(lowMainsPowerW)} W into ${fmt(data.loadOhm)} Ω, less than the claimed ${fmt(claimed.powerW)} W.`,
				values: { claimedPowerW: claimed.powerW, lowMainsPowerW, lowMainsRailV: rails!.lowMainsRailV, supplyBlock: rails!.supplyBlock }
			});
	}
	if (w.highMainsTotalV > data.device.maxSupplyV)
		checks.push({
			id: 'amp.rails-beyond-device',
			level: 'danger',
			message: `At +${fmt(data.mainsHighPct)} % mains${rails ? ' with the transformer off load' : ''} the total supply reaches ${fmt(w.highMainsTotalV)} V, above the device's ${fmt(data.device.maxSupplyV)} V maximum (nominal ${fmt(2 * w.railV)} V): the device can fail.`,
			values: { highMainsTotalV: w.highMainsTotalV, totalSupplyV: 2 * w.railV, maxSupplyV: data.device.maxSupplyV, mainsHighPct: data.mainsHighPct }
		});
	if (data.loadOhm < data.device.minLoadOhm)
		checks.push({
			id: 'amp.load-below-rating',
			level: 'caution',
			message: `The ${fmt(data.loadOhm)} Ω load is below the ${fmt(data.device.minLoadOhm)} Ω the device is rated for: expect more current, more heat and current-limit trips.`,
			values: { loadOhm: data.loadOhm, minLoadOhm: data.device.minLoadOhm }
		});
	else if (minimumImpedanceOhm(data.loadOhm) < data.device.minLoadOhm)
		// IEC 60268-5 via a loudspeaker maker's glossary ("Impedance curve"): impedance may dip to 80 % of the rating.
		checks.push({
			id: 'amp.load-dips-below-rating',
			level: 'note',
			message: `A ${fmt(data.loadOhm)} Ω speaker may dip to about ${fmt(minimumImpedanceOhm(data.loadOhm))} Ω (80 % of nominal), below the device's ${fmt(data.device.minLoadOhm)} Ω rating.`,
			values: { loadOhm: data.loadOhm, minimumImpedanceOhm: minimumImpedanceOhm(data.loadOhm), minLoadOhm: data.device.minLoadOhm }
		});
	const maxI = data.device.maxOutputCurrentA ?? null;
	if (maxI !== null && w.worstPeakCurrentA !== null && w.worstPeakCurrentA > maxI)
		// REFERENCE.md §1.2: compare the peak output current at the minimum impedance with the device's limit.
		checks.push({
			id: 'amp.current-beyond-device',
			level: 'caution',
			message: `Into ${fmt(w.minImpedanceOhm)} Ω (80 % of ${fmt(data.loadOhm)} Ω) at high mains the peak output current reaches ${fmt(w.worstPeakCurrentA)} A, above the device's ${fmt(maxI)} A: expect current limiting, or output devices outside their safe area.`,
			values: { worstPeakCurrentA: w.worstPeakCurrentA, maxOutputCurrentA: maxI, minImpedanceOhm: w.minImpedanceOhm },
			caution: HEAT_CAUTION
		});
	if (DISCRETE.has(data.topology) && data.supply === 'split' && data.speakerProtection !== true)
		checks.push({
			id: 'amp.speaker-protection',
			level: 'note',
			message: `A failed direct-coupled output stage can put the whole ${fmt(data.railV)} V rail across the ${data.loadOhm <= 16 ? 'speaker' : 'load'}, faster than a fuse can act. A DC protection circuit that disconnects it at about ${SPEAKER_PROTECTION_TRIP_V}–2 V DC is common practice.`,
			values: { tripV: SPEAKER_PROTECTION_TRIP_V, railV: data.railV, topology: data.topology }
		});
	if (claimed && claimed.thdPct > 1)
		// 16 CFR Part 432 as amended in 2024 rates power at 1 % THD+N (as reported by secondary summaries).
		checks.push({
			id: 'amp.claimed-thd-high',
			level: 'note',
			message: `The power is claimed at ${fmt(claimed.thdPct)} % THD; ratings are usually given at 1 % or less, so this figure reads higher than a comparable rating.`,
			values: { thdPct: claimed.thdPct, referenceThdPct: 1 }
		});
	return { derived, checks };
}
