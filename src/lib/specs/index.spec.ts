import { describe, expect, it } from 'vitest';
import { ZodError } from 'zod';
import { evaluate } from 'mathjs';
import { SPEC_KINDS, checkBuild, crossChecks, runSpec, specSchemas } from './index';
import { amplifierBlock, supplyBlock, thermalBlock } from './fixtures';

const amplifier = amplifierBlock;
const supply = supplyBlock;
const thermal = (over: Record<string, unknown> = {}) => thermalBlock({ powerW: 31.03, rthSaKPerW: 1.5, ...over });
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

// Fixture supply (REFERENCE.md §4.2 / §12 case 7): off load at +10 % mains 40.81 V per rail, 81.62 V rail to rail.
describe('checkBuild — an amplifier inside a build uses its supply block’s high-mains rail', () => {
	it('designDissipationW at ±40.81 V and 6.4 Ω = 52.7 W per channel, with the note amp.rails-from-supply', () => {
		const r = checkBuild([{ kind: 'amplifier', data: amplifier() }, { kind: 'supply', data: supply() }]);
		const amp = r.blocks[0];
		if (!amp.ok) throw amp.error;
		const hi = (r.blocks[1] as unknown as { derived: { highMainsPeakDcV: number } }).derived.highMainsPeakDcV;
		expect(Math.abs(hi - 40.81)).toBeLessThan(0.01);
		// TI total-supply form at 2 × 40.81 V into 0.8 × 8 Ω (hand: 81.62² / (2 π² · 6.4) = 52.7 W)
		expect(Math.abs((amp.derived.designDissipationW as number) - evaluate('(81.62 V)^2 / (2 * pi^2 * 6.4 ohm)').toNumber('W'))).toBeLessThan(0.05);
		expect(amp.checks.map((c) => c.id)).toContain('amp.rails-from-supply');
		// alone, the same block uses its own 35 V × 1.1
		expect(runSpec('amplifier', amplifier()).derived.designDissipationW).toBeCloseTo(evaluate('(77 V)^2 / (2 * pi^2 * 6.4 ohm)').toNumber('W'), 9);
	});
	it('an amplifier on regulated rails keeps its own figures and skips the supply’s device check', () => {
		const r = checkBuild([{ kind: 'amplifier', data: amplifier({ regulatedRails: true, device: { maxSupplyV: 50, dropoutV: 3, junctionMaxC: 150, rthJcKPerW: 1, minLoadOhm: 4 }, railV: 20, claimed: null }) }, { kind: 'supply', data: supply() }]);
		expect((r.blocks[0] as unknown as { checks: { id: string }[] }).checks.map((c) => c.id)).not.toContain('amp.rails-from-supply');
		expect(r.cross.map((c) => c.id)).not.toContain('cross.rails-beyond-device');
	});
	it('blocks that fail their schema come back not ok and take no part in the cross checks', () => {
		const r = checkBuild([{ kind: 'supply', data: { mainsVac: 'x' } }, { kind: 'valve', data: {} }], [{ designators: 'C1', kind: 'capacitor', value: 1e-6, ratingV: 1 }]);
		expect(r.blocks.map((b) => b.ok)).toEqual([false, false]);
		expect(r.cross).toEqual([]);
	});
});

describe('cross checks at their thresholds', () => {
	it('cross.cap-below-rail: danger below the 40.81 V high-mains rail, per line; a line across both rails against 81.62 V', () => {
		const parts = [
			{ designators: 'C1,C2', kind: 'capacitor', value: 0.01, ratingV: 63 },
			{ designators: 'C7', kind: 'capacitor', value: 22e-6, ratingV: 40.8 },
			{ designators: 'C8', kind: 'capacitor', value: 22e-6, ratingV: 40.82 },
			{ designators: 'C9', kind: 'capacitor', value: 1e-7, ratingV: null },
			{ designators: 'C10', kind: 'capacitor', value: 1e-7, ratingV: 63, railToRail: true },
			{ designators: 'C11', kind: 'capacitor', value: 1e-7, ratingV: 81.7, railToRail: true },
			{ designators: 'R1', kind: 'resistor', value: 1000, ratingV: 10 }
		];
		const checks = crossChecks([{ kind: 'supply', data: supply() }], parts);
		expect(checks.map((c) => `${c.values.designators}:${c.level}`)).toEqual(['C7:danger', 'C10:danger']);
		expect(checks[0].caution).toMatch(/licensed practice/);
	});
	it('cross.rating-below-rail: a transistor line against the same 40.81 V rail (81.62 V when it says rail to rail)', () => {
		const at = (ratingV: number, railToRail = false) =>
			crossChecks([{ kind: 'supply', data: supply() }], [{ designators: 'Q1', kind: 'transistor', value: null, ratingV, railToRail }]).map((c) => `${c.id}:${c.level}`);
		expect(at(40.8)).toEqual(['cross.rating-below-rail:danger']);
		expect(at(40.82)).toEqual([]);
		expect(at(81.6, true)).toEqual(['cross.rating-below-rail:danger']);
		expect(at(81.7, true)).toEqual([]);
	});
	it('part.fuse-larger: caution when a fuse line is fitted above the design rating, with the line index', () => {
		const at = (valueText: string, designValueText: string | null) =>
			crossChecks([], [{ designators: 'F1', kind: 'fuse', value: null, valueText, designValueText }]);
		expect(at('T2A', 'T1.6A').map((c) => `${c.id}:${c.level}:${c.values.line}`)).toEqual(['part.fuse-larger:caution:0']);
		expect(at('T1.6A', 'T1.6A')).toEqual([]);
		expect(at('T1A', 'T1.6A')).toEqual([]);
		expect(at('1600mA slow', 'T1.6A')).toEqual([]); // 1600 mA = 1.6 A
		expect(at('T2A', null)).toEqual([]); // not a substitution
	});
	it('cross.rails-beyond-device: danger when 81.62 V rail to rail passes device.maxSupplyV', () => {
		const at = (maxSupplyV: number) =>
			crossChecks([
				{ kind: 'amplifier', data: amplifier({ device: { maxSupplyV, dropoutV: 3, junctionMaxC: 150, rthJcKPerW: 1, minLoadOhm: 4 } }) },
				{ kind: 'supply', data: supply() }
			])
				.filter((c) => c.id === 'cross.rails-beyond-device')
				.map((c) => c.level);
		expect(at(81.7)).toEqual([]);
		expect(at(81.6)).toEqual(['danger']);
		expect(at(72)).toEqual(['danger']); // nominal 69.1 V would have passed
	});
	it('cross.thermal-power-below-worst: caution below 0.95 × 46.93 W = 44.59 W (amplifier alone), halved per stage when bridged', () => {
		const at = (powerW: number, over: Record<string, unknown> = {}) =>
			crossChecks([{ kind: 'amplifier', data: amplifier(over) }, { kind: 'thermal', data: thermal({ powerW }) }]).map((c) => c.id);
		expect(at(44.6)).toEqual([]);
		expect(at(44.5)).toEqual(['cross.thermal-power-below-worst']);
		// bridged: 8·38.5²/(π²·6.4) = 187.7 W per channel, 93.9 W per stage → threshold 89.2 W
		expect(at(89.2, { bridged: true, claimed: null })).toEqual([]);
		expect(at(89.1, { bridged: true, claimed: null })).toEqual(['cross.thermal-power-below-worst']);
	});
	it('cross.measured-power-beyond-max: caution above 1.05 × the amplifier maxPowerW (64 W → 67.2 W)', () => {
		const at = (w: number) => crossChecks([{ kind: 'amplifier', data: amplifier() }, { kind: 'measurements', data: measurements(w) }]);
		expect(at(67.2)).toEqual([]);
		expect(at(67.3).map((c) => `${c.id}:${c.level}`)).toEqual(['cross.measured-power-beyond-max:caution']);
	});
	it('cross.transformer-small: against the amplifier blocks’ output (2 × 60 W claimed = 120 W)', () => {
		const at = (va: number) =>
			crossChecks([{ kind: 'amplifier', data: amplifier() }, { kind: 'supply', data: supply({ transformerVA: va, fuse: { ratingA: 1, type: 'slow' } }) }])
				.filter((c) => c.id === 'cross.transformer-small')
				.map((c) => c.level);
		expect(at(180)).toEqual([]);
		expect(at(179)).toEqual(['note']);
		expect(at(119)).toEqual(['caution']);
		const own = crossChecks([{ kind: 'amplifier', data: amplifier() }, { kind: 'supply', data: supply({ transformerVA: 50, amplifierDemandW: 20 }) }]);
		expect(own.map((c) => c.id)).not.toContain('cross.transformer-small');
	});
});

describe('checkBuild — speaker protection stated on the amplifier block covers the offset measurements', () => {
	it('60 mV measured: measure.speaker-protection and bringup.speaker-protection unless an amplifier block says protection is fitted', () => {
		const blocks = (protectedAmp: boolean) => [
			{ kind: 'amplifier', data: amplifier({ speakerProtection: protectedAmp }) },
			{ kind: 'measurements', data: { dcOffsetMv: [60] } },
			{ kind: 'bringup', data: { currentLimited: true, oscillationChecked: true, dcOffsetMv: [60] } }
		];
		const ids = (p: boolean) => checkBuild(blocks(p)).blocks.flatMap((o) => (o.ok ? o.checks.map((c) => c.id) : []));
		expect(ids(false)).toEqual(expect.arrayContaining(['measure.speaker-protection', 'bringup.speaker-protection']));
		expect(ids(true)).not.toContain('measure.speaker-protection');
		expect(ids(true)).not.toContain('bringup.speaker-protection');
	});
});

describe('one rounding for spec messages, spec displays and bench tools: 3 significant figures', () => {
	it('fmt (check messages) and sig3 (block displays) agree with the tools’ sig over many magnitudes', async () => {
		const { fmt } = await import('./types');
		const { sig3 } = await import('$lib/components/specs/display');
		const { sig } = await import('$lib/components/tools/display');
		for (const x of [0.00123, 0.0456, 0.7182, 1, 2.5, 31.0296, 40.8149, 130.04, 999.6, 4567.8, 12345, 98765.4, -64.04]) {
			expect(fmt(x), String(x)).toBe(sig(x, 3));
			expect(sig3(x), String(x)).toBe(sig(x, 3));
		}
		// Hand-rounded to 3 significant figures.
		expect(fmt(40.8149)).toBe('40.8');
		expect(fmt(12345)).toBe('12,300');
		expect(fmt(0.7182)).toBe('0.718');
	});
});
