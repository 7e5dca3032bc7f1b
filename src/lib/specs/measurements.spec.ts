import { describe, expect, it } from 'vitest';
import { deriveMeasurements, measurementsSpec, type MeasurementsSpec } from './measurements';

const parse = (over: Record<string, unknown> = {}): MeasurementsSpec => measurementsSpec.parse({ dcOffsetMv: [3, -5], ...over });
const ids = (d: MeasurementsSpec) => deriveMeasurements(d).checks.map((c) => `${c.id}:${c.level}`);
const offset = (d: MeasurementsSpec) => ids(d).filter((i) => i.startsWith('measure.dc-offset'));

describe('measurements block', () => {
	it('measure.dc-offset: > 50 mV caution, > 100 mV danger; silent at exactly 50 (REFERENCE.md §7.4, common practice)', () => {
		expect(ids(parse({ dcOffsetMv: [50, -50] }))).toEqual([]);
		expect(offset(parse({ dcOffsetMv: [50.1] }))).toEqual(['measure.dc-offset:caution']);
		expect(offset(parse({ dcOffsetMv: [3, -100] }))).toEqual(['measure.dc-offset:caution']);
		expect(offset(parse({ dcOffsetMv: [3, -100.1] }))).toEqual(['measure.dc-offset:danger']);
		const c = deriveMeasurements(parse({ dcOffsetMv: [60, -120] })).checks[0];
		expect(c.values).toMatchObject({ channel: 2, offsetMv: -120, channelsOver: 2 });
	});
	it('measure.speaker-protection: note above 50 mV, the top of the “good” range (REFERENCE.md §7.4; common practice, no single source)', () => {
		expect(ids(parse({ dcOffsetMv: [50, -50] }))).not.toContain('measure.speaker-protection:note');
		expect(ids(parse({ dcOffsetMv: [3, -50.1] }))).toContain('measure.speaker-protection:note');
		expect(ids(parse({ dcOffsetMv: [3, -50.1], speakerProtection: true }))).not.toContain('measure.speaker-protection:note');
		// Protection stated on the build's amplifier block counts too.
		expect(deriveMeasurements(parse({ dcOffsetMv: [80] }), true).checks.map((c) => c.id)).not.toContain('measure.speaker-protection');
	});
	it('derives the clipping power (≤ 1 % THD), the largest power, −3 dB points and SNR re 1 W', () => {
		const { derived } = deriveMeasurements(
			parse({
				points: {
					thd: [
						{ powerW: 1, thdPct: 0.01 },
						{ powerW: 50, thdPct: 0.05 },
						{ powerW: 64, thdPct: 1 },
						{ powerW: 70, thdPct: 10 }
					],
					response: [
						{ freqHz: 20, db: -3 },
						{ freqHz: 1000, db: 0 },
						{ freqHz: 20000, db: -3 }
					]
				},
				noiseUv: 100,
				loadOhm: 8
			})
		);
		expect(derived.clipPowerW).toBe(64);
		expect(derived.maxMeasuredPowerW).toBe(70);
		expect(derived.responseLowHz).toBeCloseTo(20, 9);
		expect(derived.responseHighHz).toBeCloseTo(20000, 6);
		expect(Math.abs(derived.snr1WDb! - 89.03)).toBeLessThan(0.01); // REFERENCE.md §12 case 12
		expect(derived.maxAbsOffsetMv).toBe(5);
	});
	it('optional parts may be absent', () => {
		expect(deriveMeasurements(parse()).derived).toMatchObject({ clipPowerW: null, responseLowHz: null, snr1WDb: null });
	});
	it('schema: at least one channel; numbers only', () => {
		expect(measurementsSpec.safeParse({ dcOffsetMv: [] }).error!.issues[0]).toMatchObject({ code: 'too_small' });
		expect(measurementsSpec.safeParse({ dcOffsetMv: 'x' }).error!.issues[0]).toMatchObject({ code: 'invalid_type' });
		expect(measurementsSpec.safeParse({ dcOffsetMv: [1, 'x'] }).error!.issues[0].path).toEqual(['dcOffsetMv', 1]);
	});
});
