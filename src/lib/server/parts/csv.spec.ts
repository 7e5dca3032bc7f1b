import { describe, expect, it } from 'vitest';
import { emptyDraft, normaliseLines, type PartLineDraft } from '$lib/parts';
import { partsToCsv, readPartsCsv } from './csv';
import { previewPartsCsv } from './preview';

const draft = (over: Partial<PartLineDraft>): PartLineDraft => ({ ...emptyDraft(), ...over });

function normalised(drafts: PartLineDraft[]) {
	const r = normaliseLines(drafts);
	if (!r.ok) throw new Error(JSON.stringify(r.errors));
	return r.lines;
}

const tricky = normalised([
	draft({ designators: 'R1, R2', quantity: '2', kind: 'resistor', value: '4k7', tolerance: '1', ratingW: '0.25', package: '0207', notes: 'metal film, "low noise"' }),
	draft({ designators: 'C3', kind: 'capacitor', value: '2×1u series', designValue: '0.47u', tolerance: '10', reason: 'had two 1 µF film caps,\nsame box' }),
	draft({ designators: 'C10', kind: 'capacitor', value: '10000u/50V', package: 'snap-in', notes: 'line one\nline two, with a comma' }),
	draft({ designators: 'U1', kind: 'ic', value: '5-pin monolithic power amplifier IC', notes: '=SUM(A1:A2) is not a formula here' }),
	draft({ designators: 'R8', kind: 'jumper', value: '', designValue: '2R2', reason: 'stability is fine without it' }),
	// Costed columns: an exact sub-cent price, a supplier with a comma and quotes, a per-channel flag, an AC rating.
	draft({ designators: 'R9, R10', quantity: '2', kind: 'resistor', value: '0R22', ratingW: '5', mpn: 'WR-5W-0R22', supplier: 'Bench "B", Ltd', unitPrice: '0.0125', currency: 'eur', perChannel: 'yes' }),
	draft({ designators: 'CX1', kind: 'capacitor', value: '100n', ratingV: '275 V AC', unitPrice: '0,35', currency: 'GBP' }),
	draft({ designators: 'Q1', kind: 'transistor', value: 'NPN power transistor', unitPrice: '1200', currency: 'JPY', perChannel: 'y' })
]);

describe('partsToCsv', () => {
	it('writes RFC 4180: CRLF after every record, quotes around commas, quotes and line breaks, doubled quotes', () => {
		const csv = partsToCsv(tricky);
		expect(csv.startsWith('designators,quantity,kind,value,tolerance_pct,rating_v,rating_w,package,notes,design_value,substitution_reason,mpn,supplier,unit_price,currency,per_channel,value_si,unit,deviation_pct\r\n')).toBe(true);
		expect(csv.endsWith('\r\n')).toBe(true);
		// Every record break is CRLF; the only bare LFs are inside quoted fields.
		const outside = csv.replace(/"(?:[^"]|"")*"/g, '""');
		expect(outside).not.toMatch(/[^\r]\n/);
		expect(csv).toContain('"R1, R2"');
		expect(csv).toContain('"metal film, ""low noise"""');
		expect(csv).toContain('"line one\nline two, with a comma"');
	});

	it('defuses spreadsheet formulas with a leading apostrophe', () => {
		expect(partsToCsv(tricky)).toContain(",'=SUM(A1:A2) is not a formula here,");
	});

	it('writes the costed columns as the editor shows them and an AC rating with its AC', () => {
		const csv = partsToCsv(tricky);
		// RFC 4180 §2.7: a quote inside a quoted field is doubled; §2.6: a field with a comma is quoted.
		expect(csv).toContain('WR-5W-0R22,"Bench ""B"", Ltd",0.0125,EUR,yes,');
		expect(csv).toContain(',275 V AC,');
		expect(csv).toContain(',0.35,GBP,,');
		expect(csv).toContain(',1200.00,JPY,yes,');
	});

	it('export → import gives the same lines', () => {
		const read = readPartsCsv(partsToCsv(tricky));
		expect(read.errors).toEqual([]);
		expect(read.warnings).toEqual([]);
		const again = normalised(read.rows.map((r) => r.draft));
		expect(again).toEqual(tricky);
	});
});

describe('readPartsCsv', () => {
	it('maps header spellings and counts line numbers across quoted line breaks', () => {
		const text = 'Ref;Qty;Type;Value;Notes\r\nR1;1;res;4k7;"two\nlines"\r\nC1;1;cap;100n;\r\n';
		const read = readPartsCsv(text);
		expect(read.errors).toEqual([]);
		expect(read.rows.map((r) => r.line)).toEqual([2, 4]);
		expect(read.rows[1].draft).toMatchObject({ designators: 'C1', kind: 'cap', value: '100n' });
	});

	it('takes the kind from the designator prefix when the column is empty', () => {
		const read = readPartsCsv('designators,value\nR4,10k\nC7,47u\n');
		expect(read.rows.map((r) => [r.draft.kind, r.kindFromDesignators])).toEqual([
			['resistor', true],
			['capacitor', true]
		]);
	});

	it('warns about unknown columns and refuses a header without value or kind', () => {
		expect(readPartsCsv('designators,value,colour\nR1,1k,red\n').warnings[0]).toMatch(/colour/);
		const bad = readPartsCsv('a,b\n1,2\n');
		expect(bad.errors[0]).toMatchObject({ line: 1 });
		expect(bad.errors[0].message).toMatch(/no "value" or "kind" column/);
	});

	it('reports an unclosed quote with its line', () => {
		const read = readPartsCsv('designators,kind,value,notes\nR1,resistor,1k,ok\nR2,resistor,2k,"oops\n');
		expect(read.errors.some((e) => e.line === 3 && /not closed/.test(e.message))).toBe(true);
	});

	it('refuses an empty file', () => {
		expect(readPartsCsv('  ').errors[0].message).toMatch(/empty/);
	});
});

describe('previewPartsCsv', () => {
	it('shows every line with its own errors and the CSV line number; not ok while one line is bad', () => {
		const text = 'designators,kind,value\nR1,resistor,4k7\nC2,capacitor,10 bananas\nC3,capacitor,2×1u series\n';
		const p = previewPartsCsv(text, null);
		expect(p.ok).toBe(false);
		expect(p.rows.map((r) => r.errors.length)).toEqual([0, 1, 0]);
		expect(p.rows[1].errors[0]).toMatchObject({ line: 3, field: 'value' });
		expect(p.rows[2].normalised?.value).toBeCloseTo(5e-7, 15);
	});

	it('is ok when every line is valid, with checks computed against the rail', () => {
		const p = previewPartsCsv('designators,kind,value,rating_v,design_value,substitution_reason\nC1,capacitor,100u,25,100u/50V,on hand\n', 35);
		expect(p.ok).toBe(true);
		expect(p.rows[0].normalised?.checks.find((c) => c.id === 'part.rating-below-rail')?.level).toBe('danger');
	});
});
