import { describe, expect, it } from 'vitest';
import { evaluate } from 'mathjs';
import { networkValue, parallelValue, seriesValue } from './network';
import { InputRangeError } from './values';

describe('networkValue', () => {
	// REFERENCE.md §6.6 worked examples / §12 case 10 (standard circuit theory).
	it('1 µF + 1 µF in series → 0.5 µF; in parallel → 2 µF', () => {
		expect(networkValue('capacitor', 'series', [1e-6, 1e-6])).toBeCloseTo(0.5e-6, 18);
		expect(networkValue('capacitor', 'parallel', [1e-6, 1e-6])).toBeCloseTo(2e-6, 18);
	});
	it('10 kΩ ‖ 10 kΩ → 5 kΩ; 4.7 k + 4.7 k → 9.4 kΩ', () => {
		expect(networkValue('resistor', 'parallel', [10e3, 10e3])).toBeCloseTo(5000, 9);
		expect(networkValue('resistor', 'series', [4700, 4700])).toBe(9400);
	});
	it('uncoupled inductors add in series like resistors', () => {
		expect(networkValue('inductor', 'series', [1e-3, 2.2e-3])).toBeCloseTo(3.2e-3, 15);
		expect(networkValue('inductor', 'parallel', [2e-3, 2e-3])).toBeCloseTo(1e-3, 15);
	});
	it('PRODUCT.md §4.4 substitution: two 1 µF in series for 0.47 µF is +6.4 %', () => {
		const fitted = networkValue('capacitor', 'series', [1e-6, 1e-6]);
		expect((100 * (fitted - 0.47e-6)) / 0.47e-6).toBeCloseTo(6.38, 2);
	});
	it('agrees with mathjs unit arithmetic (oracle)', () => {
		const oracle = evaluate('1 / (1 / (10 kohm) + 1 / (22 kohm))').toNumber('ohm');
		expect(parallelValue([10e3, 22e3])).toBeCloseTo(oracle, 9);
		const series = evaluate('2.2 uF + 470 nF').toNumber('F');
		expect(networkValue('capacitor', 'parallel', [2.2e-6, 470e-9])).toBeCloseTo(series, 18);
	});
	it('property: n equal parts give n·v in series and v/n in parallel; parallel ≤ smallest, series ≥ largest; order does not matter', () => {
		for (let i = 0; i < 500; i++) {
			const n = 2 + Math.floor(Math.random() * 10);
			const v = 10 ** (Math.random() * 12 - 6);
			const equal = Array.from({ length: n }, () => v);
			expect(seriesValue(equal) / (n * v)).toBeCloseTo(1, 12);
			expect(parallelValue(equal) / (v / n)).toBeCloseTo(1, 12);
			const mixed = Array.from({ length: n }, () => 10 ** (Math.random() * 6));
			expect(parallelValue(mixed)).toBeLessThanOrEqual(Math.min(...mixed) * (1 + 1e-12));
			expect(seriesValue(mixed)).toBeGreaterThanOrEqual(Math.max(...mixed));
			const shuffled = [...mixed].reverse();
			expect(parallelValue(shuffled) / parallelValue(mixed)).toBeCloseTo(1, 12);
		}
	});
	it('throws InputRangeError naming the bad value', () => {
		expect(() => seriesValue([])).toThrow(RangeError);
		try {
			networkValue('resistor', 'series', [100, 0, 5]);
			expect.unreachable();
		} catch (e) {
			expect((e as InputRangeError).field).toBe('values.1');
		}
		expect(() => parallelValue([1, Number.NaN])).toThrow(RangeError);
	});
});
