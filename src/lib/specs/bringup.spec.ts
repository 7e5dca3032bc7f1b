import { describe, expect, it } from 'vitest';
import { bringupSpec, deriveBringup, type BringupSpec } from './bringup';

const parse = (over: Record<string, unknown> = {}): BringupSpec =>
	bringupSpec.parse({
		currentLimited: true,
		rails: [
			{ label: '+V', expectedV: 35, measuredV: 36 },
			{ label: '-V', expectedV: -35, measuredV: -34 }
		],
		dcOffsetMv: [5, -8],
		oscillationChecked: true,
		oscillationFound: false,
		idleCurrent: [{ label: 'ch1', expectedMa: 50, measuredMa: 55 }],
		heatSoak: { minutes: 30, sinkC: 55 },
		...over
	});
const ids = (d: BringupSpec) => deriveBringup(d).checks.map((c) => `${c.id}:${c.level}`);

describe('bring-up block (thresholds: common practice, no single source)', () => {
	it('a clean first power-up fires nothing', () => {
		const { derived, checks } = deriveBringup(parse());
		expect(checks).toEqual([]);
		expect(derived.maxRailDeviationPct).toBeCloseTo(100 / 35, 9);
		expect(derived.maxIdleDeviationPct).toBeCloseTo(10, 9);
	});
	it('bringup.no-current-limit: caution without a current-limited first start, with a caution text', () => {
		const c = deriveBringup(parse({ currentLimited: false })).checks[0];
		expect(c).toMatchObject({ id: 'bringup.no-current-limit', level: 'caution' });
		expect(c.caution).toMatch(/licensed practice/);
	});
	it('bringup.rail-mismatch: silent at 10 %, caution above, danger for reversed polarity', () => {
		expect(ids(parse({ rails: [{ expectedV: 35, measuredV: 38.5 }] }))).toEqual([]);
		expect(ids(parse({ rails: [{ expectedV: 35, measuredV: 38.6 }] }))).toEqual(['bringup.rail-mismatch:caution']);
		expect(ids(parse({ rails: [{ expectedV: -35, measuredV: -31.4 }] }))).toEqual(['bringup.rail-mismatch:caution']);
		const rev = deriveBringup(parse({ rails: [{ label: '-V', expectedV: -35, measuredV: 35 }] })).checks[0];
		expect(rev).toMatchObject({ id: 'bringup.rail-mismatch', level: 'danger', values: { rail: '-V' } });
	});
	it('bringup.offset: > 50 mV caution, > 100 mV danger', () => {
		expect(ids(parse({ dcOffsetMv: [50] }))).toEqual([]);
		expect(ids(parse({ dcOffsetMv: [-51] })).filter((i) => i.startsWith('bringup.offset'))).toEqual(['bringup.offset:caution']);
		expect(ids(parse({ dcOffsetMv: [101] })).filter((i) => i.startsWith('bringup.offset'))).toEqual(['bringup.offset:danger']);
	});
	it('bringup.speaker-protection: note above 50 mV without DC protection (REFERENCE.md §7.4; common practice, no single source)', () => {
		expect(ids(parse({ dcOffsetMv: [50] }))).not.toContain('bringup.speaker-protection:note');
		expect(ids(parse({ dcOffsetMv: [-50.1] }))).toContain('bringup.speaker-protection:note');
		expect(ids(parse({ dcOffsetMv: [-50.1], speakerProtection: true }))).not.toContain('bringup.speaker-protection:note');
	});
	it('bringup.oscillation: danger when found, note when not checked', () => {
		expect(ids(parse({ oscillationFound: true }))).toEqual(['bringup.oscillation:danger']);
		expect(ids(parse({ oscillationChecked: false }))).toEqual(['bringup.oscillation:note']);
	});
	it('bringup.idle-current: silent at +20 %, caution above, danger above 2 × expected', () => {
		expect(ids(parse({ idleCurrent: [{ expectedMa: 50, measuredMa: 60 }] }))).toEqual([]);
		expect(ids(parse({ idleCurrent: [{ expectedMa: 50, measuredMa: 60.1 }] }))).toEqual(['bringup.idle-current:caution']);
		expect(ids(parse({ idleCurrent: [{ expectedMa: 50, measuredMa: 100 }] }))).toEqual(['bringup.idle-current:caution']);
		expect(ids(parse({ idleCurrent: [{ expectedMa: 50, measuredMa: 101 }] }))).toEqual(['bringup.idle-current:danger']);
	});
	it('bringup.heat-soak: note above 70 °C at the sink', () => {
		expect(ids(parse({ heatSoak: { minutes: 60, sinkC: 70 } }))).toEqual([]);
		expect(ids(parse({ heatSoak: { minutes: 60, sinkC: 71 } }))).toEqual(['bringup.heat-soak:note']);
	});
	it('schema: defaults for lists, 0 V expectation rejected at its path', () => {
		expect(bringupSpec.parse({ currentLimited: true })).toMatchObject({ rails: [], dcOffsetMv: [], idleCurrent: [], oscillationChecked: false });
		expect(bringupSpec.safeParse({ currentLimited: true, rails: [{ expectedV: 0, measuredV: 1 }] }).error!.issues[0]).toMatchObject({
			code: 'custom',
			path: ['rails', 0, 'expectedV']
		});
	});
});
