/**
 * Series and parallel combinations of resistors, capacitors and inductors
 * (standard circuit theory; inductors assumed uncoupled).
 */

import { InputRangeError } from './values';

/** Part kinds a network can combine. */
export type NetworkPart = 'resistor' | 'capacitor' | 'inductor';
/** How the parts are joined. */
export type NetworkArrangement = 'series' | 'parallel';

function check(values: readonly number[]): void {
	if (!Array.isArray(values) || values.length === 0) throw new InputRangeError('values', 'values must hold at least one value');
	values.forEach((v, i) => {
		if (!(typeof v === 'number' && Number.isFinite(v) && v > 0))
			throw new InputRangeError(`values.${i}`, `values.${i} must be a finite number greater than 0`);
	});
}

/** Sum of the values (resistors or inductors in series, capacitors in parallel). seriesValue([4700, 4700]) → 9400. */
export function seriesValue(values: readonly number[]): number {
	check(values);
	return values.reduce((a, b) => a + b, 0);
}

/** Reciprocal of the sum of reciprocals (resistors in parallel, capacitors in series). parallelValue([10e3, 10e3]) → 5000. */
export function parallelValue(values: readonly number[]): number {
	check(values);
	return 1 / values.reduce((a, b) => a + 1 / b, 0);
}

/**
 * Combined value of parts in SI units (Ω, F, H): resistors and inductors add in series,
 * capacitors add in parallel. networkValue('capacitor', 'series', [1e-6, 1e-6]) → 5e-7 F.
 */
export function networkValue(part: NetworkPart, arrangement: NetworkArrangement, values: readonly number[]): number {
	if (part !== 'resistor' && part !== 'capacitor' && part !== 'inductor') throw new InputRangeError('part', `unknown part "${String(part)}"`);
	if (arrangement !== 'series' && arrangement !== 'parallel')
		throw new InputRangeError('arrangement', `unknown arrangement "${String(arrangement)}"`);
	const adds = (part === 'capacitor') === (arrangement === 'parallel');
	return adds ? seriesValue(values) : parallelValue(values);
}
