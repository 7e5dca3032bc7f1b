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
	AmbiguousPlusError,
	formatPartValue,
	valueAsTyped,
	partsCautions,
	valueKindOf,
	microSpellings,
	withMicroSign,
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

	it('reads two capacitors said to be in series as a series network (reciprocal sum) and says the reading', () => {
		// Two equal capacitors in series: C = C1·C2/(C1+C2) = 1 µF·1 µF / 2 µF = 0.5 µF (textbook series formula).
		for (const text of ['2×1u series', '1u+1u series']) {
			const p = parsePartValue(text, 'capacitance');
			expect(p.value).toBeCloseTo(5e-7, 15);
			expect(p).toMatchObject({ parts: 2, arrangement: 'series', unit: 'F', reading: 'two 1.00 µF in series = 500 nF' });
		}
		// Resistors add in series, which nobody reads otherwise: a bare + stays series there.
		expect(parsePartValue('10k+10k', 'resistance')).toMatchObject({ value: 20000, arrangement: 'series' });
	});

	it('asks which is meant for a bare + between capacitors, naming both forms', () => {
		let e: unknown;
		try {
			parsePartValue('1u+1u', 'capacitance');
		} catch (err) {
			e = err;
		}
		expect(e).toBeInstanceOf(AmbiguousPlusError);
		const a = e as AmbiguousPlusError;
		expect(a.choices).toEqual(['2×1u series', '1u||1u']);
		expect(a.message).toContain('2×1u series (two 1.00 µF in series = 500 nF)');
		expect(a.message).toContain('1u||1u (two 1.00 µF in parallel = 2.00 µF)');
		// Unequal parts: the series choice keeps the + and says "series"; 1 µF + 2 µF in parallel = 3 µF.
		expect(() => parsePartValue('1u+2u', 'capacitance')).toThrow(/1u\+2u series .*1u\|\|2u \(1.00 µF and 2.00 µF in parallel = 3.00 µF\)/);
		// Each rewrite reads back as what it says: 1/(1/1 + 1/2) µF = 0.667 µF; 1 + 2 = 3 µF.
		expect(parsePartValue('1u+2u series', 'capacitance').value).toBeCloseTo(2e-6 / 3, 15);
		expect(parsePartValue('1u+2u parallel', 'capacitance').value).toBeCloseTo(3e-6, 15);
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
		const fitted = parsePartValue('2×1u series', 'capacitance').value;
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
		const r = normaliseLine(draft({ designators: 'C3', kind: 'capacitor', value: '2×1u series', designValue: '0.47u', tolerance: '10', reason: 'had two 1 µF film caps' }), 4);
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

describe('bare digits per part kind (IEC 60062 three- and four-digit codes)', () => {
	it('reads a bare 104 on a capacitor line as the code in pF: 10 × 10⁴ pF = 100 nF, not 104 F', () => {
		const p = parsePartValue('104', 'capacitance');
		expect(p.value).toBeCloseTo(10 * 1e4 * 1e-12, 18);
		expect(p.codeReading).toContain('3-digit capacitor code: 10 × 10⁴ pF = 100 nF');
		// 4.7 nF = 47 × 10² pF; "229" = 22 × 0.1 pF = 2.2 pF (9 as the multiplier digit is ×0.1; from memory).
		expect(parsePartValue('472', 'capacitance').value).toBeCloseTo(4.7e-9, 18);
		expect(parsePartValue('229', 'capacitance').value).toBeCloseTo(2.2e-12, 20);
		// In a network and with a voltage after it.
		expect(parsePartValue('2×104', 'capacitance').value).toBeCloseTo(2e-7, 18);
		expect(parsePartValue('104 100V', 'capacitance')).toMatchObject({ ratingV: 100 });
	});

	it('refuses other bare numbers on a capacitor line, saying why', () => {
		expect(() => parsePartValue('470', 'capacitance')).toThrow(/no unit \(as a 3-digit code "470" would be 47.0 pF\): write it with one, e.g. 470p, 470n or 470u/);
		expect(() => parsePartValue('0.1', 'capacitance')).toThrow(/"0.1" on a capacitor line has no unit/);
		expect(() => parsePartValue('10', 'capacitance')).toThrow(/no unit/);
	});

	it('reads 104 on a resistor line as 100 kΩ (IEC 60062 three-digit code) and keeps 100, 47, 1000 as ohms', () => {
		// IEC 60062 three-digit code: two significant digits and a multiplier; 104 = 10 × 10⁴ Ω (worked by hand).
		const p = parsePartValue('104', 'resistance');
		expect(p.value).toBe(10 * 10 ** 4);
		expect(p.codeReading).toContain('for 104 Ω write 104R');
		expect(parsePartValue('472', 'resistance').value).toBe(4700);
		expect(parsePartValue('100', 'resistance').value).toBe(100);
		expect(parsePartValue('47', 'resistance').value).toBe(47);
		expect(parsePartValue('1000', 'resistance').value).toBe(1000);
		expect(parsePartValue('104R', 'resistance').value).toBe(104);
	});

	it('reads 4 bare digits on a resistor line as the IEC 60062 4-digit code: three significant digits and a multiplier', () => {
		// IEC 60062 (REFERENCE.md §6.1: three significant figures for close tolerances), worked by hand:
		// 4702 = 470 × 10² Ω = 47 000 Ω; 1001 = 100 × 10¹ Ω = 1 000 Ω; 2493 = 249 × 10³ Ω = 249 000 Ω (E96 value).
		const p = parsePartValue('4702', 'resistance');
		expect(p.value).toBe(470 * 10 ** 2);
		expect(p.codeReading).toBe('"4702" is read as the 4-digit resistor code (IEC 60062): 470 × 10² Ω = 47.0 kΩ; for 4702 Ω write 4702R.');
		expect(parsePartValue('1001', 'resistance').value).toBe(100 * 10 ** 1);
		expect(parsePartValue('2493', 'resistance').value).toBe(249 * 10 ** 3);
		// IEC 60062: 1004 = 100 × 10⁴ Ω = 1 MΩ.
		expect(parsePartValue('1004', 'resistance').value).toBe(1e6);
		// Ohms as written where the last digit is no multiplier 1–6 (as for 3 digits), and with the R written out.
		expect(parsePartValue('4702R', 'resistance').value).toBe(4702);
		expect(parsePartValue('2200', 'resistance').value).toBe(2200);
		// In a network: 1001 + 1001 = 1 kΩ + 1 kΩ = 2 kΩ (series resistors add).
		expect(parsePartValue('1001+1001', 'resistance').value).toBe(2000);
		// The same four digits are no capacitor code (4-digit codes are resistor codes, IEC 60062): refused with a sentence.
		expect(() => parsePartValue('4702', 'capacitance')).toThrow(/"4702" on a capacitor line has no unit: write it with one/);
	});

	it('never reads a bare number on an inductor line as henries: the 3-digit code in µH, else a sentence', () => {
		// Common marking practice (no single source; from memory): inductors carry the 3-digit code in µH,
		// 101 = 10 × 10¹ µH = 100 µH, 472 = 47 × 10² µH = 4.7 mH.
		const p = parsePartValue('101', 'inductance');
		expect(p.value).toBeCloseTo(100e-6, 15);
		expect(p.unit).toBe('H');
		expect(p.codeReading).toBe('"101" is read as the 3-digit inductor code in µH (common marking practice): 10 × 10¹ µH = 100 µH.');
		expect(parsePartValue('472', 'inductance').value).toBeCloseTo(4.7e-3, 15);
		// "100" would be 100 H as a plain number and 10 µH as the code: neither is guessed.
		expect(() => parsePartValue('100', 'inductance')).toThrow(
			'"100" on an inductor line has no unit (as a 3-digit inductor code "100" would be 10.0 µH): a bare number is not read as henries; write it with one, e.g. 100u for µH or 100m for mH'
		);
		expect(() => parsePartValue('4.7', 'inductance')).toThrow(/"4.7" on an inductor line has no unit: a bare number is not read as henries/);
		// With a unit or a multiplier letter it is read as written: 100u = 100 µH, 10uH = 10 µH, 1m5 = 1.5 mH (RKM).
		expect(parsePartValue('100u', 'inductance').value).toBeCloseTo(100e-6, 15);
		expect(parsePartValue('10uH', 'inductance').value).toBeCloseTo(10e-6, 15);
		expect(parsePartValue('1m5', 'inductance').value).toBeCloseTo(1.5e-3, 15);
		// Through a line: refused with the sentence on the value field, nothing stored.
		const r = normaliseLine(draft({ designators: 'L1', kind: 'inductor', value: '100' }), 4);
		expect(r.line).toBeUndefined();
		expect(r.errors).toEqual([expect.objectContaining({ line: 4, field: 'value', message: expect.stringContaining('is not read as henries') })]);
	});

	it('stores the reading as a note on the line, so a misreading shows', () => {
		const r = normaliseLine(draft({ designators: 'C5', kind: 'capacitor', value: '104' }), 1);
		expect(r.line!.value).toBeCloseTo(1e-7, 18);
		expect(r.line!.checks.map((c) => [c.id, c.level])).toEqual([['part.value-read-as-code', 'note']]);
	});
});

describe('AC voltage ratings (X/Y capacitors)', () => {
	it('accepts 275 V AC, 275VAC and 275 Vac and keeps them AC', () => {
		for (const t of ['275 V AC', '275VAC', '275 Vac', '275 V~']) {
			const r = normaliseLine(draft({ designators: 'CX1', kind: 'capacitor', value: '100n', ratingV: t }), 1);
			expect(r.errors).toEqual([]);
			expect(r.line).toMatchObject({ ratingV: 275, ratingVAc: true });
		}
		const inValue = normaliseLine(draft({ designators: 'CX1', kind: 'capacitor', value: '100n 275VAC' }), 1);
		expect(inValue.line).toMatchObject({ ratingV: 275, ratingVAc: true });
		const dc = normaliseLine(draft({ designators: 'C1', kind: 'capacitor', value: '100n', ratingV: '63 VDC' }), 1);
		expect(dc.line).toMatchObject({ ratingV: 63, ratingVAc: false });
		expect(lineToDraft({ ...inValue.line! }).ratingV).toBe('275 V AC');
	});

	it('never compares an AC rating with a DC rail as if it were DC, and says so', () => {
		// 275 V AC below a 400 V DC rail would read as "below the rail" if AC were taken for DC.
		const ac = normaliseLine(draft({ designators: 'CX1', kind: 'capacitor', value: '100n', ratingV: '275 V AC' }), 1, { railV: 400 });
		expect(ac.line!.checks.map((c) => [c.id, c.level])).toEqual([['part.ac-rating', 'note']]);
		expect(ac.line!.checks[0].message).toContain('is not compared with the 400 V DC rail as if it were DC');
		// The same number as DC, substituted below a DC design rating, still gets the usual caution.
		const dc = normaliseLine(draft({ designators: 'C1', kind: 'capacitor', value: '100n', ratingV: '275', designValue: '100n/400V', reason: 'on hand' }), 1, { railV: 350 });
		expect(dc.line!.checks.map((c) => c.id)).toContain('part.rating-below-rail');
		// AC fitted where the design gives AC: compared AC with AC.
		const both = normaliseLine(draft({ designators: 'CY1', kind: 'capacitor', value: '4n7', ratingV: '250 V AC', designValue: '4n7 300VAC', reason: 'on hand' }), 1);
		expect(both.line!.checks.find((c) => c.id === 'part.rating-below-rail')?.message).toContain('250 V AC, lower than the design’s 300 V AC'.replace('’', "'"));
	});
});

describe('formatPartValue and valueAsTyped: one display, 3 significant figures', () => {
	it('keeps 3 significant figures with trailing zeros (checked against Number.prototype.toPrecision)', () => {
		const cases: [number, string, string][] = [
			[4700, 'ohm', '4.70 kΩ'],
			[0.22, 'ohm', '220 mΩ'],
			[5e-7, 'F', '500 nF'],
			[0.01, 'F', '10.0 mF'],
			[999.6, 'ohm', '1.00 kΩ'],
			[1e-5, 'H', '10.0 µH'],
			[0, 'ohm', '0 Ω']
		];
		for (const [v, u, want] of cases) expect(formatPartValue(v, u)).toBe(want);
		// Oracle: the mantissa is the JavaScript engine's own 3-significant-figure rounding of the value.
		expect(formatPartValue(123456, 'ohm')).toBe(`${(123456 / 1000).toPrecision(3)} kΩ`);
	});

	it('shows a value as typed with its SI reading beside it', () => {
		expect(valueAsTyped({ valueText: '4k7', value: 4700, unit: 'ohm' })).toEqual({ typed: '4k7', si: '4.70 kΩ' });
		expect(valueAsTyped({ valueText: '0R22', value: 0.22, unit: 'ohm' })).toEqual({ typed: '0R22', si: '220 mΩ' });
		expect(valueAsTyped({ valueText: '10000u', value: 0.01, unit: 'F' })).toEqual({ typed: '10000u', si: '10.0 mF' });
		expect(valueAsTyped({ valueText: '500 nF', value: 5e-7, unit: 'F' })).toEqual({ typed: '500 nF', si: null });
		expect(valueAsTyped({ valueText: 'NPN power transistor', value: null, unit: null })).toEqual({ typed: 'NPN power transistor', si: null });
	});
});

describe('partsCautions: a caution said once per list', () => {
	it('names every line a shared caution concerns, once', () => {
		// Two capacitors substituted below their design rating share the same stored-charge caution.
		const a = normaliseLine(draft({ designators: 'C1', kind: 'capacitor', value: '100u', ratingV: '25', designValue: '100u/50V', reason: 'on hand' }), 1);
		const b = normaliseLine(draft({ designators: 'C2', kind: 'capacitor', value: '100u', ratingV: '25', designValue: '100u/50V', reason: 'on hand' }), 2);
		const r = partsCautions([a.line!, b.line!, { designators: 'R1', kind: 'resistor', checks: [] }]);
		expect(r).toHaveLength(1);
		expect(r[0].lines).toEqual(['C1', 'C2']);
		expect(r[0].text).toMatch(/defer to local codes/);
	});
});

describe('the micro sign: µ (U+00B5) and the Greek mu μ (U+03BC)', () => {
	const MICRO = '\u00b5';
	const MU = '\u03bc';
	it('reads both alike and stores values with the micro sign only', () => {
		// 4µ7 = 4.7 µF (RKM, IEC 60062: the letter stands for the decimal point); the same with either character.
		expect(parsePartValue(`4${MICRO}7`, 'capacitance').value).toBeCloseTo(4.7e-6, 15);
		expect(parsePartValue(`4${MU}7`, 'capacitance').value).toBeCloseTo(4.7e-6, 15);
		expect(parsePartValue(`2×10000${MU}`, 'capacitance').value).toBeCloseTo(2e-2, 12);
		const r = normaliseLine(draft({ designators: 'C1', kind: 'capacitor', value: `10000${MU}/63V`, designValue: `4${MU}7` }), 1);
		expect(r.line!.valueText).toBe(`10000${MICRO}/63V`);
		expect(r.line!.designValueText).toBe(`4${MICRO}7`);
		expect(r.line!.valueText.includes(MU)).toBe(false);
		// Shown as typed beside the SI reading, which is written with the micro sign.
		expect(valueAsTyped({ valueText: `4.70${MU}F`, value: 4.7e-6, unit: 'F' })).toEqual({ typed: `4.70${MU}F`, si: null });
		expect(valueAsTyped({ valueText: `4${MU}7`, value: 4.7e-6, unit: 'F' })).toEqual({ typed: `4${MU}7`, si: `4.70 ${MICRO}F` });
		expect(formatPartValue(4.7e-6, 'F')).toBe(`4.70 ${MICRO}F`);
	});

	it('gives a search text in both spellings when it has either sign, and once when it has neither', () => {
		expect(microSpellings(`10000${MU} caps`)).toEqual([`10000${MICRO} caps`, `10000${MU} caps`]);
		expect(microSpellings(`4${MICRO}7`)).toEqual([`4${MICRO}7`, `4${MU}7`]);
		expect(microSpellings('4k7')).toEqual(['4k7']);
		expect(withMicroSign(`${MU}${MU}`)).toBe(`${MICRO}${MICRO}`);
	});
});
