/**
 * Parts lists as CSV (RFC 4180: comma-separated, CRLF line breaks, fields with commas, quotes or line breaks
 * in double quotes, quotes doubled). Export writes the values as the maker typed them, so export → import
 * gives the same lines; import maps headers by name (many spellings), reports problems with the file's line
 * numbers, and saves nothing itself.
 */
import Papa from 'papaparse';
import { DRAFT_FIELDS, emptyDraft, lineToDraft, normaliseKind, type PartLineDraft, type PartLineFields } from '$lib/parts';

/** Largest CSV accepted, bytes. */
export const CSV_MAX_BYTES = 1_000_000;

/** Column headers written by the export, in order, and the draft field each one fills. */
export const CSV_COLUMNS: readonly (readonly [string, keyof PartLineDraft | null])[] = [
	['designators', 'designators'],
	['quantity', 'quantity'],
	['kind', 'kind'],
	['value', 'value'],
	['tolerance_pct', 'tolerance'],
	['rating_v', 'ratingV'],
	['rating_w', 'ratingW'],
	['package', 'package'],
	['notes', 'notes'],
	['design_value', 'designValue'],
	['substitution_reason', 'reason'],
	['mpn', 'mpn'],
	['supplier', 'supplier'],
	['unit_price', 'unitPrice'],
	['currency', 'currency'],
	['per_channel', 'perChannel'],
	// Computed by the server; written for spreadsheets, ignored on import.
	['value_si', null],
	['unit', null],
	['deviation_pct', null]
];

/** Header spellings accepted on import (lower case, spaces/underscores/dashes ignored) → field. */
const HEADER_SYNONYMS: Record<string, keyof PartLineDraft | null> = {
	designators: 'designators',
	designator: 'designators',
	refs: 'designators',
	ref: 'designators',
	reference: 'designators',
	references: 'designators',
	refdes: 'designators',
	parts: 'designators',
	quantity: 'quantity',
	qty: 'quantity',
	count: 'quantity',
	kind: 'kind',
	type: 'kind',
	partkind: 'kind',
	parttype: 'kind',
	category: 'kind',
	value: 'value',
	fitted: 'value',
	fittedvalue: 'value',
	val: 'value',
	tolerance: 'tolerance',
	tolerancepct: 'tolerance',
	tol: 'tolerance',
	tolpct: 'tolerance',
	ratingv: 'ratingV',
	voltage: 'ratingV',
	voltagerating: 'ratingV',
	volts: 'ratingV',
	vrating: 'ratingV',
	ratingw: 'ratingW',
	power: 'ratingW',
	powerrating: 'ratingW',
	watts: 'ratingW',
	wrating: 'ratingW',
	package: 'package',
	footprint: 'package',
	case: 'package',
	notes: 'notes',
	note: 'notes',
	comment: 'notes',
	comments: 'notes',
	designvalue: 'designValue',
	design: 'designValue',
	originalvalue: 'designValue',
	substitutionreason: 'reason',
	reason: 'reason',
	why: 'reason',
	mpn: 'mpn',
	manufacturerpartnumber: 'mpn',
	manufacturerpn: 'mpn',
	partnumber: 'mpn',
	pn: 'mpn',
	supplier: 'supplier',
	vendor: 'supplier',
	source: 'supplier',
	shop: 'supplier',
	unitprice: 'unitPrice',
	price: 'unitPrice',
	priceeach: 'unitPrice',
	each: 'unitPrice',
	currency: 'currency',
	cur: 'currency',
	perchannel: 'perChannel',
	channel: 'perChannel',
	valuesi: null,
	unit: null,
	deviationpct: null,
	deviation: null
};

const headerKey = (h: string) => h.trim().toLowerCase().replace(/[\s_\-%()./]+/g, '');

/** A field as a spreadsheet will not run it: a leading = + - @ tab or CR gets a ' before it (CSV injection). */
export function quoteFormula(s: string): string {
	return /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
}
/** Undo quoteFormula on import. */
function unquoteFormula(s: string): string {
	return /^'[=+\-@\t\r]/.test(s) ? s.slice(1) : s;
}

/** The fields partsToCsv reads from a stored line. */
export type CsvLine = Omit<PartLineFields, 'designValue'>;

/**
 * A parts list as RFC 4180 CSV with a header row and CRLF after every record. Values are written as
 * typed ("4k7", "1u+1u") plus value_si/unit/deviation_pct for spreadsheets.
 * partsToCsv([{ designators: 'R1', …, notes: 'a, "b"' }]) → 'designators,…\r\nR1,…,"a, ""b""",…\r\n'.
 */
export function partsToCsv(lines: readonly CsvLine[]): string {
	const num = (x: number | null) => (x === null || x === undefined ? '' : String(x));
	const typed = CSV_COLUMNS.filter(([, f]) => f !== null).length;
	const data = lines.map((l) => {
		// The typed columns exactly as the editor shows them (lineToDraft), so export → import is the same list.
		const d = lineToDraft(l);
		return [
			...CSV_COLUMNS.slice(0, typed).map(([, f]) => d[f as keyof PartLineDraft]),
			num(l.value),
			l.unit ?? '',
			num(l.deviationPct)
		].map((f, i) => (i >= typed ? f : quoteFormula(f)));
	});
	const body = Papa.unparse({ fields: CSV_COLUMNS.map(([h]) => h), data }, { newline: '\r\n', quotes: false, escapeFormulae: false });
	return `${body}\r\n`;
}

/** One data record of an imported CSV. */
export interface CsvRow {
	/** Line of the file where the record starts (the header is line 1). */
	line: number;
	draft: PartLineDraft;
	/** The kind was empty and was read from the designator prefix (R → resistor, C → capacitor …). */
	kindFromDesignators?: boolean;
}

/** What reading a CSV gives: its rows, file-level errors (with line numbers where they have one), warnings. */
export interface CsvRead {
	rows: CsvRow[];
	errors: { line: number; message: string }[];
	warnings: string[];
	/** Which column fills which field (header text → field). */
	mapping: { header: string; field: keyof PartLineDraft | null }[];
}

/** Kind from a designator prefix: "R12" → resistor, "C3, C4" → capacitor; null when the letters mean nothing. */
function kindFromDesignators(designators: string): string | null {
	const m = /^\s*([A-Za-z]+)\d/.exec(designators);
	if (!m) return null;
	return normaliseKind(m[1]);
}

/**
 * Read a parts-list CSV: comma, semicolon or tab separated, optional BOM, header row required.
 * Each record's line number counts quoted line breaks, so errors point at the line a text editor shows.
 * Nothing is validated beyond the file's shape here: normaliseLines does the values.
 */
export function readPartsCsv(text: string): CsvRead {
	const errors: CsvRead['errors'] = [];
	const warnings: string[] = [];
	if (typeof text !== 'string' || text.trim() === '') return { rows: [], errors: [{ line: 0, message: 'The CSV is empty.' }], warnings, mapping: [] };
	if (new TextEncoder().encode(text).length > CSV_MAX_BYTES)
		return { rows: [], errors: [{ line: 0, message: `The CSV is larger than ${CSV_MAX_BYTES / 1_000_000} MB.` }], warnings, mapping: [] };
	const src = text.replace(/^\uFEFF/, '');
	const parsed = Papa.parse<string[]>(src, { delimitersToGuess: [',', ';', '\t'], skipEmptyLines: false });
	const records = parsed.data;

	// Line where each record starts: 1 + records before it + line breaks inside their quoted fields.
	const lineOf: number[] = [];
	let line = 1;
	for (const r of records) {
		lineOf.push(line);
		line += 1 + r.reduce((n, f) => n + (f.match(/\n/g)?.length ?? 0), 0);
	}
	for (const e of parsed.errors) {
		if (e.code === 'UndetectableDelimiter') continue;
		const at = typeof e.row === 'number' ? (lineOf[e.row] ?? 0) : 0;
		errors.push({
			line: at,
			message: e.code === 'MissingQuotes' ? 'a quoted field is not closed (a " is missing)' : e.code === 'InvalidQuotes' ? 'a stray " inside a field (double it as "")' : e.message
		});
	}

	const headerIndex = records.findIndex((r) => r.some((f) => f.trim() !== ''));
	if (headerIndex < 0) return { rows: [], errors: [{ line: 0, message: 'The CSV has no header row.' }], warnings, mapping: [] };
	const header = records[headerIndex].map((h) => h.trim());
	const mapping = header.map((h) => ({ header: h, field: (HEADER_SYNONYMS[headerKey(h)] ?? null) as keyof PartLineDraft | null }));
	const unknown = header.filter((h) => h !== '' && !(headerKey(h) in HEADER_SYNONYMS));
	if (unknown.length) warnings.push(`Ignored column${unknown.length === 1 ? '' : 's'}: ${unknown.join(', ')}.`);
	const seen = new Map<string, string>();
	for (const m of mapping) {
		if (!m.field) continue;
		if (seen.has(m.field))
			errors.push({ line: lineOf[headerIndex], message: `columns "${seen.get(m.field)}" and "${m.header}" both fill ${m.field}; keep one` });
		else seen.set(m.field, m.header);
	}
	if (!seen.has('value') && !seen.has('kind'))
		errors.push({
			line: lineOf[headerIndex],
			message: `no "value" or "kind" column found in the header (${header.join(', ')}); expected e.g. designators,quantity,kind,value`
		});

	const rows: CsvRow[] = [];
	for (let i = headerIndex + 1; i < records.length; i++) {
		const r = records[i];
		if (r.every((f) => f.trim() === '')) continue;
		if (r.length > header.length && r.slice(header.length).some((f) => f.trim() !== ''))
			errors.push({ line: lineOf[i], message: `${r.length} fields but the header has ${header.length}` });
		const draft = { ...emptyDraft(), quantity: '', kind: '' };
		r.forEach((f, j) => {
			const field = mapping[j]?.field;
			if (field && (DRAFT_FIELDS as readonly string[]).includes(field)) draft[field] = unquoteFormula(f);
		});
		const row: CsvRow = { line: lineOf[i], draft };
		if (draft.kind.trim() === '') {
			const k = kindFromDesignators(draft.designators);
			if (k) {
				draft.kind = k;
				row.kindFromDesignators = true;
			}
		}
		rows.push(row);
	}
	if (rows.length === 0 && errors.length === 0) errors.push({ line: 0, message: 'The CSV has a header but no parts.' });
	return { rows, errors, warnings, mapping };
}
