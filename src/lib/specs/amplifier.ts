/**
 * Spec block "amplifier": schema, derived values and checks (API.md, PRODUCT.md §4.3).
 * Formulas from $lib/engineering (class B model, REFERENCE.md §1–2, §5).
 */
import { z } from 'zod';
import {
	amplifierOutput,
	cascadeHighPassHz,
	nonInvertingGain,
	railPerSideV,
	rcCornerHz,
	totalSupplyV,
	minimumImpedanceOhm
} from '../engineering';
import { fmt, num, oneOf, pos, type Check, type SpecResult } from './types';

/** Amplifier topologies (API.md). */
export const TOPOLOGIES = ['class-ab-chip', 'class-ab-discrete', 'class-a', 'class-d', 'valve', 'other'] as const;

/** Allowance before a claimed power counts as beyond the rails: 5 % (API.md threshold; measurement slack, common practice). */
export const CLAIMED_POWER_ALLOWANCE = 1.05;

/** Schema of an amplifier block; unknown keys are dropped. */
export const amplifierSpec = z
	.object({
		channels: z.number({ error: 'must be a whole number' }).int('must be a whole number').min(1, 'must be at least 1').max(32, 'must be at most 32'),
		topology: oneOf(TOPOLOGIES),
		supply: oneOf(['split', 'single'] as const),
		/** split: each rail's magnitude; single: the whole supply. */
		railV: pos(200, 'V'),
		/** Nominal load per channel. */
		loadOhm: num(0.5, 100_000, 'Ω'),
		device: z.object({
			/** Largest total supply V+ − V−. */
			maxSupplyV: pos(400, 'V'),
			dropoutV: num(0, 20, 'V'),
			junctionMaxC: num(50, 250, '°C'),
			rthJcKPerW: num(0, 50, 'K/W'),
			minLoadOhm: num(0, 100_000, 'Ω')
		}),
		gain: z
			.object({ rfOhm: num(0, 1e8, 'Ω'), riOhm: pos(1e8, 'Ω'), ciF: pos(1, 'F').optional() })
			.nullish(),
		/** Input coupling high-pass: resistor to ground and series capacitor. */
		input: z.object({ rOhm: pos(1e9, 'Ω'), cF: pos(1, 'F') }).nullish(),
		claimed: z.object({ powerW: pos(10_000, 'W'), thdPct: num(0, 100, '%') }).nullish()
	})
	.superRefine((d, ctx) => {
		const rail = d.supply === 'split' ? d.railV : d.railV / 2;
		if (d.device.dropoutV >= rail)
			ctx.addIssue({
				code: 'custom',
				path: ['device', 'dropoutV'],
				message: `must be less than the ${d.supply === 'split' ? 'rail' : 'half-supply'} voltage (${rail} V)`
			});
	});

/** Parsed amplifier block. */
export type AmplifierSpec = z.output<typeof amplifierSpec>;

/** Derived values of an amplifier block (null where the block lacks the inputs). */
export interface AmplifierDerived {
	[key: string]: number | null;
	maxPowerW: number;
	peakVoltageV: number;
	peakCurrentA: number;
	rmsVoltageV: number;
	/** Per channel, class B worst case on the full rail. */
	worstDissipationW: number;
	/** channels × worstDissipationW. */
	totalWorstDissipationW: number;
	totalSupplyV: number;
	/** Hottest the case may run at worst-case dissipation without passing junctionMaxC: Tjmax − Pd·Rθjc. */
	caseMaxC: number;
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

/**
 * Derive an amplifier block. ±35 V, 8 Ω, dropout 3 V → maxPowerW 64, worstDissipationW 31.03;
 * claimed 80 W → check amp.power-beyond-rails (caution).
 */
export function deriveAmplifier(data: AmplifierSpec): SpecResult<AmplifierDerived> {
	const out = amplifierOutput({ supply: data.supply, railV: data.railV, loadOhm: data.loadOhm, dropoutV: data.device.dropoutV });
	const totalV = totalSupplyV(data.supply, data.railV);
	const rail = railPerSideV(data.supply, data.railV);
	const claimed = data.claimed ?? null;
	let atClaimed: { supplyPowerW: number; dissipationW: number; efficiency: number } | null = null;
	if (claimed && claimed.powerW <= out.maxPowerW) {
		const r = amplifierOutput({ supply: data.supply, railV: data.railV, loadOhm: data.loadOhm, dropoutV: data.device.dropoutV, outputW: claimed.powerW });
		atClaimed = { supplyPowerW: r.supplyPowerW!, dissipationW: r.dissipationW!, efficiency: r.efficiency! };
	}
	const g = data.gain ? nonInvertingGain(data.gain.rfOhm, data.gain.riOhm) : null;
	const inputCornerHz = data.input ? rcCornerHz(data.input.rOhm, data.input.cF) : null;
	const feedbackCornerHz = data.gain?.ciF ? rcCornerHz(data.gain.riOhm, data.gain.ciF) : null;
	const corners = [inputCornerHz, feedbackCornerHz].filter((x): x is number => x !== null);
	const derived: AmplifierDerived = {
		maxPowerW: out.maxPowerW,
		peakVoltageV: out.peakVoltageV,
		peakCurrentA: out.peakCurrentA,
		rmsVoltageV: out.rmsVoltageV,
		worstDissipationW: out.worstDissipationW,
		totalWorstDissipationW: data.channels * out.worstDissipationW,
		totalSupplyV: totalV,
		caseMaxC: data.device.junctionMaxC - out.worstDissipationW * data.device.rthJcKPerW,
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
	if (claimed && claimed.powerW > CLAIMED_POWER_ALLOWANCE * out.maxPowerW)
		checks.push({
			id: 'amp.power-beyond-rails',
			level: 'caution',
			message: `The claimed ${fmt(claimed.powerW)} W is more than the ${fmt(out.maxPowerW)} W a ${data.supply === 'split' ? '±' : ''}${fmt(data.railV)} V supply can give into ${fmt(data.loadOhm)} Ω with ${fmt(data.device.dropoutV)} V dropout (sine, rails not sagging). Check the rail, the load and the measurement.`,
			values: { claimedPowerW: claimed.powerW, maxPowerW: out.maxPowerW, ratio: claimed.powerW / out.maxPowerW, allowance: CLAIMED_POWER_ALLOWANCE }
		});
	if (totalV > data.device.maxSupplyV)
		checks.push({
			id: 'amp.rails-beyond-device',
			level: 'danger',
			message: `The total supply of ${fmt(totalV)} V is above the device's ${fmt(data.device.maxSupplyV)} V maximum; the device can fail, and unloaded or high-mains rails are higher still.`,
			values: { totalSupplyV: totalV, maxSupplyV: data.device.maxSupplyV, railV: rail }
		});
	if (data.loadOhm < data.device.minLoadOhm)
		checks.push({
			id: 'amp.load-below-rating',
			level: 'caution',
			message: `The ${fmt(data.loadOhm)} Ω load is below the ${fmt(data.device.minLoadOhm)} Ω the device is rated for: expect more current, more heat and current-limit trips.`,
			values: { loadOhm: data.loadOhm, minLoadOhm: data.device.minLoadOhm }
		});
	else if (minimumImpedanceOhm(data.loadOhm) < data.device.minLoadOhm)
		// A speaker's impedance may dip to 80 % of its nominal rating (loudspeaker maker's glossary, "Impedance curve").
		checks.push({
			id: 'amp.load-dips-below-rating',
			level: 'note',
			message: `A ${fmt(data.loadOhm)} Ω speaker may dip to about ${fmt(minimumImpedanceOhm(data.loadOhm))} Ω (80 % of nominal), below the device's ${fmt(data.device.minLoadOhm)} Ω rating.`,
			values: { loadOhm: data.loadOhm, minimumImpedanceOhm: minimumImpedanceOhm(data.loadOhm), minLoadOhm: data.device.minLoadOhm }
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
