import { describe, expect, it } from 'vitest';
import { ZodError } from 'zod';
import { SPEC_KINDS, crossChecks, runSpec, specSchemas } from './index';

const amplifier = (over: Record<string, unknown> = {}) => ({
	channels: 2,
	topology: 'class-ab-chip',
	supply: 'split',
	railV: 35,
	loadOhm: 8,
	device: { maxSupplyV: 84, dropoutV: 3, junctionMaxC: 150, rthJcKPerW: 1, minLoadOhm: 4 },
	claimed: { powerW: 60, thdPct: 0.1 },
	...over
});
const supply = (over: Record<string, unknown> = {}) => ({
	mainsVac: 230,
	mainsHz: 50,
	transformerVA: 300,
	secondaryVac: 25,
	rectifier: 'bridge-split',
	diodeDropV: 0.8,
	reservoirF: 0.01,
	capRatingV: 50,
	loadCurrentA: 3,
	fuse: { ratingA: 3.15, type: 'slow' },
	chassis: 'metal',
	protectiveEarth: true,
	doubleInsulated: false,
	bleeder: true,
	...over
});
const thermal = (over: Record<string, unknown> = {}) => ({
	powerW: 31.03,
	ambientC: 40,
	junctionMaxC: 150,
	rthJcKPerW: 1,
	rthCsKPerW: 0.4,
	rthSaKPerW: 1.5,
	tabAtRail: true,
	tabInsulated: true,
	heatsinkBondedToChassis: true,
	...over
});
const measurements = (clipW: number) => ({ dcOffsetMv: [2], points: { thd: [{ powerW: clipW, thdPct: 0.5 }] } });

describe('runSpec', () => {
	it('knows the five kinds and has a schema for each', () => {
		expect([...SPEC_KINDS]).toEqual(['amplifier', 'supply', 'thermal', 'measurements', 'bringup']);
		expect(Object.keys(specSchemas).sort()).toEqual([...SPEC_KINDS].sort());
	});
	it('derived values use the bench tools’ output names', () => {
		expect(runSpec('amplifier', amplifier()).derived).toHaveProperty('maxPowerW', 64);
		expect(runSpec('amplifier', amplifier()).derived).toHaveProperty('worstDissipationW');
		expect(runSpec('supply', supply()).derived).toHaveProperty('peakDcV');
		expect(runSpec('supply', supply()).derived).toHaveProperty('rippleVpp');
		expect(runSpec('thermal', thermal()).derived).toHaveProperty('junctionC');
		expect(runSpec('thermal', thermal()).derived).toHaveProperty('requiredRthSaKPerW');
		expect(runSpec('measurements', measurements(10)).checks).toEqual([]);
		expect(runSpec('bringup', { currentLimited: true, oscillationChecked: true }).checks).toEqual([]);
	});
	it('throws the ZodError with field paths for a bad block, ignores unknown keys', () => {
		try {
			runSpec('amplifier', amplifier({ device: { maxSupplyV: 84, dropoutV: 3, junctionMaxC: 150, rthJcKPerW: 1, minLoadOhm: -1 } }));
			expect.unreachable();
		} catch (e) {
			expect(e).toBeInstanceOf(ZodError);
			expect((e as ZodError).issues[0].path).toEqual(['device', 'minLoadOhm']);
		}
		expect(runSpec('supply', supply({ extra: 1 })).checks).toEqual([]);
	});
});

describe('crossChecks', () => {
	it('cross.cap-below-rail: caution for a capacitor rated below the unloaded rail (34.56 V), per part line', () => {
		const parts = [
			{ designators: 'C1,C2', kind: 'capacitor', value: 0.01, ratingV: 35 },
			{ designators: 'C7', kind: 'capacitor', value: 22e-6, ratingV: 25 },
			{ designators: 'C9', kind: 'capacitor', value: 1e-7, ratingV: null },
			{ designators: 'R1', kind: 'resistor', value: 1000, ratingV: 10 }
		];
		const checks = crossChecks([{ kind: 'supply', data: supply() }], parts);
		expect(checks).toHaveLength(1);
		expect(checks[0]).toMatchObject({ id: 'cross.cap-below-rail', level: 'caution', values: { designators: 'C7', ratingV: 25 } });
		expect(checks[0].caution).toMatch(/licensed practice/);
	});
	it('cross.measured-power-beyond-max: caution above 1.05 × the amplifier maxPowerW (64 W → 67.2 W)', () => {
		const at = (w: number) => crossChecks([{ kind: 'amplifier', data: amplifier() }, { kind: 'measurements', data: measurements(w) }]);
		expect(at(67.2)).toEqual([]);
		expect(at(67.3).map((c) => `${c.id}:${c.level}`)).toEqual(['cross.measured-power-beyond-max:caution']);
	});
	it('cross.transformer-small: against the amplifier blocks’ output (2 × 60 W claimed = 120 W)', () => {
		const at = (va: number) =>
			crossChecks([{ kind: 'amplifier', data: amplifier() }, { kind: 'supply', data: supply({ transformerVA: va }) }])
				.filter((c) => c.id === 'cross.transformer-small')
				.map((c) => c.level);
		expect(at(180)).toEqual([]);
		expect(at(179)).toEqual(['note']);
		expect(at(119)).toEqual(['caution']);
		// a supply block that states its own demand is checked by supply.transformer-small instead
		const own = crossChecks([{ kind: 'amplifier', data: amplifier() }, { kind: 'supply', data: supply({ transformerVA: 50, amplifierDemandW: 20 }) }]);
		expect(own.map((c) => c.id)).not.toContain('cross.transformer-small');
	});
	it('cross.rails-beyond-device: danger when the unloaded rails pass the device maximum, caution when only at +10 % mains', () => {
		// unloaded ±34.56 V = 69.1 V total; at +10 % mains ±38.09 V = 76.2 V total.
		const at = (maxSupplyV: number) =>
			crossChecks([
				{ kind: 'amplifier', data: amplifier({ device: { maxSupplyV, dropoutV: 3, junctionMaxC: 150, rthJcKPerW: 1, minLoadOhm: 4 } }) },
				{ kind: 'supply', data: supply() }
			])
				.filter((c) => c.id === 'cross.rails-beyond-device')
				.map((c) => c.level);
		expect(at(84)).toEqual([]);
		expect(at(75)).toEqual(['caution']);
		expect(at(70)).toEqual(['caution']);
		expect(at(69)).toEqual(['danger']);
	});
	it('cross.thermal-power-below-worst: caution when the thermal block uses < 0.95 × the worst-case dissipation', () => {
		const at = (powerW: number) =>
			crossChecks([{ kind: 'amplifier', data: amplifier() }, { kind: 'thermal', data: thermal({ powerW }) }]).map((c) => c.id);
		expect(at(31.03)).toEqual([]);
		expect(at(29.5)).toEqual([]);
		expect(at(29.4)).toEqual(['cross.thermal-power-below-worst']);
	});
	it('skips blocks that fail their schema and unknown kinds', () => {
		expect(crossChecks([{ kind: 'supply', data: { mainsVac: 'x' } }, { kind: 'valve', data: {} }], [
			{ designators: 'C1', kind: 'capacitor', value: 1e-6, ratingV: 1 }
		])).toEqual([]);
	});
});
