import { describe, expect, it } from 'vitest';
import {
	designatorCount,
	deviationPct,
	emptyDraft,
	formatDeviation,
	insideTolerance,
	lineToDraft,
	normaliseKind,
	normaliseLine,
	normaliseLines,
	parsePartValue,
	valueKindOf,
	type PartLineDraft
} from './index';

const draft = (over: Partial<PartLineDraft>): PartLineDraft => ({ ...emptyDraft(), ...over });

describe('parsePartValue', () => {
	it('reads RKM codes and SI prefixes per kind', () => {
		expect(parsePartValue('4k7', 'resistance').value).toBe(4700);
		expect(parsePartValue('2R2', 'resistance').value).toBe(2.2);
		expect(parsePartValue('100n', 'capacitance').value).toBeCloseTo(1e-7, 15);
		expect(parsePartValue('0.47u', 'capacitance').value).toBeCloseTo(4.7e-7, 15);
		expect(parsePartValue('10uH', 'inductance')).toMatchObject({ unit: 'H', value: 1e-5 });
	});

	it('reads two parts joined by + as a series network (capacitors: reciprocal sum)', () => {
		const p = parsePartValue('1u+1u', 'capacitance');
		expect(p.value).toBeCloseTo(5e-7, 15);
		expect(p).toMatchObject({ parts: 2, arrangement: 'series', unit: 'F' });
	});

	it('reads || as parallel and binds it tighter than +', () => {
		expect(parsePartValue('10k||10k', 'resistance')).toMatchObject({ value: 5000, parts: 2, arrangement: 'parallel' });
		// 1 k in series with (10 k ∥ 10 k) = 6 k; a left-to-right reading would give 5.5 k or 11 k ∥ …
		expect(parsePartValue('1k + 10k||10k', 'resistance')).toMatchObject({ value: 6000, parts: 3, arrangement: 'mixed' });
		expect(parsePartValue('1u || 1u', 'capacitance').value).toBeCloseTo(2e-6, 15);
	});

	it('takes a voltage rating and a tolerance after the value', () => {
		expect(parsePartValue('100u/63V', 'capacitance')).toMatchObject({ ratingV: 63, parts: 1 });
		expect(parsePartValue('4k7 1%', 'resistance')).toMatchObject({ value: 4700, tolerancePct: 1 });
		expect(parsePartValue('470u 35V ±20%', 'capacitance')).toMatchObject({ ratingV: 35, tolerancePct: 20 });
	});

	it('reads 0R and link as a zero-ohm jumper', () => {
		expect(parsePartValue('0R', 'resistance').value).toBe(0);
		expect(parsePartValue('link', 'resistance').value).toBe(0);
	});

	it('refuses unreadable values and dangling network operators with a reason', () => {
		expect(() => parsePartValue('banana', 'capacitance')).toThrow(/Cannot read "banana"/);
		expect(() => parsePartValue('1u+', 'capacitance')).toThrow(/"\+" needs a value on both sides/);
		expect(() => parsePartValue('10k||', 'resistance')).toThrow(/"\|\|" needs a value on both sides/);
		expect(() => parsePartValue('4k7', 'capacitance')).toThrow(RangeError);
	});
});

describe('deviation and tolerance', () => {
	it('two 1 µF in series fitted for 0.47 µF: +6.4 %, inside ±10 % (PRODUCT.md §4.4)', () => {
		const fitted = parsePartValue('1u+1u', 'capacitance').value;
		const design = parsePartValue('0.47u', 'capacitance').value;
		const dev = deviationPct(fitted, design)!;
		expect(dev).toBeCloseTo((100 * (0.5 - 0.47)) / 0.47, 9);
		expect(formatDeviation(dev)).toBe('+6.4 %');
		expect(insideTolerance(dev, 10)).toBe(true);
		expect(insideTolerance(dev, 5)).toBe(false);
	});

	it('is null without a design value or with a zero design value', () => {
		expect(deviationPct(100, null)).toBeNull();
		expect(deviationPct(100, 0)).toBeNull();
		expect(insideTolerance(3, null)).toBeNull();
	});

	it('formats negative deviations with a minus sign', () => {
		expect(formatDeviation(deviationPct(4300, 4700)!)).toBe('−8.5 %');
	});
});

describe('kinds', () => {
	it('maps part kinds to value kinds; other kinds keep text', () => {
		expect(valueKindOf('resistor')).toBe('resistance');
		expect(valueKindOf('capacitor')).toBe('capacitance');
		expect(valueKindOf('inductor')).toBe('inductance');
		expect(valueKindOf('ic')).toBeNull();
		expect(normaliseKind('Cap')).toBe('capacitor');
		expect(normaliseKind('widget')).toBeNull();
	});

	it('counts designators with ranges', () => {
		expect(designatorCount('R1, R2')).toBe(2);
		expect(designatorCount('R1-R4')).toBe(4);
		expect(designatorCount('C3–C5 C9')).toBe(4);
	});
});

describe('normaliseLine', () => {
	it('normalises a substitution line and computes its deviation', () => {
		const r = normaliseLine(draft({ designators: 'C3', kind: 'capacitor', value: '1u+1u', designValue: '0.47u', tolerance: '10', reason: 'had two 1 µF film caps' }), 4);
		expect(r.errors).toEqual([]);
		expect(r.line).toMatchObject({ kind: 'capacitor', unit: 'F', tolerancePct: 10, designValueText: '0.47u', substitutionReason: 'had two 1 µF film caps' });
		expect(r.line!.value).toBeCloseTo(5e-7, 15);
		expect(r.line!.deviationPct).toBeCloseTo(6.383, 3);
		expect(r.line!.checks.map((c) => c.id)).toEqual([]);
	});

	it('keeps text values for kinds without a value quantity', () => {
		const r = normaliseLine(draft({ designators: 'U1', kind: 'ic', value: '5-pin monolithic power amplifier IC' }), 1);
		expect(r.line).toMatchObject({ value: null, unit: null, valueText: '5-pin monolithic power amplifier IC' });
	});

	it('rejects an unparseable value with its line number and field', () => {
		const r = normaliseLine(draft({ designators: 'C9', kind: 'capacitor', value: '10 bananas' }), 7);
		expect(r.line).toBeUndefined();
		expect(r.errors).toHaveLength(1);
		expect(r.errors[0]).toMatchObject({ line: 7, field: 'value' });
		expect(r.errors[0].message).toMatch(/cannot read the value/);
	});

	it('reports every bad field of a line', () => {
		const r = normaliseLine(draft({ kind: 'gizmo', quantity: 'two', tolerance: 'loose', ratingV: 'high' }), 2);
		expect(r.errors.map((e) => e.field).sort()).toEqual(['kind', 'quantity', 'ratingV', 'tolerance']);
	});

	it('refuses a rating given twice with different numbers', () => {
		const r = normaliseLine(draft({ kind: 'capacitor', value: '100u/63V', ratingV: '35' }), 1);
		expect(r.errors[0]).toMatchObject({ field: 'ratingV' });
	});

	it('reads power ratings as fractions and milliwatts', () => {
		expect(normaliseLine(draft({ kind: 'resistor', value: '10k', ratingW: '1/4 W' }), 1).line!.ratingW).toBe(0.25);
		expect(normaliseLine(draft({ kind: 'resistor', value: '10k', ratingW: '600mW' }), 1).line!.ratingW).toBeCloseTo(0.6, 12);
	});
});

describe('checks on substitutions', () => {
	it('cautions when a jumper replaces a resistor', () => {
		const r = normaliseLine(draft({ designators: 'R8', kind: 'jumper', value: '', designValue: '2R2', reason: 'lost the resistor' }), 1);
		const c = r.line!.checks.find((x) => x.id === 'part.jumper-substitution');
		expect(c?.level).toBe('caution');
		expect(c?.values.designValueOhm).toBe(2.2);
	});

	it('also catches 0R typed in a resistor line', () => {
		const r = normaliseLine(draft({ designators: 'R8', kind: 'resistor', value: '0R', designValue: '10R', reason: 'x' }), 1);
		expect(r.line!.checks.map((c) => c.id)).toContain('part.jumper-substitution');
	});

	it('is a danger when a link replaces a fuse', () => {
		const r = normaliseLine(draft({ designators: 'F2', kind: 'jumper', designValue: 'T2A fuse', reason: 'none in stock' }), 1);
		expect(r.line!.checks.find((x) => x.id === 'part.jumper-substitution')?.level).toBe('danger');
	});

	it('cautions when the fitted voltage rating is below the design rating, danger when the rail is between them', () => {
		const base = { designators: 'C1', kind: 'capacitor', value: '100u', ratingV: '25', designValue: '100u/50V', reason: 'on hand' };
		const noRail = normaliseLine(draft(base), 1).line!;
		expect(noRail.checks.find((c) => c.id === 'part.rating-below-rail')?.level).toBe('caution');
		const rail = normaliseLine(draft(base), 1, { railV: 35 }).line!;
		const c = rail.checks.find((x) => x.id === 'part.rating-below-rail');
		expect(c?.level).toBe('danger');
		expect(c?.values).toMatchObject({ ratingV: 25, designRatingV: 50, railV: 35 });
		const low = normaliseLine(draft(base), 1, { railV: 12 }).line!;
		expect(low.checks.find((x) => x.id === 'part.rating-below-rail')?.level).toBe('caution');
	});

	it('notes a substitution outside tolerance and one without a reason', () => {
		const r = normaliseLine(draft({ designators: 'R3', kind: 'resistor', value: '5k6', designValue: '4k7', tolerance: '5' }), 1);
		expect(r.line!.checks.map((c) => c.id).sort()).toEqual(['part.no-reason', 'part.outside-tolerance']);
	});

	it('notes a quantity that does not match the designators', () => {
		const r = normaliseLine(draft({ designators: 'R1, R2, R3', quantity: '2', kind: 'resistor', value: '1k' }), 1);
		expect(r.line!.checks.find((c) => c.id === 'part.qty-mismatch')?.values).toMatchObject({ designatorCount: 3, quantity: 2 });
	});
});

describe('normaliseLines', () => {
	it('returns the errors of every bad line with the numbers given, and no lines to save', () => {
		const r = normaliseLines(
			[draft({ kind: 'resistor', value: '4k7' }), draft({ kind: 'capacitor', value: 'xyz' }), draft({ kind: 'resistor', value: '' })],
			{},
			[2, 3, 4]
		);
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.errors.map((e) => e.line)).toEqual([3, 4]);
	});

	it('round-trips a normalised line through lineToDraft', () => {
		const first = normaliseLine(draft({ designators: 'C3', kind: 'capacitor', value: '100u/63V', designValue: '220u/63V', tolerance: '20', reason: 'space' }), 1).line!;
		const again = normaliseLine(lineToDraft(first), 1).line!;
		expect(again).toEqual(first);
	});
});

describe('potentiometer markings in a parts list', () => {
	// Value code as IEC 60062's three-digit code in ohms: 103 = 10 × 10³ Ω (REFERENCE.md §6.3).
	it('reads "A103" on a potentiometer line as 10 kΩ and keeps the marking as typed', () => {
		const r = normaliseLines([{ ...emptyDraft(), designators: 'VR1', kind: 'potentiometer', value: 'A103' }]);
		expect(r.ok).toBe(true);
		if (r.ok) {
			expect(r.lines[0].value).toBe(10_000);
			expect(r.lines[0].valueText).toBe('A103');
		}
	});
	it('still refuses a marking on a resistor line, with the line number', () => {
		const r = normaliseLines([{ ...emptyDraft(), designators: 'R1', kind: 'resistor', value: 'A103' }]);
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.errors[0]).toMatchObject({ line: 1, field: 'value' });
	});
});
