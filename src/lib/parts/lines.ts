/**
 * Parts-list lines (PRODUCT.md §4.4): a line as typed or read from a CSV (a draft of text fields), validated
 * and normalised into what is stored, with its checks; and back into a draft for the editor and the CSV
 * export. Pure TypeScript (no I/O): runs on the server when a list is saved or imported, and in the
 * browser for the editor's hints. Value notation: ./values.
 */
import { decodeMarking } from '$lib/engineering';
import { PART_KINDS, normaliseKind, valueKindOf, type PartKind } from './kinds';
import { AmbiguousPlusError, withMicroSign, deviationPct, designRatingOf, parsePartValue, parsePercent, parseVoltageRating, parseWatts, voltageRatingText } from './values';
import { partChecks } from './checks';
import { parseCurrency, parseFlag, parseUnitPrice, priceText } from './cost';

/** A potentiometer marking: taper letter and a 3-digit value code ("B104"). */
const POT_MARKING = /^[A-Z]\d{3}$/i;

/** One line as typed in the editor or read from a CSV: every field as text. */
export interface PartLineDraft {
	designators: string;
	quantity: string;
	kind: string;
	value: string;
	tolerance: string;
	ratingV: string;
	ratingW: string;
	package: string;
	notes: string;
	designValue: string;
	reason: string;
	/** Manufacturer part number (free text). */
	mpn: string;
	/** Supplier (free text). */
	supplier: string;
	/** Unit price as typed ("0.12"); exact decimal, currency in its own field. */
	unitPrice: string;
	/** ISO 4217 code ("EUR"). */
	currency: string;
	/** "yes" when the quantity is per channel (multiplied by the build's channel count), else "". */
	perChannel: string;
}

/** Fields of a draft line, in column order. */
export const DRAFT_FIELDS = [
	'designators',
	'quantity',
	'kind',
	'value',
	'tolerance',
	'ratingV',
	'ratingW',
	'package',
	'notes',
	'designValue',
	'reason',
	'mpn',
	'supplier',
	'unitPrice',
	'currency',
	'perChannel'
] as const satisfies readonly (keyof PartLineDraft)[];

/** An empty draft line (quantity 1, kind resistor). */
export function emptyDraft(): PartLineDraft {
	return { designators: '', quantity: '1', kind: 'resistor', value: '', tolerance: '', ratingV: '', ratingW: '', package: '', notes: '', designValue: '', reason: '', mpn: '', supplier: '', unitPrice: '', currency: '', perChannel: '' };
}

/** A check on a line, stored with it (same shape as a spec block's checks). */
export interface PartCheck {
	id: string;
	level: 'note' | 'caution' | 'danger';
	message: string;
	values: Record<string, number | string | boolean | null>;
	caution?: string;
}

/** The stored fields of a part line, column for column as part_line (without id, position and checks). */
export interface PartLineFields {
	designators: string;
	quantity: number;
	kind: string;
	valueText: string;
	value: number | null;
	unit: string | null;
	tolerancePct: number | null;
	ratingV: number | null;
	/** The voltage rating is an AC rating (X/Y capacitors: "275 V AC"), never compared with a DC rail as if DC. */
	ratingVAc: boolean;
	ratingW: number | null;
	package: string;
	notes: string;
	designValueText: string | null;
	designValue: number | null;
	substitutionReason: string | null;
	deviationPct: number | null;
	mpn: string;
	supplier: string;
	/** Exact decimal with 4 places as stored ("0.0120"), or null. */
	unitPrice: string | null;
	currency: string | null;
	perChannel: boolean;
}

/** A validated line, ready to store. */
export interface NormalisedPartLine extends PartLineFields {
	kind: PartKind;
	checks: PartCheck[];
}

/** A problem with one field of one line; `line` counts from 1 (the editor's row, or the CSV file's line). */
export interface LineError {
	line: number;
	field: keyof PartLineDraft | 'line';
	message: string;
	/** Rewrites the maker can pick instead ("2×1u series", "1u||1u" for a bare "1u+1u"). */
	choices?: string[];
}

/** What the checks on a line need to know about the build. */
export interface PartContext {
	/** Highest rail the parts may see, V (the supply block's unloaded rail, else the amplifier block's rail). */
	railV?: number | null;
}

/** Limits of a parts list. */
export const PARTS_LIMITS = { lines: 1000, designators: 500, value: 200, package: 100, notes: 2000, reason: 1000, mpn: 100, supplier: 200 } as const;

/**
 * Validate and normalise one draft line. `line` is its number for messages (editor row or CSV line).
 * normaliseLine({ …, kind: 'capacitor', value: '1u+1u', designValue: '0.47u', tolerance: '10' }, 3)
 * → line.deviationPct 6.38, no errors.
 */
export function normaliseLine(draft: PartLineDraft, line: number, ctx: PartContext = {}): { line?: NormalisedPartLine; errors: LineError[] } {
	const errors: LineError[] = [];
	const err = (field: LineError['field'], message: string, choices?: string[]) =>
		errors.push({ line, field, message, ...(choices ? { choices } : {}) });
	const text = (s: unknown) => (typeof s === 'string' ? s.trim() : '');

	const designators = text(draft.designators);
	if (designators.length > PARTS_LIMITS.designators) err('designators', `designators are at most ${PARTS_LIMITS.designators} characters`);

	let quantity = 1;
	const q = text(draft.quantity);
	if (q !== '') {
		if (!/^\d+$/.test(q)) err('quantity', `quantity "${q}" must be a whole number (0 for not fitted)`);
		else if (Number(q) > 100_000) err('quantity', 'quantity must be at most 100000');
		else quantity = Number(q);
	}

	const kindText = text(draft.kind);
	const kind = kindText === '' ? null : normaliseKind(kindText);
	if (kindText === '') err('kind', 'choose a part kind');
	else if (!kind) err('kind', `"${kindText}" is not a part kind; use one of ${PART_KINDS.join(', ')}`);

	// Values are stored with the micro sign only (U+00B5); a Greek mu (U+03BC) is rewritten to it.
	const valueText = withMicroSign(text(draft.value));
	if (valueText.length > PARTS_LIMITS.value) err('value', `the value is at most ${PARTS_LIMITS.value} characters`);
	const designText = withMicroSign(text(draft.designValue));
	if (designText.length > PARTS_LIMITS.value) err('designValue', `the design value is at most ${PARTS_LIMITS.value} characters`);

	/** An optional number field: blank → null; else parsed, then checked against (0, max]. */
	const optionalNumber = (
		field: 'tolerance' | 'ratingV' | 'ratingW',
		parse: (t: string) => number | null,
		max: number,
		unreadable: (t: string) => string,
		outOfRange: string
	): number | null => {
		const t = text(draft[field]);
		if (t === '') return null;
		const n = parse(t);
		if (n === null) err(field, unreadable(t));
		else if (!(n > 0 && n <= max)) err(field, outOfRange);
		else return n;
		return null;
	};
	let tolerancePct = optionalNumber(
		'tolerance',
		parsePercent,
		100,
		(t) => `tolerance "${t}" must be a percentage, e.g. 5 or ±1 %`,
		'tolerance must be above 0 % and at most 100 %'
	);
	let ratingVAc = false;
	let ratingV = optionalNumber(
		'ratingV',
		(t) => {
			const r = parseVoltageRating(t);
			if (r) ratingVAc = r.ac;
			return r?.volts ?? null;
		},
		100_000,
		(t) => `voltage rating "${t}" must be volts, e.g. 63, 63 V, or 275 V AC for an X/Y capacitor`,
		'voltage rating must be above 0 V and at most 100 kV'
	);
	const ratingW = optionalNumber(
		'ratingW',
		parseWatts,
		100_000,
		(t) => `power rating "${t}" must be watts, e.g. 0.25, 1/4 or 250mW`,
		'power rating must be above 0 W and at most 100 kW'
	);

	const pkg = text(draft.package);
	if (pkg.length > PARTS_LIMITS.package) err('package', `package is at most ${PARTS_LIMITS.package} characters`);
	const notes = typeof draft.notes === 'string' ? draft.notes.replace(/\r\n?/g, '\n').trim() : '';
	if (notes.length > PARTS_LIMITS.notes) err('notes', `notes are at most ${PARTS_LIMITS.notes} characters`);
	const reason = text(draft.reason);
	if (reason.length > PARTS_LIMITS.reason) err('reason', `the reason is at most ${PARTS_LIMITS.reason} characters`);
	if (reason !== '' && designText === '') err('designValue', 'a substitution reason needs the design value it replaces');
	const mpn = text(draft.mpn);
	if (mpn.length > PARTS_LIMITS.mpn) err('mpn', `the manufacturer part number is at most ${PARTS_LIMITS.mpn} characters`);
	const supplier = text(draft.supplier);
	if (supplier.length > PARTS_LIMITS.supplier) err('supplier', `the supplier is at most ${PARTS_LIMITS.supplier} characters`);
	let unitPrice: string | null = null;
	try {
		unitPrice = parseUnitPrice(text(draft.unitPrice));
	} catch (e) {
		err('unitPrice', (e as Error).message);
	}
	let currency: string | null = null;
	try {
		currency = parseCurrency(text(draft.currency));
	} catch (e) {
		err('currency', (e as Error).message);
	}
	if (unitPrice !== null && currency === null && text(draft.currency) === '')
		err('currency', `a unit price needs its currency: add a three-letter code such as EUR or USD`);
	const perChannel = parseFlag(text(draft.perChannel));
	if (perChannel === null) err('perChannel', `"per channel" is yes or no, not "${text(draft.perChannel)}"`);

	let value: number | null = null;
	let unit: string | null = null;
	let designValue: number | null = null;
	let designRatingV: number | null = null;
	let designRatingAc = false;
	let codeReading: string | null = null;
	const vk = kind ? valueKindOf(kind) : null;
	if (kind && vk) {
		if (kind === 'jumper') {
			value = 0;
			unit = 'ohm';
		} else if (valueText === '') err('value', `a ${kind} needs a value, e.g. ${vk === 'resistance' ? '4k7' : vk === 'capacitance' ? '100n' : '10u'}`);
		else {
			try {
				// A potentiometer may be written as marked: taper letter + value code ("A103", "B104").
				const p =
					kind === 'potentiometer' && POT_MARKING.test(valueText)
						? { ...decodeMarking(valueText, 'potentiometer'), ratingV: undefined, tolerancePct: undefined }
						: parsePartValue(valueText, vk);
				if (kind === 'potentiometer' && p.value === 0) throw new RangeError('a potentiometer must be greater than 0 Ω');
				value = p.value;
				unit = p.unit;
				codeReading = 'codeReading' in p ? (p.codeReading ?? null) : null;
				if (p.ratingV !== undefined) {
					const pAc = 'ratingAc' in p && !!p.ratingAc;
					if (ratingV !== null && (ratingV !== p.ratingV || ratingVAc !== pAc))
						err(
							'ratingV',
							`the voltage rating is given twice: ${voltageRatingText(p.ratingV, pAc)} in the value and ${voltageRatingText(ratingV, ratingVAc)} in the rating column`
						);
					ratingV = p.ratingV;
					ratingVAc = pAc;
				}
				if (p.tolerancePct !== undefined) {
					if (tolerancePct !== null && tolerancePct !== p.tolerancePct)
						err('tolerance', `the tolerance is given twice: ${p.tolerancePct} % in the value and ${tolerancePct} % in the tolerance column`);
					tolerancePct = p.tolerancePct;
				}
			} catch (e) {
				if (e instanceof AmbiguousPlusError) err('value', e.message, [...e.choices]);
				else err('value', `cannot read the value: ${(e as Error).message}`);
			}
		}
		if (designText !== '') {
			try {
				const d = parsePartValue(designText, vk);
				designValue = d.value;
				designRatingV = d.ratingV ?? null;
				designRatingAc = !!d.ratingAc;
			} catch (e) {
				// A jumper may stand where the design had a fuse or other non-resistor part: keep that as text.
				if (kind === 'jumper') ({ volts: designRatingV, ac: designRatingAc } = designRatingOf(designText));
				else err('designValue', `cannot read the design value: ${(e as Error).message}`);
			}
		}
	} else if (kind) {
		({ volts: designRatingV, ac: designRatingAc } = designRatingOf(designText));
	}

	if (errors.length || !kind) return { errors };
	const base: Omit<NormalisedPartLine, 'checks'> = {
		designators,
		quantity,
		kind,
		valueText: kind === 'jumper' && valueText === '' ? '0R' : valueText,
		value,
		unit,
		tolerancePct,
		ratingV,
		ratingVAc: ratingV !== null && ratingVAc,
		ratingW,
		package: pkg,
		notes,
		designValueText: designText === '' ? null : designText,
		designValue,
		substitutionReason: reason === '' ? null : reason,
		deviationPct: designText === '' ? null : deviationPct(value, designValue),
		mpn,
		supplier,
		unitPrice,
		currency,
		perChannel: perChannel === true
	};
	const checks = partChecks(base, { volts: designRatingV, ac: designRatingAc }, ctx);
	// Bare digits read as a marking code ("104"): say how, so a misreading shows.
	if (codeReading)
		checks.push({ id: 'part.value-read-as-code', level: 'note', message: `${designators || 'A line'}: ${codeReading}`, values: { designators, valueText } });
	return { line: { ...base, checks }, errors };
}

/**
 * Validate a whole list: either every line is valid (ok, lines in order) or the errors of every bad line.
 * `lineNumbers[i]` is the number shown for draft i (default i + 1).
 */
export function normaliseLines(
	drafts: readonly PartLineDraft[],
	ctx: PartContext = {},
	lineNumbers?: readonly number[]
): { ok: true; lines: NormalisedPartLine[] } | { ok: false; errors: LineError[]; lines: (NormalisedPartLine | null)[] } {
	if (drafts.length > PARTS_LIMITS.lines)
		return { ok: false, errors: [{ line: 0, field: 'line', message: `a parts list holds at most ${PARTS_LIMITS.lines} lines` }], lines: [] };
	const lines: (NormalisedPartLine | null)[] = [];
	const errors: LineError[] = [];
	drafts.forEach((d, i) => {
		const r = normaliseLine(d, lineNumbers?.[i] ?? i + 1, ctx);
		lines.push(r.line ?? null);
		errors.push(...r.errors);
	});
	if (errors.length) return { ok: false, errors, lines };
	return { ok: true, lines: lines as NormalisedPartLine[] };
}

/** A stored line back as editable text (the editor's rows, the CSV export). */
export function lineToDraft(
	row: Pick<
		PartLineFields,
		| 'designators'
		| 'quantity'
		| 'kind'
		| 'valueText'
		| 'tolerancePct'
		| 'ratingV'
		| 'ratingW'
		| 'package'
		| 'notes'
		| 'designValueText'
		| 'substitutionReason'
	> &
		Partial<Pick<PartLineFields, 'ratingVAc' | 'mpn' | 'supplier' | 'unitPrice' | 'currency' | 'perChannel'>>
): PartLineDraft {
	const num = (x: number | null) => (x === null || x === undefined ? '' : String(x));
	return {
		designators: row.designators,
		quantity: String(row.quantity),
		kind: row.kind,
		value: row.valueText,
		tolerance: num(row.tolerancePct),
		ratingV: row.ratingV === null || row.ratingV === undefined ? '' : row.ratingVAc ? voltageRatingText(row.ratingV, true) : String(row.ratingV),
		ratingW: num(row.ratingW),
		package: row.package,
		notes: row.notes,
		designValue: row.designValueText ?? '',
		reason: row.substitutionReason ?? '',
		mpn: row.mpn ?? '',
		supplier: row.supplier ?? '',
		unitPrice: priceText(row.unitPrice),
		currency: row.currency ?? '',
		perChannel: row.perChannel ? 'yes' : ''
	};
}
