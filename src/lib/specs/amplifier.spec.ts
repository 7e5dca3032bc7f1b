import { describe, expect, it } from 'vitest';
import { evaluate } from 'mathjs';
import { amplifierSpec, deriveAmplifier, type AmplifierSpec } from './amplifier';
import { amplifierBlock } from './fixtures';

// Sources of expected values (named beside each test):
// [TI] power-amp IC datasheet "Determining Maximum Power Dissipation" eq. (1), total-supply form Pd = Vt²/(2π²R);
// [IEC 60268-5] a loudspeaker's impedance does not fall below 80 % of its rating (via a loudspeaker maker's glossary);
// [REF] REFERENCE.md worked examples (computed there independently); mathjs evaluates the formulas with units as an oracle.
const W = (expr: string) => evaluate(expr).toNumber('W');
const parse = (over: Record<string, unknown> = {}): AmplifierSpec => amplifierSpec.parse(amplifierBlock(over));
const ids = (d: AmplifierSpec) => deriveAmplifier(d).checks.map((c) => `${c.id}:${c.level}`);
const device = (over: Record<string, unknown>) => ({ maxSupplyV: 100, dropoutV: 3, junctionMaxC: 150, rthJcKPerW: 1, minLoadOhm: 4, ...over });

describe('amplifier block — class AB worst case (API.md revision 2)', () => {
	it('nominal figures: ±35 V, 8 Ω, 3 V dropout → 64 W, 4 A peak, 31.03 W textbook worst case [REF §12 cases 1–2, TI]', () => {
		const { derived } = deriveAmplifier(parse());
		expect(derived.railLimitPowerW).toBeCloseTo(64.0, 6); // (35 − 3)² / (2 · 8) = 1024 / 16
		expect(derived.maxPowerW).toBeCloseTo(64.0, 6);
		expect(derived.peakCurrentA).toBeCloseTo(4.0, 6);
		expect(Math.abs(derived.worstDissipationW! - 31.03)).toBeLessThan(0.01);
		expect(derived.worstDissipationW).toBeCloseTo(W('(70 V)^2 / (2 * pi^2 * 8 ohm)'), 9); // TI total-supply form
	});
	it('designDissipationW at +10 % mains and 0.8 × 8 Ω = 6.4 Ω: total 77 V → 46.93 W per channel [TI, IEC 60268-5]', () => {
		const { derived } = deriveAmplifier(parse());
		// by hand: Vt = 2 · 35 · 1.1 = 77 V; 77² = 5929; 2 · π² · 6.4 = 126.33; 5929 / 126.33 = 46.93 W
		expect(Math.abs(derived.designDissipationW! - 46.93)).toBeLessThan(0.01);
		expect(derived.designDissipationW).toBeCloseTo(W('(77 V)^2 / (2 * pi^2 * 6.4 ohm)'), 9);
		expect(derived.minImpedanceOhm).toBeCloseTo(6.4, 12);
		expect(derived.highMainsTotalV).toBeCloseTo(77, 9);
		expect(derived.totalDesignDissipationW).toBeCloseTo(2 * derived.designDissipationW!, 9);
	});
	it('adds the quiescent term: 50 mA × 77 V = 3.85 W [REF §2.5, Pq = (V+ − V−)·Iq]', () => {
		const q = deriveAmplifier(parse({ quiescentA: 0.05 })).derived.designDissipationW!;
		expect(q).toBeCloseTo(W('(77 V)^2 / (2 * pi^2 * 6.4 ohm) + 50 mA * 77 V'), 9);
		expect(Math.abs(q - 50.78)).toBeLessThan(0.01);
	});
	it('bridged: 4 × the power and dissipation of one stage, both stages’ quiescent current [REF §1.1 BTL]', () => {
		const { derived } = deriveAmplifier(parse({ bridged: true, quiescentA: 0.05 }));
		expect(derived.railLimitPowerW).toBeCloseTo(256, 6); // 2 · 32² / 8
		expect(derived.worstDissipationW).toBeCloseTo(W('8 * (35 V)^2 / (pi^2 * 8 ohm)'), 9);
		expect(derived.designDissipationW).toBeCloseTo(W('8 * (38.5 V)^2 / (pi^2 * 6.4 ohm) + 2 * 50 mA * 77 V'), 9);
	});
	it('the chip-amp build of the issue: ±28 V stated, supply at ±32.18 V off load at +10 % mains → about 33 W, not 19.9 W', () => {
		// Supply: 20 V secondary, 6 % regulation, 0.8 V drop: 20 · √2 · 1.06 · 1.1 − 0.8 = 32.18 V per rail (hand).
		const rails = { supplyBlock: 1, highMainsRailV: 20 * Math.SQRT2 * 1.06 * 1.1 - 0.8, loadedRailV: 27, lowMainsRailV: 24 };
		const d = deriveAmplifier(parse({ railV: 28, device: device({ dropoutV: 4 }) }), rails);
		expect(Math.abs(d.derived.designDissipationW! - 32.8)).toBeLessThan(0.1);
		expect(d.checks.map((c) => c.id)).toContain('amp.rails-from-supply');
	});
});

describe('amplifier block — checks at their thresholds', () => {
	it('amp.power-beyond-rails: caution above 1.05 × 64 W = 67.2 W, silent at 67.2 W', () => {
		expect(ids(parse({ claimed: { powerW: 67.2, thdPct: 0.1 } }))).not.toContain('amp.power-beyond-rails:caution');
		const c = deriveAmplifier(parse({ claimed: { powerW: 67.3, thdPct: 0.1 } })).checks.find((x) => x.id === 'amp.power-beyond-rails');
		expect(c?.level).toBe('caution');
		expect(c?.values).toMatchObject({ claimedPowerW: 67.3, railLimitPowerW: 64 });
	});
	it('amp.rails-beyond-device compares the high-mains total 77 V (not the nominal 70 V) with device.maxSupplyV', () => {
		expect(ids(parse({ device: device({ maxSupplyV: 77.01 }) }))).not.toContain('amp.rails-beyond-device:danger');
		expect(ids(parse({ device: device({ maxSupplyV: 76.99 }) }))).toContain('amp.rails-beyond-device:danger');
		expect(ids(parse({ device: device({ maxSupplyV: 72 }) }))).toContain('amp.rails-beyond-device:danger'); // nominal 70 V would pass
		// single supply of 70 V is ±35 V too: the same 77 V at high mains
		expect(ids(parse({ supply: 'single', railV: 70, device: device({ maxSupplyV: 76.99 }) }))).toContain('amp.rails-beyond-device:danger');
		expect(ids(parse({ mainsHighPct: 0, device: device({ maxSupplyV: 70.01 }) }))).not.toContain('amp.rails-beyond-device:danger');
	});
	it('amp.load-below-rating: caution when loadOhm < device.minLoadOhm, silent when equal', () => {
		expect(ids(parse({ device: device({ minLoadOhm: 8 }) }))).not.toContain('amp.load-below-rating:caution');
		expect(ids(parse({ device: device({ minLoadOhm: 8.1 }) }))).toContain('amp.load-below-rating:caution');
	});
	it('amp.load-dips-below-rating: note when 80 % of nominal (6.4 Ω) is under the rating [IEC 60268-5]', () => {
		expect(ids(parse({ device: device({ minLoadOhm: 6.4 }) }))).not.toContain('amp.load-dips-below-rating:note');
		expect(ids(parse({ device: device({ minLoadOhm: 6.5 }) }))).toContain('amp.load-dips-below-rating:note');
	});
	it('amp.current-beyond-device: (38.5 − 3) V / 6.4 Ω = 5.55 A peak against the device limit [REF §1.2]', () => {
		expect(deriveAmplifier(parse()).derived.worstPeakCurrentA).toBeCloseTo(35.5 / 6.4, 9);
		expect(ids(parse({ device: device({ maxOutputCurrentA: 5.56 }) }))).not.toContain('amp.current-beyond-device:caution');
		expect(ids(parse({ device: device({ maxOutputCurrentA: 5.54 }) }))).toContain('amp.current-beyond-device:caution');
	});
	it('amp.claimed-thd-high: note above 1 % THD (amended US rating rule uses 1 % THD+N)', () => {
		expect(ids(parse({ claimed: { powerW: 60, thdPct: 1 } }))).not.toContain('amp.claimed-thd-high:note');
		expect(ids(parse({ claimed: { powerW: 60, thdPct: 1.01 } }))).toContain('amp.claimed-thd-high:note');
	});
	it('amp.speaker-protection: note for a discrete split-rail stage without DC protection (common practice)', () => {
		expect(ids(parse({ topology: 'class-ab-discrete' }))).toContain('amp.speaker-protection:note');
		expect(ids(parse({ topology: 'class-ab-discrete', speakerProtection: true }))).not.toContain('amp.speaker-protection:note');
		expect(ids(parse({ topology: 'class-ab-discrete', supply: 'single', railV: 70 }))).not.toContain('amp.speaker-protection:note');
		expect(ids(parse())).not.toContain('amp.speaker-protection:note');
	});
});

describe('amplifier block — other topologies', () => {
	const classA = (over: Record<string, unknown> = {}) =>
		parse({ topology: 'class-a', railV: 15, loadOhm: 32, biasA: 0.1, claimed: null, device: device({ maxSupplyV: 40, minLoadOhm: 16 }), ...over });
	it('class A, 100 mA into 32 Ω: push-pull 2·I²·R = 0.64 W, single-ended I²·R/2 = 0.16 W, not the 2.25 W rail limit (issue 10 figures)', () => {
		const pp = deriveAmplifier(classA()).derived;
		expect(pp.railLimitPowerW).toBeCloseTo(2.25, 9); // (15 − 3)² / 64
		expect(pp.biasLimitPowerW).toBeCloseTo(0.64, 9); // peak load current 2 × 0.1 A: (0.2 A)² · 32 Ω / 2
		expect(pp.maxPowerW).toBeCloseTo(0.64, 9);
		const se = deriveAmplifier(classA({ classA: 'single-ended' })).derived;
		expect(se.biasLimitPowerW).toBeCloseTo(0.16, 9); // peak load current 0.1 A: (0.1 A)² · 32 Ω / 2
		expect(se.maxPowerW).toBeCloseTo(0.16, 9);
	});
	it('class A dissipation: idle is hottest, 2 · 15 V · 0.1 A = 3 W; design 33 V · 0.1 A = 3.3 W (+10 % mains)', () => {
		const d = deriveAmplifier(classA({ quiescentA: 0.01 })).derived;
		expect(d.worstDissipationW).toBeCloseTo(3, 9);
		expect(d.designDissipationW).toBeCloseTo(W('33 V * 100 mA + 10 mA * 33 V'), 9);
	});
	it('amp.power-beyond-bias: caution above 1.05 × 0.64 W = 0.672 W', () => {
		expect(ids(classA({ claimed: { powerW: 0.67, thdPct: 0.1 } }))).not.toContain('amp.power-beyond-bias:caution');
		expect(ids(classA({ claimed: { powerW: 0.68, thdPct: 0.1 } }))).toContain('amp.power-beyond-bias:caution');
	});
	it('class A needs biasA (a missing field) and cannot be bridged (a custom range issue at bridged)', () => {
		const noBias = amplifierSpec.safeParse(amplifierBlock({ topology: 'class-a' }));
		expect(noBias.error!.issues[0]).toMatchObject({ code: 'invalid_type', path: ['biasA'] });
		const bridged = amplifierSpec.safeParse(amplifierBlock({ topology: 'class-a', biasA: 1, bridged: true }));
		expect(bridged.error!.issues.map((i) => [i.code, i.path.join('.')])).toEqual([['custom', 'bridged']]);
	});
	it('class D at 85 %: loss 64 W · (100/85 − 1) = 11.29 W; design at 38.5 V and 6.4 Ω = 17.37 W', () => {
		const d = deriveAmplifier(parse({ topology: 'class-d' })).derived;
		expect(d.worstDissipationW).toBeCloseTo(W('(32 V)^2 / (2 * 8 ohm) * (100 / 85 - 1)'), 9);
		expect(d.designDissipationW).toBeCloseTo(W('(35.5 V)^2 / (2 * 6.4 ohm) * (100 / 85 - 1)'), 9);
		expect(Math.abs(d.designDissipationW! - 17.37)).toBeLessThan(0.01);
	});
	it('valve: power and dissipation null, amp.not-modelled note, claimed power not checked; rails up to 1000 V', () => {
		const v = parse({ topology: 'valve', railV: 450, supply: 'single', device: device({ maxSupplyV: 600, dropoutV: 50 }), claimed: { powerW: 500, thdPct: 1 } });
		const { derived, checks } = deriveAmplifier(v);
		expect(derived).toMatchObject({ maxPowerW: null, railLimitPowerW: null, worstDissipationW: null, designDissipationW: null });
		expect(checks.map((c) => c.id)).toEqual(['amp.not-modelled']);
		expect(amplifierSpec.safeParse(amplifierBlock({ topology: 'valve', railV: 1000.5 })).success).toBe(false);
		const ab = amplifierSpec.safeParse(amplifierBlock({ railV: 201 }));
		expect(ab.error!.issues[0]).toMatchObject({ code: 'custom', path: ['railV'] });
	});
});

describe('amplifier block — gain and corners', () => {
	it('22 kΩ / 680 Ω, 22 µF, input 22 kΩ with 470 nF: 30.46 dB, 10.64 Hz and 15.39 Hz [REF §12 case 8, published application values]', () => {
		const d = deriveAmplifier(parse({ gain: { rfOhm: 22e3, riOhm: 680, ciF: 22e-6 }, input: { rOhm: 22e3, cF: 470e-9 } })).derived;
		expect(Math.abs(d.gainDb! - 30.46)).toBeLessThan(0.01);
		expect(Math.abs(d.feedbackCornerHz! - 10.64)).toBeLessThan(0.01);
		expect(Math.abs(d.inputCornerHz! - 15.39)).toBeLessThan(0.01);
		expect(d.lowCornerHz!).toBeGreaterThan(15.39); // two high-passes together sit above the higher one
	});
});

describe('amplifier block — schema', () => {
	it('ignores unknown keys; a dropout at or above the rail is a range issue at device.dropoutV', () => {
		expect('colour' in amplifierSpec.parse(amplifierBlock({ colour: 'red' }))).toBe(false);
		const r = amplifierSpec.safeParse(amplifierBlock({ railV: 3 }));
		expect(r.error!.issues[0]).toMatchObject({ code: 'custom', path: ['device', 'dropoutV'] });
	});
	it('range errors say the bound and unit; shape errors for a missing device or a bad topology', () => {
		expect(amplifierSpec.safeParse(amplifierBlock({ loadOhm: 0.2 })).error!.issues[0]).toMatchObject({ code: 'too_small', message: 'must be at least 0.5 Ω' });
		const { device: _d, ...noDevice } = amplifierBlock();
		expect(amplifierSpec.safeParse(noDevice).error!.issues[0]).toMatchObject({ code: 'invalid_type', path: ['device'] });
		expect(amplifierSpec.safeParse(amplifierBlock({ topology: 'class-z' })).error!.issues[0]).toMatchObject({ code: 'invalid_value' });
	});
});

describe('amplifier block — nested objects get a sentence, not the library default', () => {
	it('a missing device says what it needs; a wrong-typed one says its shape', () => {
		const { device: _d, ...noDevice } = amplifierBlock();
		const missing = amplifierSpec.safeParse(noDevice).error!.issues.find((i) => i.path.join('.') === 'device')!;
		expect(missing.message).toMatch(/^required: the output device’s ratings/);
		const wrong = amplifierSpec.safeParse(amplifierBlock({ device: 'LM-something' })).error!.issues.find((i) => i.path.join('.') === 'device')!;
		expect(wrong.message).toMatch(/^must be an object \{ maxSupplyV/);
		expect(amplifierSpec.safeParse(amplifierBlock({ claimed: 60 })).error!.issues[0].message).toMatch(/^must be an object \{ powerW, thdPct \}/);
	});
});

describe('amplifier block — railText (the rail as typed)', () => {
	it('is kept as text; control characters (NUL included) get a sentence, not a database error', () => {
		expect(amplifierSpec.parse(amplifierBlock({ railText: '±35' })).railText).toBe('±35');
		const bad = amplifierSpec.safeParse(amplifierBlock({ railText: '±35\u0000' })).error!.issues[0];
		expect(bad).toMatchObject({ path: ['railText'], message: 'must not contain control characters' });
	});
});
