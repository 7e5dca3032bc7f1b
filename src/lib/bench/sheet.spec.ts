import { describe, it, expect } from 'vitest';
import { benchSheet, bringupBoxes, kitGroups, type SheetPart } from './sheet';
import { amplifierBlock, supplyBlock } from '$lib/specs/fixtures';
import { deriveSupply, supplySpec } from '$lib/specs/supply';
import { parsePartValue } from '$lib/parts/values';

const part = (kind: string, text: string, over: Partial<SheetPart> = {}): SheetPart => {
	const vk = kind === 'resistor' ? 'resistance' : kind === 'capacitor' ? 'capacitance' : null;
	const p = vk ? parsePartValue(text, vk) : null;
	return { designators: '', quantity: 1, kind, valueText: text, value: p?.value ?? null, unit: p?.unit ?? null, tolerancePct: null, ratingV: null, ratingW: null, package: '', notes: '', ...over };
};

describe('bench sheet', () => {
	it('groups parts for kitting by kind, smallest value first, with counts', () => {
		const kits = kitGroups([
			part('capacitor', '100n', { quantity: 4, ratingV: 63 }),
			part('resistor', '22k', { quantity: 2, designators: 'R1, R2', tolerancePct: 1 }),
			part('ic', '5-pin power amplifier IC', { package: 'TO-220' }),
			part('resistor', '0R22', { quantity: 2, ratingW: 5 })
		]);
		expect(kits.map((k) => [k.label, k.count])).toEqual([
			['Resistor', 4],
			['Capacitor', 4],
			['IC', 1]
		]);
		// 0R22 = 0.22 Ω (IEC 60062 RKM code) sorts before 22 kΩ; values read to three significant figures, the one rounding of every display.
		expect(kits[0].lines.map((l) => [l.value, l.rating])).toEqual([
			['220 mΩ', '5 W'],
			['22.0 kΩ', '±1 %']
		]);
		expect(kits[1].lines[0].rating).toBe('63 V');
	});

	it('asks for each stated rail and each channel’s DC offset as boxes to fill in', () => {
		const boxes = bringupBoxes([{ kind: 'amplifier', data: amplifierBlock({ railV: 28 }), derived: {}, checks: [] }]);
		expect(boxes).toEqual([
			{ what: 'Positive rail', expect: '+28 V', unit: 'V' },
			{ what: 'Negative rail', expect: '−28 V', unit: 'V' },
			{ what: 'DC offset, channel 1 (no speaker)', expect: 'within ±50 mV', unit: 'mV' },
			{ what: 'DC offset, channel 2 (no speaker)', expect: 'within ±50 mV', unit: 'mV' }
		]);
		// A bring-up block's own expectations win over the amplifier's rails.
		const own = bringupBoxes([
			{ kind: 'amplifier', data: amplifierBlock(), derived: {}, checks: [] },
			{ kind: 'bringup', data: { rails: [{ label: 'V+', expectedV: 35, measuredV: 35 }], dcOffsetMv: [1], idleCurrent: [{ label: 'stage', expectedMa: 40, measuredMa: 40 }] }, derived: {}, checks: [] }
		]);
		expect(own.map((b) => b.what)).toEqual(['Rail V+', 'DC offset, channel 1 (no speaker)', 'Idle current stage']);
	});

	it('states the supply rail off load from the supply block (√2·Vac·(1 + regulation) − drops)', () => {
		const data = supplySpec.parse(supplyBlock());
		const derived = deriveSupply(data).derived;
		const boxes = bringupBoxes([{ kind: 'supply', data: data as Record<string, unknown>, derived, checks: [] }]);
		// 25 V secondary, 7 % regulation, one 0.8 V drop per rail (bridge-split): √2·25·1.07 − 0.8 = 37.03 V (hand calculation).
		const offLoad = boxes.find((b) => b.what.startsWith('Rail off load'))!;
		expect(offLoad.expect).toBe(`about +${Number((Math.SQRT2 * 25 * 1.07 - 0.8).toPrecision(3))} V`);
		expect(boxes[0].what).toBe('Positive rail, loaded');
	});

	it('puts the mains caution first, each check caution once, and the danger checks before cautions', () => {
		const s = benchSheet({
			title: 'Amp',
			slug: 'amp',
			url: 'https://starground.test/builds/amp',
			makerName: 'Maker',
			revision: 2,
			mainsPowered: true,
			specBlocks: [
				{
					kind: 'supply',
					data: {},
					derived: {},
					checks: [
						{ level: 'caution', message: 'c1', caution: 'Charge!' },
						{ level: 'danger', message: 'd1', caution: 'Charge!' },
						{ level: 'note', message: 'n1' }
					]
				}
			],
			parts: []
		});
		expect(s.subtitle).toBe('by Maker · Rev B');
		expect(s.cautions[0]).toMatch(/^Mains powered\./);
		expect(s.cautions.filter((c) => c === 'Charge!')).toHaveLength(1);
		expect(s.warnings).toEqual([
			{ level: 'danger', message: 'd1' },
			{ level: 'caution', message: 'c1' }
		]);
		expect(s.before).toContain('Protective earth continuity measured from the mains inlet to the chassis');
	});
});
