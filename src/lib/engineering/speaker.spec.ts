import { describe, expect, it } from 'vitest';
import { evaluate } from 'mathjs';
import { cableResistanceOhm, dampingFactor, minimumImpedanceOhm, parallelLoadOhm, seriesLoadOhm } from './speaker';

const near = (actual: number, expected: number, tol = 1e-3) =>
	expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tol * Math.abs(expected));

describe('speaker load', () => {
	// REFERENCE.md §12 case 11 (loudspeaker maker's glossary for the 80 % rule; damping-factor reference page).
	it('8 ‖ 8 Ω → 4.000 Ω; 8 ‖ 4 Ω → 2.667 Ω; 8 + 8 → 16 Ω', () => {
		near(parallelLoadOhm(8, 8), 4);
		near(parallelLoadOhm([8, 4]), 2.667);
		expect(seriesLoadOhm(8, 8)).toBe(16);
	});
	it('a nominal 8 Ω speaker may dip to 6.4 Ω (80 % convention)', () => {
		near(minimumImpedanceOhm(8), 6.4, 1e-12);
		near(minimumImpedanceOhm(4), 3.2, 1e-12);
	});
	it('damping factor 8 Ω / 0.02 Ω → 400; 5 m of 1.5 mm² twin copper → 0.1147 Ω, DF 59.4', () => {
		near(dampingFactor({ loadOhm: 8, sourceOhm: 0.02 }), 400);
		near(cableResistanceOhm(5, 1.5), 0.1147);
		near(dampingFactor({ loadOhm: 8, sourceOhm: 0.02, cableLengthM: 5, cableAreaMm2: 1.5 }), 59.4);
	});
	it('cable resistance agrees with mathjs: 1.72e-8 Ω·m × 10 m / 1.5 mm² (oracle)', () => {
		expect(cableResistanceOhm(5, 1.5)).toBeCloseTo(evaluate('1.72e-8 ohm m * 10 m / (1.5 mm^2)').toNumber('ohm'), 12);
	});
	it('property: parallel ≤ smallest load, series ≥ largest', () => {
		for (let i = 0; i < 300; i++) {
			const loads = Array.from({ length: 2 + Math.floor(Math.random() * 4) }, () => 1 + Math.random() * 15);
			expect(parallelLoadOhm(loads)).toBeLessThanOrEqual(Math.min(...loads));
			expect(seriesLoadOhm(loads)).toBeGreaterThanOrEqual(Math.max(...loads));
		}
	});
	it('throws RangeError for impossible input', () => {
		expect(() => parallelLoadOhm(8, 0)).toThrow(RangeError);
		expect(() => dampingFactor({ loadOhm: 8, sourceOhm: 0.02, cableLengthM: 5 })).toThrow(/cableAreaMm2/);
		expect(() => dampingFactor({ loadOhm: 8, sourceOhm: 0 })).toThrow(RangeError);
	});
});
