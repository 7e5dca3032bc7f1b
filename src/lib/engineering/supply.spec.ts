import { describe, expect, it } from 'vitest';
import { evaluate } from 'mathjs';
import {
	bleederPowerW,
	bleederTimeS,
	capMarginRatio,
	supplyWorstCase,
	primaryCurrentA,
	primaryFuseRangeA,
	reservoirForRippleF,
	storedEnergyJ,
	supplyRails,
	transformerVaNeeded,
	unloadedRailV,
	rectifierCurrents,
	windingRatingFromVaA,
	railSag
} from './supply';
import { InputRangeError } from './values';

const near = (actual: number, expected: number, tol = 1e-3) =>
	expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tol * Math.abs(expected));

describe('supplyRails', () => {
	// REFERENCE.md §12 case 7 (rectifier analysis and ripple ≈ I/(2fC), Horowitz & Hill ch. 1).
	it('25-0-25 V, bridge-split, 0.8 V, 3 A, 10 000 µF, 50 Hz → 34.56 V, 3.00 Vpp, 33.06 V', () => {
		const r = supplyRails({ secondaryVac: 25, rectifier: 'bridge-split', diodeDropV: 0.8, mainsHz: 50, loadCurrentA: 3, capacitanceF: 0.01 });
		near(r.peakDcV, 34.56);
		near(r.rippleVpp, 3.0);
		near(r.averageDcV, 34.56 - 1.5);
	});
	it('60 Hz → 2.50 Vpp; half wave doubles the ripple', () => {
		const base = { secondaryVac: 25, diodeDropV: 0.8, loadCurrentA: 3, capacitanceF: 0.01 } as const;
		near(supplyRails({ ...base, rectifier: 'bridge-split', mainsHz: 60 }).rippleVpp, 2.5);
		near(supplyRails({ ...base, rectifier: 'half-wave', mainsHz: 50 }).rippleVpp, 6.0);
	});
	it('drops per rail: bridge 2 (33.76 V for a single 25 V winding), centre-tap 1, half-wave 1; default 0.7 V', () => {
		near(unloadedRailV(25, 'bridge', 0.8), 33.76);
		near(unloadedRailV(25, 'center-tap', 0.8), 34.56);
		near(unloadedRailV(25, 'half-wave', 0.8), 34.56);
		near(supplyRails({ secondaryVac: 25, rectifier: 'bridge', mainsHz: 50, loadCurrentA: 0, capacitanceF: 0.01 }).peakDcV, 25 * Math.SQRT2 - 1.4, 1e-12);
	});
	it('ripple agrees with mathjs: 3 A / (2·50 Hz·10000 µF) = 3 V (oracle)', () => {
		const r = supplyRails({ secondaryVac: 25, rectifier: 'bridge', mainsHz: 50, loadCurrentA: 3, capacitanceF: 10000e-6 });
		expect(r.rippleVpp).toBeCloseTo(evaluate('3 A / (2 * 50 Hz * 10000 uF)').toNumber('V'), 9);
	});
	it('too little capacitance for the current → InputRangeError at capacitanceF; drops eating the secondary → at diodeDropV', () => {
		try {
			supplyRails({ secondaryVac: 10, rectifier: 'bridge', mainsHz: 50, loadCurrentA: 10, capacitanceF: 1e-5 });
			expect.unreachable();
		} catch (e) {
			expect((e as InputRangeError).field).toBe('capacitanceF');
		}
		try {
			supplyRails({ secondaryVac: 1, rectifier: 'bridge', diodeDropV: 1, mainsHz: 50, loadCurrentA: 1, capacitanceF: 0.01 });
			expect.unreachable();
		} catch (e) {
			expect((e as InputRangeError).field).toBe('diodeDropV');
		}
	});
});

describe('supply helpers', () => {
	it('reservoir for 2 A at 2 Vpp, 50 Hz, full wave → 10 000 µF (REFERENCE.md §4.4)', () => {
		near(reservoirForRippleF({ loadCurrentA: 2, mainsHz: 50, rippleVpp: 2 }), 0.01);
	});
	it('worst case 25 V, reg 7 %, +10 % mains, 0.8 V → 40.81 V; 50 V caps give 1.225× (REFERENCE.md §4.2, §4.6)', () => {
		const v = supplyWorstCase({ secondaryVac: 25, rectifier: 'bridge-split', diodeDropV: 0.8, mainsHz: 50, loadCurrentA: 3, capacitanceF: 0.01, regulationPct: 7, mainsHighPct: 10 }).highMainsPeakDcV;
		near(v, 40.81);
		near(capMarginRatio(50, v), 1.225);
		expect(capMarginRatio(35, v)).toBeLessThan(1); // 35 V caps would be over-voltage
	});
	it('transformer rule 1.5 × Σ output (common practice): 2 × 50 W → 150 VA', () => {
		expect(transformerVaNeeded([50, 50])).toBe(150);
		expect(transformerVaNeeded(60, 2)).toBe(120);
	});
	it('bleeder 4.7 kΩ on 10 000 µF from 50 V to 5 V → 108.2 s, 0.532 W (REFERENCE.md §4.8)', () => {
		near(bleederTimeS({ bleederOhm: 4700, capacitanceF: 0.01, startV: 50, safeV: 5 }), 108.2);
		near(bleederPowerW(50, 4700), 0.532);
		expect(bleederTimeS({ bleederOhm: 4700, capacitanceF: 0.01, startV: 4, safeV: 5 })).toBe(0);
	});
	it('stored energy 10 000 µF at 40 V → 8.0 J (REFERENCE.md §4.8), agreeing with mathjs', () => {
		expect(storedEnergyJ(0.01, 40)).toBeCloseTo(8, 12);
		expect(storedEnergyJ(0.01, 40)).toBeCloseTo(evaluate('0.5 * 10000 uF * (40 V)^2').toNumber('J'), 9);
	});
	it('primary current 160 VA at 230 V → 0.70 A, at 120 V → 1.33 A; fuse range 1.5–3 × (REFERENCE.md §4.7)', () => {
		near(primaryCurrentA(160, 230), 0.6957);
		near(primaryCurrentA(160, 120), 1.333);
		const f = primaryFuseRangeA(160, 230);
		near(f.minA, 1.043);
		near(f.maxA, 2.087);
	});
	it('throws RangeError for impossible input', () => {
		expect(() => reservoirForRippleF({ loadCurrentA: 1, mainsHz: 50, rippleVpp: 0 })).toThrow(RangeError);
		expect(() => primaryCurrentA(0, 230)).toThrow(RangeError);
		expect(() => transformerVaNeeded([])).toThrow(RangeError);
		expect(() => capMarginRatio(50, -1)).toThrow(RangeError);
	});
});

describe('rectifierCurrents — capacitor input (form factor 1.8, triangular charging pulses)', () => {
	// Oracle: a triangular pulse train built sample by sample (peak Ip, width D·T, period T) and its RMS and mean taken
	// numerically, independent of the closed forms in the code. Ip and D are chosen so the train's RMS/DC is 1.8.
	const train = (peak: number, duty: number, samples = 200_000) => {
		let sum = 0;
		let sq = 0;
		for (let n = 0; n < samples; n++) {
			const t = (n + 0.5) / samples; // one period, 0..1
			const i = t < duty ? peak * (1 - t / duty) : 0; // steep rise at the valley, falls to 0 at the crest
			sum += i;
			sq += i * i;
		}
		return { mean: sum / samples, rms: Math.sqrt(sq / samples) };
	};
	it('bridge, 3 A: winding 5.4 A RMS (transformer makers’ table: 1.8 × DC for a full-wave bridge, capacitor input — from memory)', () => {
		const r = rectifierCurrents({ rectifier: 'bridge', loadCurrentA: 3 });
		near(r.secondaryRmsA, 1.8 * 3);
		// The pulse train with the code's peak and conduction angle must have mean 3 A and RMS 5.4 A.
		const t = train(r.peakDiodeCurrentA, r.conductionDeg / 180);
		near(t.mean, 3, 2e-3);
		near(t.rms, 5.4, 2e-3);
		// The reservoir carries the AC part of the train: √(RMS² − mean²).
		near(r.rippleCurrentA, Math.sqrt(t.rms ** 2 - t.mean ** 2), 2e-3);
		near(r.diodeAverageA, 1.5); // two diode pairs share the pulses
	});
	it('conduction about 74° of the cycle per pulse: typical 60–90° for a well-sized supply (common practice, no single source)', () => {
		const deg = rectifierCurrents({ rectifier: 'bridge-split', loadCurrentA: 1 }).conductionDeg;
		expect(deg).toBeGreaterThan(60);
		expect(deg).toBeLessThan(90);
	});
	it('centre-tap: each half carries every other pulse, 1.8/√2 = 1.27 × DC (makers’ table lists about 1.2; from memory)', () => {
		const r = rectifierCurrents({ rectifier: 'center-tap', loadCurrentA: 2 });
		expect(r.secondaryRmsA / 2).toBeGreaterThan(1.2);
		expect(r.secondaryRmsA / 2).toBeLessThan(1.3);
		// Oracle: a train with pulses every other period has RMS 1/√2 of the full train.
		const full = train(rectifierCurrents({ rectifier: 'bridge', loadCurrentA: 2 }).peakDiodeCurrentA, rectifierCurrents({ rectifier: 'bridge', loadCurrentA: 2 }).conductionDeg / 180);
		near(r.secondaryRmsA, full.rms / Math.SQRT2, 2e-3);
	});
	it('half wave: one pulse per cycle of the same width with twice the charge', () => {
		const r = rectifierCurrents({ rectifier: 'half-wave', loadCurrentA: 1 });
		const t = train(r.peakDiodeCurrentA, r.conductionDeg / 360);
		near(t.mean, 1, 2e-3);
		near(r.secondaryRmsA, t.rms, 2e-3);
	});
	it('0 A draws nothing; a negative current is a range error on loadCurrentA', () => {
		expect(rectifierCurrents({ rectifier: 'bridge', loadCurrentA: 0 }).secondaryRmsA).toBe(0);
		expect(() => rectifierCurrents({ rectifier: 'bridge', loadCurrentA: -1 })).toThrow(InputRangeError);
	});
	it('winding rating from VA: 300 VA over 25-0-25 V → 6 A per half; 160 VA on one 25 V winding → 6.4 A', () => {
		near(windingRatingFromVaA(300, 25, 'bridge-split'), 6);
		near(windingRatingFromVaA(160, 25, 'bridge'), 6.4);
	});
});

describe('railSag — rail from idle to clipping', () => {
	const base = { secondaryVac: 25, rectifier: 'bridge-split', diodeDropV: 0.8, mainsHz: 50, windingRatedA: 6, channels: 2, loadOhm: 8, dropoutV: 3 } as const;
	it('no regulation and a huge reservoir: a stiff rail, clipping at (V − d)²/(2R) = 31.555²/16 = 62.23 W (hand)', () => {
		const r = railSag({ ...base, capacitanceF: 10, regulationPct: 0 });
		near(r.clipPowerW, (25 * Math.SQRT2 - 0.8 - 3) ** 2 / 16, 1e-4);
	});
	it('10 % regulation, negligible ripple: hand-solved linear clip point 65.45 W', () => {
		// Rail V(I) = 35.355·(1 + 0.1·(1 − I/Ir)) − 0.8 with Ir = 6 A / 1.8 = 3.333 A; two channels draw I = 2·Vpk/(π·8).
		// Clipping: Vpk = V(I) − 3 → Vpk·(1 + 35.355·0.1·2/(8π)/3.333) = 35.355·1.1 − 3.8.
		const crest = 25 * Math.SQRT2;
		const k = (crest * 0.1 * 2) / (8 * Math.PI) / (6 / 1.8);
		const vpk = (crest * 1.1 - 3.8) / (1 + k);
		const r = railSag({ ...base, capacitanceF: 100, regulationPct: 10 });
		near(r.clipPowerW, (vpk * vpk) / 16, 1e-3);
		// Idle: the off-load rail of supplyWorstCase (the same formula family, regulation included).
		near(r.idleRailV, crest * 1.1 - 0.8, 1e-3);
		// The rail falls monotonically from idle to clipping.
		for (let i = 1; i < r.points.length; i++) expect(r.points[i].railV).toBeLessThanOrEqual(r.points[i - 1].railV);
		expect(r.points[0].powerW).toBe(0);
		near(r.points.at(-1)!.powerW, r.clipPowerW, 1e-9);
	});
	it('low mains clips earlier than nominal', () => {
		const nominal = railSag({ ...base, capacitanceF: 0.01 });
		const low = railSag({ ...base, capacitanceF: 0.01, mainsPct: -10 });
		expect(low.clipPowerW).toBeLessThan(nominal.clipPowerW);
	});
});
