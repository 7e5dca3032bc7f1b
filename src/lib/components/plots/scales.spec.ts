import { describe, expect, it } from 'vitest';
import { scaleLinear, scaleLog } from 'd3-scale';
import { axisDomain, axisTicks, drawable, formatTick, makeScale } from './scales';

describe('axisDomain', () => {
	it('covers the values, padded on linear axes', () => {
		expect(axisDomain([2, 8, 5])).toEqual([2, 8]);
		expect(axisDomain([10, 20], false, 0.1)).toEqual([9, 21]);
		expect(axisDomain([-10, 10], false, 0.1)).toEqual([-12, 12]);
	});
	it('does not pad an all-positive axis below zero', () => {
		expect(axisDomain([0, 10], false, 0.1)).toEqual([0, 11]);
		const [lo, hi] = axisDomain([0.2, 10], false, 0.1);
		expect(lo).toBe(0);
		expect(hi).toBeCloseTo(10.98, 9);
	});
	it('never collapses and ignores what cannot be drawn', () => {
		expect(axisDomain([])).toEqual([0, 1]);
		expect(axisDomain([], true)).toEqual([1, 10]);
		const [lo, hi] = axisDomain([5, NaN, Infinity]);
		expect(lo).toBeLessThan(5);
		expect(hi).toBeGreaterThan(5);
		expect(axisDomain([-3, 0, 100, 1000], true)).toEqual([100, 1000]);
	});
});

describe('makeScale', () => {
	it('maps a linear domain onto the range, rounded out to nice ends', () => {
		const s = makeScale([0.3, 9.7], [0, 100]);
		expect(s.domain()).toEqual([0, 10]);
		expect(s(5)).toBeCloseTo(50, 9);
	});
	it('maps decades evenly on a log axis', () => {
		const s = makeScale([1e-4, 1e-1], [0, 300], true);
		expect(s(1e-3)).toBeCloseTo(100, 9);
		expect(s(1e-2)).toBeCloseTo(200, 9);
	});
});

describe('makeScale against d3-scale (the general-purpose library as the oracle)', () => {
	// Pseudo-random but repeatable domains: a linear congruential generator (Numerical Recipes' constants).
	let seed = 12345;
	const rand = () => ((seed = (seed * 1664525 + 1013904223) % 2 ** 32) / 2 ** 32);
	const cases = Array.from({ length: 200 }, () => {
		const a = (rand() - 0.3) * 10 ** Math.floor(rand() * 8 - 3);
		const b = a + rand() * 10 ** Math.floor(rand() * 8 - 3) + 1e-9;
		return { a, b, r: [Math.round(rand() * 80), 200 + Math.round(rand() * 600)] as [number, number] };
	});
	it('a linear axis: a nice domain like scaleLinear().nice(6), then the same pixels and ticks as scaleLinear()', () => {
		for (const { a, b, r } of cases) {
			const ours = makeScale([a, b], r);
			const [lo, hi] = ours.domain();
			const d3nice = scaleLinear().domain([a, b]).nice(6).domain();
			const d3 = scaleLinear().domain([lo, hi]).range(r);
			// Covers the values, ends on ticks (d3-array's nice), and matches d3-scale's nice(6) — which, doing
			// floor(start / step) · step in floating point, sometimes steps one tick further out (0.0498 → 0.0496).
			expect(lo).toBeLessThanOrEqual(a);
			expect(hi).toBeGreaterThanOrEqual(b);
			const step = d3.ticks(6)[1] - d3.ticks(6)[0];
			expect(lo - d3nice[0]).toBeGreaterThanOrEqual(-1e-12 * Math.abs(step));
			expect(lo - d3nice[0]).toBeLessThanOrEqual(step * 1.000001);
			expect(d3nice[1] - hi).toBeGreaterThanOrEqual(-1e-12 * Math.abs(step));
			expect(d3nice[1] - hi).toBeLessThanOrEqual(step * 1.000001);
			for (const v of [a, b, (a + b) / 2, a - (b - a), ...d3.ticks(7)]) expect(ours(v)).toBe(d3(v));
			for (const n of [4, 5, 7]) expect(ours.ticks?.(n)).toEqual(d3.ticks(n));
		}
		// Most domains come out exactly as d3-scale's (the one-step difference is a rounding corner case).
		const same = cases.filter(({ a, b, r }) => {
			const d = makeScale([a, b], r).domain().map((v) => v + 0);
			const e = scaleLinear().domain([a, b]).nice(6).domain().map((v) => v + 0);
			return d[0] === e[0] && d[1] === e[1];
		}).length;
		expect(same).toBeGreaterThan(cases.length * 0.9);
	});
	it('a log axis: the same pixels as scaleLog()', () => {
		for (const { b, r } of cases) {
			const lo = Math.abs(b) / 1000 + 1e-6;
			const hi = lo * (2 + 1000 * rand());
			const ours = makeScale([lo, hi], r, true);
			const d3 = scaleLog().domain([lo, hi]).range(r);
			expect(ours.domain()).toEqual(d3.domain());
			for (const v of [lo, hi, Math.sqrt(lo * hi), lo * 1.5, hi * 3]) expect(ours(v)).toBeCloseTo(d3(v), 9);
		}
	});
});

describe('axisTicks', () => {
	it('gives round linear ticks inside the domain', () => {
		const ticks = axisTicks(makeScale([0, 50], [0, 500]), false, 5);
		expect(ticks.map((t) => t.value)).toEqual([0, 10, 20, 30, 40, 50]);
		expect(ticks[2].label).toBe('20');
	});
	it('gives decades on a wide log axis and 1-2-5 on a narrow one', () => {
		const wide = axisTicks(makeScale([1e-5, 1e-1], [0, 400], true), true);
		expect(wide.map((t) => t.value)).toEqual([1e-5, 1e-4, 1e-3, 1e-2, 1e-1]);
		expect(wide.map((t) => t.label)).toEqual(['10µ', '100µ', '1m', '0.01', '0.1']);
		const narrow = axisTicks(makeScale([1000, 20000], [0, 400], true), true);
		expect(narrow.map((t) => t.value)).toEqual([1000, 2000, 5000, 10000, 20000]);
	});
});

describe('formatTick', () => {
	it('uses SI prefixes only for very large or small values', () => {
		expect(formatTick(0)).toBe('0');
		expect(formatTick(2.5)).toBe('2.5');
		expect(formatTick(4700)).toBe('4700');
		expect(formatTick(47000)).toBe('47k');
		expect(formatTick(0.0047)).toBe('4.7m');
		expect(formatTick(2.2e-6)).toBe('2.2µ');
		expect(formatTick(-1.5e6)).toBe('-1.5M');
	});
});

describe('drawable', () => {
	it('drops non-finite points and non-positive ones on log axes', () => {
		const pts = [
			{ x: 0, y: 1 },
			{ x: 1, y: NaN },
			{ x: 2, y: -1 },
			{ x: 3, y: 4 }
		];
		expect(drawable(pts)).toHaveLength(3);
		expect(drawable(pts, true, true)).toEqual([{ x: 3, y: 4 }]);
	});
});
