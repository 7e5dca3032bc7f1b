import { describe, expect, it } from 'vitest';
import { evaluate } from 'mathjs';
import { CASE_TO_SINK_KPERW, deratedPowerW, heatsink, junctionTempC } from './thermal';
import { worstCaseDissipationW } from './amplifier';

describe('heatsink', () => {
	// REFERENCE.md §12 case 4: power-amp IC datasheet eq. for worst case and required Rθsa (θJC 1.0, θCS 0.2), computed.
	it('±28 V, 4 Ω: Pd 39.72 W; Rθsa ≤ 1.947 K/W at 25 °C, ≤ 1.318 K/W at 50 °C (±0.005)', () => {
		const powerW = worstCaseDissipationW(28, 4);
		const base = { powerW, junctionMaxC: 150, rthJcKPerW: 1.0, rthCsKPerW: 0.2 };
		expect(Math.abs(heatsink({ ...base, ambientC: 25 }).requiredRthSaKPerW - 1.947)).toBeLessThan(0.005);
		expect(Math.abs(heatsink({ ...base, ambientC: 50 }).requiredRthSaKPerW - 1.318)).toBeLessThan(0.005);
	});
	it('dissipation at the 68 W rating (35.94 W) instead of worst case gives 2.278 K/W (a published worked example)', () => {
		const r = heatsink({ powerW: 35.94, ambientC: 25, junctionMaxC: 150, rthJcKPerW: 1, rthCsKPerW: 0.2 });
		expect(Math.abs(r.requiredRthSaKPerW - 2.278)).toBeLessThan(0.005);
	});
	// REFERENCE.md §12 case 5.
	it('31.03 W, 40 °C, 1.0 + 0.4: Rθsa 2.145 K/W for Tj 150 °C, 1.339 K/W with a 25 °C margin', () => {
		const base = { powerW: 31.03, ambientC: 40, junctionMaxC: 150, rthJcKPerW: 1.0, rthCsKPerW: 0.4 };
		expect(Math.abs(heatsink(base).requiredRthSaKPerW - 2.145)).toBeLessThan(0.005);
		expect(Math.abs(heatsink({ ...base, marginC: 25 }).requiredRthSaKPerW - 1.339)).toBeLessThan(0.005);
	});
	it('with Rθsa 1.5: Tsink 86.5 °C, Tcase 99.0 °C, Tj 130.0 °C (±0.1 °C)', () => {
		const r = heatsink({ powerW: 31.03, ambientC: 40, junctionMaxC: 150, rthJcKPerW: 1.0, rthCsKPerW: 0.4, rthSaKPerW: 1.5 });
		expect(Math.abs(r.sinkC! - 86.5)).toBeLessThan(0.1);
		expect(Math.abs(r.caseC! - 99.0)).toBeLessThan(0.1);
		expect(Math.abs(r.junctionC! - 130.0)).toBeLessThan(0.1);
		expect(junctionTempC({ powerW: 31.03, ambientC: 40, rthJcKPerW: 1, rthCsKPerW: 0.4, rthSaKPerW: 1.5 })).toBeCloseTo(r.junctionC!, 12);
	});
	it('agrees with mathjs: 31.03 W × 2.9 K/W + 40 °C (oracle)', () => {
		const rise = evaluate('31.03 W * 2.9 K/W').toNumber('K');
		expect(junctionTempC({ powerW: 31.03, ambientC: 40, rthJcKPerW: 1, rthCsKPerW: 0.4, rthSaKPerW: 1.5 })).toBeCloseTo(40 + rise, 9);
	});
	it('a negative requirement means no heatsink can do it', () => {
		expect(heatsink({ powerW: 100, ambientC: 50, junctionMaxC: 150, rthJcKPerW: 1, rthCsKPerW: 0.4 }).requiredRthSaKPerW).toBeLessThan(0);
	});
	it('property: a sink of exactly the required Rθsa puts the junction at junctionMaxC − marginC', () => {
		for (let i = 0; i < 300; i++) {
			const input = {
				powerW: 1 + Math.random() * 100,
				ambientC: 20 + Math.random() * 30,
				junctionMaxC: 150,
				rthJcKPerW: Math.random() * 2,
				rthCsKPerW: Math.random(),
				marginC: Math.random() * 40
			};
			const req = heatsink(input).requiredRthSaKPerW;
			if (req < 0) continue;
			expect(heatsink({ ...input, rthSaKPerW: req }).junctionC!).toBeCloseTo(150 - input.marginC, 9);
		}
	});
	it('throws RangeError for zero power or negative resistance', () => {
		expect(() => heatsink({ powerW: 0, ambientC: 25, junctionMaxC: 150, rthJcKPerW: 1, rthCsKPerW: 0.2 })).toThrow(RangeError);
		expect(() => heatsink({ powerW: 10, ambientC: 25, junctionMaxC: 150, rthJcKPerW: -1, rthCsKPerW: 0.2 })).toThrow(RangeError);
	});
});

describe('derating and interface table', () => {
	it('Pd allowed = (Tjmax − Tcase)/Rθjc (datasheet derating note); 0 at or above Tjmax', () => {
		expect(deratedPowerW(150, 100, 0.9)).toBeCloseTo(55.56, 2);
		expect(deratedPowerW(150, 160, 1)).toBe(0);
	});
	it('case-to-sink values: the conservative (highest) end of each range, never below the datasheet figure (REFERENCE.md §3.3)', () => {
		// Datasheet "Heat Sinking" figures: compound ≈ 0.2, 2-mil mica + compound ≈ 0.4, dry metal ≥ 0.5, pad ≈ 0.5 K/W.
		expect(CASE_TO_SINK_KPERW.grease.rthCsKPerW).toBeGreaterThanOrEqual(0.2);
		expect(CASE_TO_SINK_KPERW['mica-grease'].rthCsKPerW).toBeGreaterThanOrEqual(0.4);
		expect(CASE_TO_SINK_KPERW['bare-dry'].rthCsKPerW).toBeGreaterThan(0.5);
		expect(CASE_TO_SINK_KPERW['silicone-pad'].rthCsKPerW).toBeGreaterThan(0.5);
		expect(CASE_TO_SINK_KPERW['small-tab-insulated'].source).toBe('from memory');
		for (const e of Object.values(CASE_TO_SINK_KPERW)) expect(e.rthCsKPerW).toBe(Math.max(...e.rangeKPerW));
	});
	it('several devices on one heatsink: the sink carries the sum (REFERENCE.md §3.1 note), requirement (Tj − Ta − P·(θjc + θcs)) / (n·P)', () => {
		// by hand: 3 devices × 10 W, 40 °C, θjc 1, θcs 0.5, Tj 150: (150 − 40 − 15) / 30 = 3.1667 K/W
		const r = heatsink({ powerW: 10, devices: 3, ambientC: 40, junctionMaxC: 150, rthJcKPerW: 1, rthCsKPerW: 0.5 });
		expect(r.requiredRthSaKPerW).toBeCloseTo(95 / 30, 12);
		expect(r.feasible).toBe(true);
		// at that heatsink: sink 40 + 30 · 3.1667 = 135 °C, junction 135 + 15 = 150 °C
		expect(r.sinkC).toBeCloseTo(135, 9);
		expect(r.junctionC).toBeCloseTo(150, 9);
		const withSink = heatsink({ powerW: 10, devices: 3, ambientC: 40, junctionMaxC: 150, rthJcKPerW: 1, rthCsKPerW: 0.5, rthSaKPerW: 1 });
		expect(withSink.sinkC).toBeCloseTo(70, 9);
		expect(withSink.junctionC).toBeCloseTo(85, 9);
	});
	it('feasible false when the path inside the heatsink already reaches the limit; temperatures at an ideal (0 K/W) sink', () => {
		const r = heatsink({ powerW: 100, ambientC: 50, junctionMaxC: 150, rthJcKPerW: 1, rthCsKPerW: 0.4 });
		expect(r.feasible).toBe(false);
		expect(r.requiredRthSaKPerW).toBeLessThanOrEqual(0);
		expect(r.sinkC).toBe(50);
		expect(r.junctionC).toBeCloseTo(190, 9); // 50 + 100 · 1.4
	});

});
