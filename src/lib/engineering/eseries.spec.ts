import { describe, expect, it } from 'vitest';
import { E_SERIES, eSeriesMantissas, nearestESeries, type ESeriesName } from './eseries';

// Published lists: IEC 60063 as tabulated by a public encyclopedia article on E-series (E3–E24)
// and an amateur-radio "component preferred values" table (E48, E96) — REFERENCE.md §6.4 [IEC63].
const PUBLISHED: Record<'E3' | 'E6' | 'E12' | 'E24' | 'E48' | 'E96', string> = {
	E3: '1.0 2.2 4.7',
	E6: '1.0 1.5 2.2 3.3 4.7 6.8',
	E12: '1.0 1.2 1.5 1.8 2.2 2.7 3.3 3.9 4.7 5.6 6.8 8.2',
	E24: '1.0 1.1 1.2 1.3 1.5 1.6 1.8 2.0 2.2 2.4 2.7 3.0 3.3 3.6 3.9 4.3 4.7 5.1 5.6 6.2 6.8 7.5 8.2 9.1',
	E48: `1.00 1.05 1.10 1.15 1.21 1.27 1.33 1.40 1.47 1.54 1.62 1.69 1.78 1.87 1.96 2.05 2.15 2.26 2.37 2.49
	2.61 2.74 2.87 3.01 3.16 3.32 3.48 3.65 3.83 4.02 4.22 4.42 4.64 4.87 5.11 5.36 5.62 5.90 6.19 6.49 6.81 7.15 7.50 7.87
	8.25 8.66 9.09 9.53`,
	E96: `1.00 1.02 1.05 1.07 1.10 1.13 1.15 1.18 1.21 1.24 1.27 1.30 1.33 1.37 1.40 1.43 1.47 1.50 1.54 1.58
	1.62 1.65 1.69 1.74 1.78 1.82 1.87 1.91 1.96 2.00 2.05 2.10 2.15 2.21 2.26 2.32 2.37 2.43 2.49 2.55 2.61 2.67 2.74 2.80
	2.87 2.94 3.01 3.09 3.16 3.24 3.32 3.40 3.48 3.57 3.65 3.74 3.83 3.92 4.02 4.12 4.22 4.32 4.42 4.53 4.64 4.75 4.87 4.99
	5.11 5.23 5.36 5.49 5.62 5.76 5.90 6.04 6.19 6.34 6.49 6.65 6.81 6.98 7.15 7.32 7.50 7.68 7.87 8.06 8.25 8.45 8.66 8.87
	9.09 9.31 9.53 9.76`
};
const list = (s: string) => s.trim().split(/\s+/).map(Number);

describe('eSeriesMantissas', () => {
	for (const [name, text] of Object.entries(PUBLISHED))
		it(`${name} equals the published IEC 60063 list`, () => {
			expect(eSeriesMantissas(name as ESeriesName)).toEqual(list(text));
		});

	it('E192 has 192 ascending values, the E96 values at every second place, and 9.20 not 9.19 (from memory)', () => {
		const e192 = eSeriesMantissas('E192');
		expect(e192).toHaveLength(192);
		for (let i = 1; i < e192.length; i++) expect(e192[i]).toBeGreaterThan(e192[i - 1]);
		expect(e192.filter((_, i) => i % 2 === 0)).toEqual(list(PUBLISHED.E96));
		expect(e192).toContain(9.2);
		expect(e192).not.toContain(9.19);
	});

	it('each coarser series is every second value of the next finer one (E3–E24, E48–E192)', () => {
		const pairs: Array<[ESeriesName, ESeriesName]> = [
			['E3', 'E6'],
			['E6', 'E12'],
			['E12', 'E24'],
			['E48', 'E96'],
			['E96', 'E192']
		];
		for (const [coarse, fine] of pairs)
			expect(eSeriesMantissas(fine).filter((_, i) => i % 2 === 0)).toEqual(eSeriesMantissas(coarse));
	});

	it('E_SERIES lists the seven series names and an unknown one throws', () => {
		expect([...E_SERIES]).toEqual(['E3', 'E6', 'E12', 'E24', 'E48', 'E96', 'E192']);
		expect(() => eSeriesMantissas('E7' as ESeriesName)).toThrow(RangeError);
	});
});

describe('nearestESeries', () => {
	// REFERENCE.md §6.5 worked examples (script output) and §12 case 10.
	it('5.0 kΩ → E12 4.7 kΩ, E24 5.1 kΩ, E96 4.99 kΩ', () => {
		expect(nearestESeries(5000, 'E12')).toEqual({ nearest: 4700, below: 4700, above: 5600, errorPct: -6 });
		expect(nearestESeries(5000, 'E24').nearest).toBe(5100);
		expect(nearestESeries(5000, 'E96').nearest).toBe(4990);
	});
	it('9.6 kΩ → E12 10 kΩ, crossing into the next decade; 9.0 kΩ → 8.2 kΩ; 510 Ω → 470 Ω', () => {
		expect(nearestESeries(9600)).toMatchObject({ nearest: 10000, below: 8200, above: 10000 });
		expect(nearestESeries(9000).nearest).toBe(8200);
		expect(nearestESeries(510).nearest).toBe(470);
	});
	it('defaults to E12 and errorPct = 100·(nearest − value)/value', () => {
		const r = nearestESeries(9600);
		expect(r.errorPct).toBeCloseTo((100 * (10000 - 9600)) / 9600, 12);
	});
	it('switches at the geometric mean (5.130 between 4.7 and 5.6, not 5.15); a tie goes to the larger', () => {
		const gm = Math.sqrt(4.7 * 5.6) * 1000;
		expect(nearestESeries(gm * 0.9999).nearest).toBe(4700);
		expect(nearestESeries(gm * 1.0001).nearest).toBe(5600);
		expect(nearestESeries(gm).nearest).toBe(5600);
		expect(nearestESeries(5140).nearest).toBe(5600); // linear midpoint would say 4.7 k
	});
	it('below/above cross a decade downwards too', () => {
		expect(nearestESeries(0.95, 'E3')).toMatchObject({ below: 0.47, above: 1, nearest: 1 });
	});
	it('a member snaps to itself with zero error, in any decade', () => {
		expect(nearestESeries(0.0047, 'E12')).toEqual({ nearest: 0.0047, below: 0.0047, above: 0.0047, errorPct: 0 });
		expect(nearestESeries(1.1e-7, 'E24').nearest).toBe(1.1e-7);
		expect(nearestESeries(3.32e6, 'E96').nearest).toBe(3.32e6);
	});
	it('throws RangeError for 0, negative and non-finite values', () => {
		for (const v of [0, -1, Number.NaN, Infinity]) expect(() => nearestESeries(v)).toThrow(RangeError);
	});
	it('property: nearest is a member of the series, between below and above, and the closer by ratio', () => {
		for (let i = 0; i < 2000; i++) {
			const series = E_SERIES[i % E_SERIES.length];
			const v = 10 ** (Math.random() * 21 - 12);
			const r = nearestESeries(v, series);
			const mant = Number((r.nearest / 10 ** Math.floor(Math.log10(r.nearest) + 1e-12)).toPrecision(3));
			expect(eSeriesMantissas(series)).toContain(mant);
			expect(r.below).toBeLessThanOrEqual(v);
			expect(r.above).toBeGreaterThanOrEqual(v);
			expect([r.below, r.above]).toContain(r.nearest);
			const other = r.nearest === r.above ? r.below : r.above;
			expect(Math.abs(Math.log(v / r.nearest))).toBeLessThanOrEqual(Math.abs(Math.log(v / other)) + 1e-12);
		}
	});
});
