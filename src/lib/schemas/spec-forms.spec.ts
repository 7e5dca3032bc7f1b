import { describe, expect, it } from 'vitest';
import { specSchemas } from '$lib/specs';
import { AMP_FORM, SUPPLY_FORM, SUPPLY_FORM_CHANGES, supplyBlock } from '$lib/specs/fixtures';
import { eachSideValue, fieldName, formToSpecData, mapSpecIssues, pointsShape, readNumber, readRows, specDataToForm, valueToText } from './spec-forms';

const amp = {
	...AMP_FORM,
	gain__ciF: '',
	input__rOhm: '',
	input__cF: '',
	claimed__powerW: '',
	claimed__thdPct: ''
};

describe('readNumber', () => {
	it('reads plain numbers, SI prefixes, decimal commas and a trailing unit', () => {
		expect(readNumber('35')).toBe(35);
		expect(readNumber('-12.5')).toBe(-12.5);
		expect(readNumber('0,47')).toBe(0.47);
		expect(readNumber('20k', 'Hz')).toBe(20000);
		expect(readNumber('1.5 A', 'A')).toBe(1.5);
		expect(readNumber('0.01 %')).toBe(0.01);
		expect(readNumber('abc')).toBeNull();
	});
});

describe('formToSpecData', () => {
	it('turns trade notation into SI block data the schema accepts', () => {
		const { data, issues } = formToSpecData('amplifier', amp);
		expect(issues).toEqual([]);
		expect(data).toMatchObject({ channels: 2, railV: 28, loadOhm: 8, device: { minLoadOhm: 4 }, gain: { rfOhm: 22000, riOhm: 680 }, input: null, claimed: null });
		expect(specSchemas.amplifier.safeParse(data).success).toBe(true);
	});

	it('reads capacitance like 10000u for a supply reservoir, and a blank fuse group as no fuse', () => {
		const { data } = formToSpecData('supply', {
			mainsVac: '230', mainsHz: '50', transformerVA: '160', secondaryVac: '20', regulationPct: '', mainsHighPct: '', mainsPowered: 'on',
			rectifier: 'bridge-split', diodeDropV: '', reservoirF: '10000u', capRatingV: '35', loadCurrentA: '1.5', amplifierDemandW: '',
			fuse__ratingA: '', fuse__type: '', chassis: 'metal', protectiveEarth: 'on', doubleInsulated: '', bleeder: 'none', bleeder__ohm: ''
		});
		expect(data.reservoirF).toBeCloseTo(0.01, 12);
		expect(data.fuse).toBeNull();
		expect(data).toMatchObject({ protectiveEarth: true, doubleInsulated: false, mainsPowered: true, bleeder: null });
	});

	it('the end-to-end supply form reads back as the supply fixture with its stated changes (one fixture set)', () => {
		const { kind: _k, id: _i, title: _t, ...fields } = SUPPLY_FORM;
		const { data, issues } = formToSpecData('supply', fields);
		expect(issues).toEqual([]);
		expect(specSchemas.supply.parse(data)).toEqual(specSchemas.supply.parse(supplyBlock(SUPPLY_FORM_CHANGES)));
	});

	it('a rail labelled each side ± takes ±30, +-30, +/-30 and 30 as 30 V and shows it back as typed', () => {
		for (const typed of ['±30', '+-30', '+/-30', '30', ' ± 30 V']) {
			const { data, issues } = formToSpecData('amplifier', { ...amp, railV: typed });
			expect(issues, typed).toEqual([]);
			expect(data.railV, typed).toBe(30);
			const parsed = specSchemas.amplifier.parse(data);
			expect(specDataToForm('amplifier', parsed).railV, typed).toBe(typed.trim());
		}
		expect(eachSideValue('±-30')).toBeNull();
		expect(formToSpecData('amplifier', { ...amp, railV: '±thirty' }).issues[0]).toMatchObject({ field: 'railV', message: expect.stringMatching(/write ±30/) });
		// A stored railText that no longer reads as railV (changed through the API) is not shown.
		expect(specDataToForm('amplifier', specSchemas.amplifier.parse({ ...formToSpecData('amplifier', amp).data, railText: '±40' })).railV).toBe('28');
	});

	it('names a field that is not even a number, without guessing', () => {
		const { issues } = formToSpecData('amplifier', { ...amp, railV: 'lots', loadOhm: 'eight' });
		expect(issues.map((i) => i.field).sort()).toEqual(['loadOhm', 'railV']);
	});

	it('reads measurement points with their textarea lines and reports a bad line by number', () => {
		const { data, issues, lineMaps } = formToSpecData('measurements', {
			dcOffsetMv: '12, -8', noiseUv: '', idleCurrentMa: '', loadOhm: '',
			points__response: 'frequency,dB\n20,-0.5\n\n1k,0\n20k,-0.3',
			points__thd: 'power,THD\n1,0.01\nten,0.02'
		});
		expect((data.points as { response: unknown[] }).response).toEqual([
			{ freqHz: 20, db: -0.5 },
			{ freqHz: 1000, db: 0 },
			{ freqHz: 20000, db: -0.3 }
		]);
		expect(lineMaps['points.response']).toEqual([2, 4, 5]);
		expect(issues).toEqual([{ field: 'points__thd', message: 'line 3: "ten" is not a number (power (W))' }]);
	});
});

describe('mapSpecIssues', () => {
	it('puts schema issues on their fields, and list issues on their textarea line', () => {
		const { data, lineMaps } = formToSpecData('measurements', {
			dcOffsetMv: '12', noiseUv: '', idleCurrentMa: '', loadOhm: '',
			points__response: 'frequency,dB\n20,-0.5\n\n1k,900',
			points__thd: ''
		});
		const parsed = specSchemas.measurements.safeParse(data);
		expect(parsed.success).toBe(false);
		const issues = parsed.success ? [] : parsed.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
		const mapped = mapSpecIssues('measurements', issues, lineMaps);
		expect(mapped).toEqual([{ field: 'points__response', message: 'line 4: level (dB) must be at most 200 dB' }]);
	});

	it('maps nested paths to their flat input names', () => {
		expect(mapSpecIssues('amplifier', [{ path: 'device.dropoutV', message: 'must be less than the rail voltage (28 V)' }])).toEqual([
			{ field: fieldName('device.dropoutV'), message: 'must be less than the rail voltage (28 V)' }
		]);
	});
});

describe('specDataToForm', () => {
	it('shows stored values in the trade notation and reads back to the same data', () => {
		const { data } = formToSpecData('amplifier', amp);
		const text = specDataToForm('amplifier', data);
		expect(text.gain__rfOhm).toBe('22k');
		expect(text.loadOhm).toBe('8R');
		expect(formToSpecData('amplifier', text).data).toEqual(data);
		expect(valueToText(0.01, 'capacitance')).toBe('10000u');
	});
});

describe('points CSV shapes', () => {
	it('tells frequency,dB from power,THD by the header', () => {
		expect(pointsShape('frequency,dB\n20,-1')).toBe('response');
		expect(pointsShape('Power (W);THD (%)\n1;0.1')).toBe('thd');
		expect(pointsShape('20,-1\n30,-0.5')).toBeNull();
	});

	it('counts wrong column counts per line', () => {
		const r = readRows('frequency,dB\n20\n30,1,2', ['frequency (Hz)', 'level (dB)'], 'x');
		expect(r.issues.map((i) => i.message)).toEqual([
			'line 2: expected 2 values (frequency (Hz), level (dB)), found 1',
			'line 3: expected 2 values (frequency (Hz), level (dB)), found 3'
		]);
	});
});
