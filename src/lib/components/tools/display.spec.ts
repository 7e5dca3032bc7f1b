import { describe, expect, it } from 'vitest';
import { pct, show, showCapacitance, sig, signedPct } from './display';

describe('display', () => {
	it('shows SI quantities with engineering prefixes and others plainly', () => {
		expect(show(64, 'W')).toBe('64 W');
		expect(show(4700, 'ohm')).toBe('4.7 kΩ');
		expect(show(0.3543, 'W')).toBe('354 mW');
		expect(show(3, 'Vpp')).toBe('3 V p-p');
		expect(show(129.97, '°C')).toBe('130 °C');
		expect(show(0.7382, 'K/W')).toBe('0.738 K/W');
		expect(show(undefined, 'W')).toBe('—');
	});
	it('rounds to significant figures', () => {
		expect(sig(27.2346, 4)).toBe('27.23');
		expect(sig(0.71818)).toBe('0.718');
		expect(sig(Infinity)).toBe('—');
	});
	it('writes percentages and capacitances the way the trade reads them', () => {
		expect(pct(0.71818)).toBe('71.8 %');
		expect(signedPct(-6)).toBe('\u22126 %');
		expect(signedPct(2.2)).toBe('+2.2 %');
		expect(showCapacitance(0.01)).toBe('10\u202f000 µF (10 mF)');
		expect(showCapacitance(4.7e-7)).toBe('470 nF');
	});
});
