import { describe, expect, it } from 'vitest';
import { evaluate } from 'mathjs';
import {
	designDissipationCurve,
	amplifierOutput,
	cascadeHighPassHz,
	cascadeLowPassHz,
	nonInvertingGain,
	rcCornerHz,
	totalSupplyV,
	worstCaseDissipationW,
	zobel
} from './amplifier';
import { InputRangeError } from './values';

/** Relative closeness: |a − e| ≤ tol·|e|. */
const near = (actual: number | undefined, expected: number, tol = 1e-3) => {
	expect(actual).toBeDefined();
	expect(Math.abs((actual as number) - expected)).toBeLessThanOrEqual(tol * Math.abs(expected));
};

describe('amplifierOutput', () => {
	// REFERENCE.md §12 case 1 (§1.1–1.2, computed from P = Vpk²/(2RL)).
	it('±35 V, 3 V dropout, 8 Ω → Vpk 32 V, 64 W, 4 A, 22.63 V rms', () => {
		const r = amplifierOutput({ supply: 'split', railV: 35, loadOhm: 8, dropoutV: 3 });
		near(r.peakVoltageV, 32);
		near(r.maxPowerW, 64);
		near(r.peakCurrentA, 4);
		near(r.rmsVoltageV, 22.63);
		expect(r.supplyPowerW).toBeUndefined();
	});
	it('agrees with mathjs unit arithmetic (oracle)', () => {
		const r = amplifierOutput({ supply: 'split', railV: 35, loadOhm: 8 });
		expect(r.maxPowerW).toBeCloseTo(evaluate('(35 V)^2 / (2 * 8 ohm)').toNumber('W'), 9); // 76.5625 W, REFERENCE.md §10
		expect(r.worstDissipationW).toBeCloseTo(evaluate('2 * (35 V)^2 / (pi^2 * 8 ohm)').toNumber('W'), 9);
	});
	// REFERENCE.md §12 case 2 (datasheet eq. for worst-case dissipation; §2.3).
	it('worst case ±35 V, 8 Ω → 31.03 W per channel, on the full rail (dropout ignored)', () => {
		near(amplifierOutput({ supply: 'split', railV: 35, loadOhm: 8, dropoutV: 3 }).worstDissipationW, 31.03);
		near(worstCaseDissipationW(35, 8), 31.03);
		near(worstCaseDissipationW(28, 4), 39.72); // REFERENCE.md §12 case 4
	});
	// REFERENCE.md §12 case 3 (datasheet dissipation eq. in total-supply form; class-B efficiency textbook result).
	it('at full swing (64 W): Pin 89.13 W, Pd 25.13 W, η 71.8 %; at 8 W: Pd 23.51 W, η 25.4 %', () => {
		const full = amplifierOutput({ supply: 'split', railV: 35, loadOhm: 8, dropoutV: 3, outputW: 64 });
		near(full.supplyPowerW, 89.13);
		near(full.dissipationW, 25.13);
		expect(full.efficiency).toBeCloseTo(0.718, 3);
		const eighth = amplifierOutput({ supply: 'split', railV: 35, loadOhm: 8, dropoutV: 3, outputW: 8 });
		near(eighth.dissipationW, 23.51);
		expect(eighth.efficiency).toBeCloseTo(0.254, 3);
	});
	it('at Vpk = 2·Vrail/π dissipation equals the worst case and η = 50 % (REFERENCE.md §2.3)', () => {
		const vpk = (2 * 35) / Math.PI;
		const r = amplifierOutput({ supply: 'split', railV: 35, loadOhm: 8, outputW: (vpk * vpk) / 16 });
		near(r.dissipationW, r.worstDissipationW, 1e-9);
		expect(r.efficiency).toBeCloseTo(0.5, 9);
	});
	it('property: dissipation at any output never exceeds the worst case', () => {
		for (let i = 0; i < 500; i++) {
			const railV = 5 + Math.random() * 60;
			const loadOhm = 2 + Math.random() * 14;
			const base = amplifierOutput({ supply: 'split', railV, loadOhm });
			const r = amplifierOutput({ supply: 'split', railV, loadOhm, outputW: base.maxPowerW * (0.001 + Math.random() * 0.999) });
			expect(r.dissipationW!).toBeLessThanOrEqual(r.worstDissipationW * (1 + 1e-9));
			expect(r.efficiency!).toBeLessThanOrEqual(Math.PI / 4 + 1e-12);
		}
	});
	it('68 W into 4 Ω at ±28 V (published rating) implies a 4.68 V drop (REFERENCE.md §1.1)', () => {
		const dropoutV = 28 - Math.sqrt(2 * 68 * 4);
		expect(dropoutV).toBeCloseTo(4.68, 2);
		near(amplifierOutput({ supply: 'split', railV: 28, loadOhm: 4, dropoutV }).maxPowerW, 68, 1e-9);
	});
	it('single supply = split supply of half the voltage (API.md)', () => {
		const single = amplifierOutput({ supply: 'single', railV: 40, loadOhm: 8, dropoutV: 2, outputW: 10 });
		const split = amplifierOutput({ supply: 'split', railV: 20, loadOhm: 8, dropoutV: 2, outputW: 10 });
		expect(single).toEqual(split);
		expect(totalSupplyV('single', 40)).toBe(40);
		expect(totalSupplyV('split', 35)).toBe(70);
	});
	it('outputW above maxPowerW → InputRangeError at outputW, message mentions outputW', () => {
		try {
			amplifierOutput({ supply: 'split', railV: 35, loadOhm: 8, dropoutV: 3, outputW: 65 });
			expect.unreachable();
		} catch (e) {
			expect(e).toBeInstanceOf(RangeError);
			expect((e as InputRangeError).field).toBe('outputW');
			expect((e as Error).message).toMatch(/outputW/);
		}
		expect(() => amplifierOutput({ supply: 'split', railV: 35, loadOhm: 8, dropoutV: 3, outputW: 64 })).not.toThrow();
	});
	it('dropout at or above the rail, or a non-positive load → RangeError', () => {
		expect(() => amplifierOutput({ supply: 'split', railV: 3, loadOhm: 8, dropoutV: 3 })).toThrow(/dropoutV/);
		expect(() => amplifierOutput({ supply: 'split', railV: 35, loadOhm: 0 })).toThrow(RangeError);
		expect(() => amplifierOutput({ supply: 'split', railV: -35, loadOhm: 8 })).toThrow(RangeError);
	});
});

describe('gain and corners', () => {
	// REFERENCE.md §12 case 8 (a monolithic power amplifier IC's typical application values; §5.1–5.4).
	it('non-inverting gain: 22 k / 680 Ω → 33.35 V/V = 30.46 dB; 22 k / 1 k → 23 = 27.23 dB', () => {
		const a = nonInvertingGain(22e3, 680);
		near(a.gain, 33.35);
		expect(a.gainDb).toBeCloseTo(30.46, 2);
		expect(Math.abs(a.gainDb - 30)).toBeLessThan(0.5); // datasheet nominal 30 dB ±0.5 dB
		const b = nonInvertingGain(22e3, 1e3);
		expect(b.gain).toBe(23);
		expect(b.gainDb).toBeCloseTo(27.23, 2);
		expect(nonInvertingGain(0, 1e3)).toEqual({ gain: 1, gainDb: 0 });
	});
	it('RC corners: 22 kΩ·470 nF → 15.39 Hz, 680 Ω·22 µF → 10.64 Hz, 1 kΩ·100 µF → 1.59 Hz', () => {
		near(rcCornerHz(22e3, 470e-9), 15.39);
		near(rcCornerHz(680, 22e-6), 10.64);
		near(rcCornerHz(1e3, 100e-6), 1.592);
	});
	it('22 kΩ·1 µF agrees with mathjs (7.2343 Hz, REFERENCE.md §10)', () => {
		expect(rcCornerHz(22e3, 1e-6)).toBeCloseTo(evaluate('1 / (2 * pi * 22 kohm * 1 uF)').toNumber('Hz'), 9);
	});
	it('two equal high-pass corners → 1.554·f0; low-pass → 0.644·f0; one corner → itself', () => {
		near(cascadeHighPassHz(10, 10), 15.54);
		expect(cascadeHighPassHz(10, 10)).toBeCloseTo(10 / Math.sqrt(Math.SQRT2 - 1), 6);
		near(cascadeLowPassHz([100e3, 100e3]), 64.36e3);
		expect(cascadeHighPassHz(15.39)).toBeCloseTo(15.39, 6);
		expect(cascadeHighPassHz([15.39, 10.64])).toBeGreaterThan(15.39);
	});
	it('Zobel 2.7 Ω + 0.1 µF → pole 589.5 kHz; 22.63 V rms at 20 kHz → 0.218 W; 1 Ω + 0.22 µF → 723 kHz', () => {
		const z = zobel({ rOhm: 2.7, cF: 0.1e-6, outputVrms: 22.63, freqHz: 20e3 });
		near(z.poleHz, 589.5e3);
		near(z.resistorW, 0.218, 2e-3);
		near(zobel({ rOhm: 1, cF: 0.22e-6, outputVrms: 1, freqHz: 1e3 }).poleHz, 723.4e3);
	});
	it('throws RangeError for impossible input', () => {
		expect(() => rcCornerHz(0, 1e-6)).toThrow(RangeError);
		expect(() => nonInvertingGain(1e3, 0)).toThrow(RangeError);
		expect(() => cascadeHighPassHz()).toThrow(RangeError);
		expect(() => zobel({ rOhm: 2.7, cF: 1e-7, outputVrms: 1, freqHz: 0 })).toThrow(RangeError);
	});
});

describe('designDissipationCurve — the heatsink plot and its headline figure agree', () => {
	it('±35 V, 8 Ω: the curve peaks at 2·38.5²/(π²·6.4) = 46.93 W (rail +10 %, 80 % impedance; hand), = designDissipationW', () => {
		const c = designDissipationCurve({ topology: 'class-ab-chip', supply: 'split', railV: 35, loadOhm: 8, dropoutV: 3 });
		const top = Math.max(...c.points.map((p) => p.dissipationW));
		expect(Math.abs(top - (2 * 38.5 ** 2) / (Math.PI ** 2 * 6.4))).toBeLessThan(1e-9);
		expect(top).toBeCloseTo(c.designDissipationW, 12);
		// Idle: no output, no class B loss; clipping at (38.5 − 3)²/(2 · 6.4) = 98.46 W (hand).
		expect(c.points[0]).toEqual({ outputW: 0, dissipationW: 0 });
		expect(Math.abs(c.points.at(-1)!.outputW - 35.5 ** 2 / 12.8)).toBeLessThan(1e-9);
	});
	it('quiescent current lifts the whole curve by q·Vtot: 50 mA × 77 V = 3.85 W', () => {
		const c = designDissipationCurve({ topology: 'class-ab-chip', supply: 'split', railV: 35, loadOhm: 8, quiescentA: 0.05 });
		expect(c.points[0].dissipationW).toBeCloseTo(0.05 * 77, 9);
	});
});
