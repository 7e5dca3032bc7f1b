import { describe, expect, it } from 'vitest';
import { deriveThermal, thermalSpec, type ThermalSpec } from './thermal';

const base = (over: Partial<ThermalSpec> = {}): ThermalSpec =>
	thermalSpec.parse({
		powerW: 31.03,
		ambientC: 40,
		junctionMaxC: 150,
		rthJcKPerW: 1.0,
		rthCsKPerW: 0.4,
		rthSaKPerW: 1.5,
		tabAtRail: true,
		tabInsulated: true,
		heatsinkBondedToChassis: true,
		...over
	});
const ids = (d: ThermalSpec) => deriveThermal(d).checks.map((c) => `${c.id}:${c.level}`);

describe('thermal block', () => {
	// REFERENCE.md §12 case 5 (power-amp IC datasheet thermal method, computed).
	it('derives Tj 130.0 °C, Tcase 99.0, Tsink 86.5; required Rθsa 2.145 (Tj 150) and 1.339 (25 °C margin)', () => {
		const { derived } = deriveThermal(base());
		expect(derived.junctionC).toBeCloseTo(130.0, 1);
		expect(derived.caseC).toBeCloseTo(99.0, 1);
		expect(derived.sinkC).toBeCloseTo(86.5, 1);
		expect(Math.abs(derived.requiredRthSaKPerW! - 2.145)).toBeLessThan(0.005);
		expect(Math.abs(derived.requiredRthSaForMarginKPerW! - 1.339)).toBeLessThan(0.005);
		expect(derived.headroomC).toBeCloseTo(20, 1);
	});
	it('thermal.junction-near-limit: silent at exactly junctionMaxC − 25, caution above, danger at or over the limit', () => {
		// 25 °C + 10 W × (1 + 0.5 + Rθsa): Rθsa 8.5 → 125 °C, 8.51 → 125.1, 10.99 → 149.9, 11 → 150 °C.
		const at = (rthSaKPerW: number) =>
			base({ powerW: 10, ambientC: 25, rthJcKPerW: 1, rthCsKPerW: 0.5, rthSaKPerW, junctionMaxC: 150 });
		expect(deriveThermal(at(8.5)).derived.junctionC).toBe(125);
		expect(ids(at(8.5)).filter((i) => i.startsWith('thermal.junction'))).toEqual([]);
		expect(ids(at(8.51))).toContain('thermal.junction-near-limit:caution');
		expect(ids(at(10.99))).toContain('thermal.junction-near-limit:caution');
		expect(deriveThermal(at(11)).derived.junctionC).toBe(150);
		expect(ids(at(11))).toContain('thermal.junction-near-limit:danger');
		expect(ids(base())).toContain('thermal.junction-near-limit:caution'); // 130 °C on a 150 °C part
		const c = deriveThermal(at(11)).checks.find((x) => x.id === 'thermal.junction-near-limit');
		expect(c?.caution).toMatch(/licensed practice/);
	});
	it('thermal.tab-to-chassis: danger only for a rail tab, no insulator, chassis-bonded sink', () => {
		expect(ids(base({ tabInsulated: false }))).toContain('thermal.tab-to-chassis:danger');
		expect(ids(base({ tabInsulated: true }))).not.toContain('thermal.tab-to-chassis:danger');
		expect(ids(base({ tabAtRail: false, tabInsulated: false }))).not.toContain('thermal.tab-to-chassis:danger');
		const live = ids(base({ tabInsulated: false, heatsinkBondedToChassis: false }));
		expect(live).not.toContain('thermal.tab-to-chassis:danger');
		expect(live).toContain('thermal.live-heatsink:caution');
	});
	it('thermal.sink-hot: note above 70 °C at the sink (common practice), silent at 70', () => {
		expect(ids(base({ powerW: 10, ambientC: 40, rthSaKPerW: 3 }))).not.toContain('thermal.sink-hot:note');
		expect(ids(base({ powerW: 10, ambientC: 40, rthSaKPerW: 3.01 }))).toContain('thermal.sink-hot:note');
	});
	it('devices share the heatsink: 2 × 20 W on 1 K/W → sink 80 °C, each junction 80 + 20 · 1.5 = 110 °C [REF §3.1 note]', () => {
		const { derived } = deriveThermal(base({ devices: 2, powerW: 20, rthCsKPerW: 0.5, rthSaKPerW: 1 }));
		expect(derived.sinkC).toBeCloseTo(80, 9);
		expect(derived.junctionC).toBeCloseTo(110, 9);
		// (150 − 40 − 20 · 1.5) / (2 · 20) = 80 / 40 = 2.0 K/W
		expect(derived.requiredRthSaKPerW).toBeCloseTo(2.0, 9);
		expect(derived.feasible).toBe(true);
	});
	it('thermal.impossible: danger once Ta + P·(Rθjc + Rθcs) reaches the limit — 40 + P · 1.5 = 150 at P = 73.3 W', () => {
		const at = (powerW: number) => base({ powerW, rthJcKPerW: 1, rthCsKPerW: 0.5, rthSaKPerW: 0.1 });
		expect(ids(at(73.3))).not.toContain('thermal.impossible:danger');
		expect(deriveThermal(at(73.3)).derived.feasible).toBe(true);
		expect(ids(at(73.4))).toContain('thermal.impossible:danger');
		const r = deriveThermal(at(73.4));
		expect(r.derived.feasible).toBe(false);
		// no suggestion of a negative heatsink anywhere
		for (const c of r.checks) expect(c.message).not.toMatch(/≤ −/);
	});
	it('zero power is allowed (no requirement), out-of-range values are range errors', () => {
		expect(deriveThermal(base({ powerW: 0 })).derived.requiredRthSaKPerW).toBeNull();
		expect(thermalSpec.safeParse({ ...base(), ambientC: 300 }).error!.issues[0]).toMatchObject({ code: 'too_big', path: ['ambientC'] });
		expect(thermalSpec.safeParse({ ...base(), tabAtRail: 1 }).error!.issues[0]).toMatchObject({ code: 'invalid_type' });
	});
});
