import { describe, it, expect } from 'vitest';
import { blocksOfForm, builtItForm, fieldOfIssue, figuresOf, parseThdPoints, referenceFigures } from './built-it';
import { deriveMeasurements, measurementsSpec } from '$lib/specs/measurements';
import { bringupSpec, deriveBringup } from '$lib/specs/bringup';

describe('the "I built this too" form', () => {
	it('reads lists of numbers and THD points as the trade writes them', () => {
		expect(parseThdPoints('1@0.02, 20 W @ 0.05 %; 42@1')).toEqual([
			{ powerW: 1, thdPct: 0.02 },
			{ powerW: 20, thdPct: 0.05 },
			{ powerW: 42, thdPct: 1 }
		]);
		expect(parseThdPoints('forty at one')).toBeNull();
		const f = builtItForm.parse({ railsExpectedV: '28, -28', railsMeasuredV: '+27.6 -27.8', dcOffsetMv: '12, -8', thdPoints: '42@1', loadOhm: '8' });
		expect(f).toMatchObject({ railsExpectedV: [28, -28], railsMeasuredV: [27.6, -27.8], dcOffsetMv: [12, -8], loadOhm: 8, currentLimited: false });
	});

	it('refuses with a sentence at the field: unreadable numbers, unmatched rails, nothing measured', () => {
		const bad = builtItForm.safeParse({ railsExpectedV: '28, -28', railsMeasuredV: '27.6' });
		expect(bad.success).toBe(false);
		expect(bad.error!.issues.map((i) => [i.path.join('.'), i.message])).toEqual([
			['railsMeasuredV', 'give one measured value for each expected rail (2 expected, 1 measured)']
		]);
		expect(builtItForm.safeParse({ dcOffsetMv: 'twelve' }).error!.issues[0]).toMatchObject({ path: ['dcOffsetMv'], message: expect.stringContaining('as numbers separated by commas') });
		expect(builtItForm.safeParse({}).error!.issues[0].message).toBe('give at least one figure you measured: rails, DC offset or distortion points');
		expect(builtItForm.safeParse({ thdPoints: '42@1' }).error!.issues[0]).toMatchObject({ path: ['dcOffsetMv'] });
	});

	it('makes blocks that pass their own schemas, and figures the derive functions work out', () => {
		const f = builtItForm.parse({ currentLimited: 'on', railsExpectedV: '28, -28', railsMeasuredV: '27.6, -27.8', dcOffsetMv: '12, -64', thdPoints: '10@0.02, 38@0.5, 42@1, 45@10', loadOhm: '8' });
		const blocks = blocksOfForm(f);
		expect(blocks.map((b) => b.kind)).toEqual(['bringup', 'measurements']);
		const bu = bringupSpec.parse(blocks[0].data);
		const me = measurementsSpec.parse(blocks[1].data);
		const stored = [
			{ kind: 'bringup', data: blocks[0].data, ...deriveBringup(bu) },
			{ kind: 'measurements', data: blocks[1].data, ...deriveMeasurements(me) }
		];
		const fig = figuresOf(stored);
		// Power at 1 % THD: the highest measured point at or below 1 % (the clipping convention, common practice) = 42 W.
		expect(fig.clipPowerW).toBe(42);
		// Worst channel |−64 mV| = 64 mV; 64 mV is above the 50 mV caution of the measurements block (common practice).
		expect(fig.maxAbsOffsetMv).toBe(64);
		expect(fig.railsMeasuredV).toEqual([27.6, -27.8]);
		expect(fig.caution).toBeGreaterThan(0);
		expect(fig.loadOhm).toBe(8);
	});

	it('maps block issues to form fields', () => {
		expect(fieldOfIssue('bringup', 'rails.1.measuredV')).toBe('railsMeasuredV');
		expect(fieldOfIssue('bringup', 'rails.0.expectedV')).toBe('railsExpectedV');
		expect(fieldOfIssue('measurements', 'points.thd.0.thdPct')).toBe('thdPoints');
		expect(fieldOfIssue('measurements', 'loadOhm')).toBe('loadOhm');
	});

	it("takes the original's reference figures: per-side rail, measured clip power over the claim", () => {
		expect(referenceFigures([{ kind: 'amplifier', data: { railV: 48, supply: 'single', claimed: { powerW: 30 } }, derived: { maxPowerW: 27 } }])).toEqual({
			railV: 24,
			powerW: 30,
			offsetMv: null
		});
		expect(
			referenceFigures([
				{ kind: 'amplifier', data: { railV: 28, supply: 'split' }, derived: { maxPowerW: 39 } },
				{ kind: 'measurements', data: {}, derived: { clipPowerW: 36, maxAbsOffsetMv: 9 } }
			])
		).toEqual({ railV: 28, powerW: 36, offsetMv: 9 });
	});
});
