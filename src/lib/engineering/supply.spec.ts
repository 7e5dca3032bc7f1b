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
	unloadedRailV
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
