import { describe, expect, it } from 'vitest';
import { amplifierSpec, deriveAmplifier, type AmplifierSpec } from './amplifier';

/** A ±35 V chip-amp block (REFERENCE.md §1–2 worked example, §5 application values). */
const base = (): AmplifierSpec =>
	amplifierSpec.parse({
		channels: 2,
		topology: 'class-ab-chip',
		supply: 'split',
		railV: 35,
		loadOhm: 8,
		device: { maxSupplyV: 84, dropoutV: 3, junctionMaxC: 150, rthJcKPerW: 1, minLoadOhm: 4 },
		gain: { rfOhm: 22e3, riOhm: 680, ciF: 22e-6 },
		input: { rOhm: 22e3, cF: 470e-9 },
		claimed: { powerW: 60, thdPct: 0.1 }
	});
const ids = (d: AmplifierSpec) => deriveAmplifier(d).checks.map((c) => `${c.id}:${c.level}`);

describe('amplifier block — derived', () => {
	it('bench-tool names with the worked-example numbers (REFERENCE.md §12 cases 1, 2, 8)', () => {
		const { derived, checks } = deriveAmplifier(base());
		expect(derived.maxPowerW).toBeCloseTo(64, 9);
		expect(derived.peakCurrentA).toBeCloseTo(4, 9);
		expect(derived.worstDissipationW).toBeCloseTo(31.03, 2);
		expect(derived.totalWorstDissipationW).toBeCloseTo(62.06, 2);
		expect(derived.totalSupplyV).toBe(70);
		expect(derived.caseMaxC).toBeCloseTo(150 - 31.03, 2);
		expect(derived.gainDb).toBeCloseTo(30.46, 2);
		expect(derived.inputCornerHz).toBeCloseTo(15.39, 2);
		expect(derived.feedbackCornerHz).toBeCloseTo(10.64, 2);
		expect(derived.lowCornerHz!).toBeGreaterThan(15.39); // two high-passes together sit above the higher one
		expect(derived.efficiency!).toBeGreaterThan(0.6);
		expect(derived.efficiency!).toBeLessThan(Math.PI / 4);
		expect(checks).toEqual([]);
	});
	it('efficiency/dissipation at the claimed power are null when the claim is beyond the rails', () => {
		const d = base();
		d.claimed = { powerW: 100, thdPct: 1 };
		expect(deriveAmplifier(d).derived.efficiency).toBeNull();
		d.claimed = null;
		d.gain = null;
		const derived = deriveAmplifier(d).derived;
		expect(derived).toMatchObject({ supplyPowerW: null, gain: null, feedbackCornerHz: null });
		expect(derived.lowCornerHz!).toBeCloseTo(derived.inputCornerHz!, 6); // one corner alone is the −3 dB point
	});
});

describe('amplifier block — checks (API.md thresholds)', () => {
	it('amp.power-beyond-rails: caution above 1.05 × maxPowerW (64 W → 67.2 W), silent at it', () => {
		const d = base();
		d.claimed = { powerW: 67.2, thdPct: 0.1 };
		expect(ids(d)).not.toContain('amp.power-beyond-rails:caution');
		d.claimed = { powerW: 67.3, thdPct: 0.1 };
		const c = deriveAmplifier(d).checks.find((x) => x.id === 'amp.power-beyond-rails');
		expect(c?.level).toBe('caution');
		expect(c?.values).toMatchObject({ claimedPowerW: 67.3, maxPowerW: 64 });
	});
	it('amp.rails-beyond-device: danger when the total supply exceeds device.maxSupplyV (70 V vs 70 / 69.9)', () => {
		const d = base();
		d.device.maxSupplyV = 70;
		expect(ids(d)).not.toContain('amp.rails-beyond-device:danger');
		d.device.maxSupplyV = 69.9;
		expect(ids(d)).toContain('amp.rails-beyond-device:danger');
		const single = base();
		single.supply = 'single';
		single.railV = 70;
		single.device.maxSupplyV = 69.9;
		expect(ids(single)).toContain('amp.rails-beyond-device:danger');
	});
	it('amp.load-below-rating: caution when loadOhm < device.minLoadOhm, silent when equal', () => {
		const d = base();
		d.device.minLoadOhm = 8;
		expect(ids(d)).not.toContain('amp.load-below-rating:caution');
		d.device.minLoadOhm = 8.1;
		expect(ids(d)).toContain('amp.load-below-rating:caution');
	});
	it('amp.load-dips-below-rating: note when 80 % of nominal (6.4 Ω) is under the rating', () => {
		const d = base();
		d.device.minLoadOhm = 6.4;
		expect(ids(d)).not.toContain('amp.load-dips-below-rating:note');
		d.device.minLoadOhm = 6.5;
		expect(ids(d)).toContain('amp.load-dips-below-rating:note');
	});
	it('amp.claimed-thd-high: note above 1 % THD (amended US rating rule uses 1 % THD+N)', () => {
		const d = base();
		d.claimed = { powerW: 60, thdPct: 1 };
		expect(ids(d)).not.toContain('amp.claimed-thd-high:note');
		d.claimed = { powerW: 60, thdPct: 10 };
		expect(ids(d)).toContain('amp.claimed-thd-high:note');
	});
});

describe('amplifier block — schema', () => {
	const raw = () => JSON.parse(JSON.stringify(base()));
	it('ignores unknown keys', () => {
		const parsed = amplifierSpec.parse({ ...raw(), colour: 'red' });
		expect('colour' in parsed).toBe(false);
	});
	it('rejects a dropout at or above the rail at device.dropoutV (custom → 422)', () => {
		const r = amplifierSpec.safeParse({ ...raw(), railV: 3 });
		expect(r.success).toBe(false);
		expect(r.error!.issues[0]).toMatchObject({ code: 'custom', path: ['device', 'dropoutV'] });
	});
	it('range errors say the bound and unit', () => {
		const r = amplifierSpec.safeParse({ ...raw(), loadOhm: 0.2 });
		expect(r.error!.issues[0]).toMatchObject({ code: 'too_small', path: ['loadOhm'], message: 'must be at least 0.5 Ω' });
	});
	it('shape errors: missing device, bad topology', () => {
		const { device: _device, ...noDevice } = raw();
		expect(amplifierSpec.safeParse(noDevice).error!.issues[0]).toMatchObject({ code: 'invalid_type', path: ['device'] });
		expect(amplifierSpec.safeParse({ ...raw(), topology: 'class-z' }).error!.issues[0]).toMatchObject({ code: 'invalid_value', path: ['topology'] });
	});
});
