/**
 * Part values in the trade's notation (PRODUCT.md §4.4): parsing per part kind, fitted values written as
 * series/parallel networks, ratings and tolerances, substitution deviation, and display.
 *
 * Value notation (shown in the editor):
 * - one part: SI prefix or RKM code — `4k7`, `4.7k`, `2R2`, `0R22`, `100n`, `0.47u`, `4u7`, `10uH`, `1M0`;
 * - a network of fitted parts: `+` joins parts in SERIES, `||` joins parts in PARALLEL, and `||` binds
 *   tighter than `+` (as in circuit notes): `10k+10k` (20 kΩ), `10k||10k` (5 kΩ), `1k + 10k||10k` (6 kΩ);
 *   on a capacitor line a bare `+` is asked about (builders read `1u+1u` both ways): write `2×1u series`,
 *   `1u+2u series` or `1u||1u` / `2×1u parallel`;
 * - bare digits: `104` on a capacitor line is the 3-digit code (100 nF), on a resistor line the IEC 60062
 *   3-digit code (100 kΩ) when the last digit is 1–6; a bare number on a capacitor line is otherwise refused;
 * - an optional voltage rating after a space or slash — `100u/63V`, `100u 63V`, `100n 275VAC` (an AC rating,
 *   X/Y capacitors) — and a tolerance — `4k7 ±1%`, `100n 10%`;
 * - a resistor position bridged by a wire: kind "jumper", or value `0R`, `0`, `link`, `jumper`.
 */
import { decodeMarking, networkValue, parseValue, type NetworkPart, type ValueKind, type ValueUnit } from '$lib/engineering';
import { PREFIXES } from '$lib/engineering/values';
import { decodeCapacitorCode, decodeVoltageCodedMarking, expandCount } from '$lib/engineering/trade-notation';
import { valueKindOf, type PartKind } from './kinds';

const NETWORK_PART: Record<ValueKind, NetworkPart> = { resistance: 'resistor', capacitance: 'capacitor', inductance: 'inductor' };
const UNIT_OF: Record<ValueKind, ValueUnit> = { resistance: 'ohm', capacitance: 'F', inductance: 'H' };

/** A parsed fitted or design value. */
export interface ParsedPartValue {
	/** SI value (Ω, F, H). */
	value: number;
	unit: ValueUnit;
	/** How many parts make it up (1 for a single part). */
	parts: number;
	/** 'series', 'parallel' or 'mixed' when written as a network. */
	arrangement?: 'series' | 'parallel' | 'mixed';
	/** Voltage rating written after the value ("100u/63V"). */
	ratingV?: number;
	/** The rating written after the value is an AC rating ("100n 275VAC"). */
	ratingAc?: boolean;
	/** The reading as a sentence: "two 1 µF in series = 500 nF", or how bare digits were read. */
	reading?: string;
	/** Bare digits read as a 3-digit code ("104"): the sentence that says so (stored as a note on the line). */
	codeReading?: string;
	/** Tolerance written after the value ("4k7 1%"). */
	tolerancePct?: number;
}

const JUMPER_WORDS = /^(jumper|link|wire|wire link|bridge|0r|0r0|0|0 ?[ωΩ]|0 ?ohms?)$/i;
const RATING_TAIL = /(?:\s*\/\s*|\s+)(\d+(?:\.\d+)?)\s*(k?)V\s*(?:(AC|a\.c\.|~)|DC|d\.c\.)?$/i;
const TOLERANCE_TAIL = /(?:\s+|\s*(?:±|\+\/-|\+-)\s*)(\d+(?:\.\d+)?)\s*%$/;

/**
 * A capacitor marking (decoded) or a count rewritten as a network ("2×1u series" → "1u+1u"); null when the
 * text is neither. Throws RangeError with the reason when it looks like one but cannot be read.
 */
function readTradeNotation(
	core: string,
	kind: ValueKind,
	text: string
): { value: number; ratingV?: number; tolerancePct?: number } | { core: string; arrangement: 'series' | 'parallel' } | null {
	if (kind === 'capacitance') {
		const coded = decodeVoltageCodedMarking(core);
		if (coded) return { value: coded.value, ratingV: coded.ratingV, tolerancePct: coded.tolerancePct };
		const code = decodeCapacitorCode(core);
		if (code) return code;
	}
	try {
		const counted = expandCount(core);
		return counted ? { core: counted.text, arrangement: counted.arrangement } : null;
	} catch (e) {
		throw new RangeError(`"${text}": ${(e as Error).message.replace(/^"[^"]*": /, '')}`);
	}
}

/** Split "100u/63V 10%" into the value text and its rating and tolerance tails. */
function splitTails(text: string): { core: string; ratingV?: number; ratingAc?: boolean; tolerancePct?: number } {
	let core = text.trim();
	let ratingV: number | undefined;
	let ratingAc: boolean | undefined;
	let tolerancePct: number | undefined;
	for (let i = 0; i < 2; i++) {
		const r = RATING_TAIL.exec(core);
		if (r && ratingV === undefined) {
			ratingV = Number(r[1]) * (r[2] ? 1000 : 1);
			if (r[3]) ratingAc = true;
			core = core.slice(0, r.index).trim();
			continue;
		}
		const t = TOLERANCE_TAIL.exec(core);
		if (t && tolerancePct === undefined) {
			tolerancePct = Number(t[1]);
			core = core.slice(0, t.index).trim();
			continue;
		}
	}
	return { core, ratingV, ...(ratingAc ? { ratingAc } : {}), tolerancePct };
}

/**
 * A capacitor value joined by a bare "+": many builders read 1u+1u as parallel (the capacitances add), others as
 * series, so it is not guessed. The message names both ways of writing it; `choices` are the rewrites
 * (series first), `readings` what each gives.
 */
export class AmbiguousPlusError extends RangeError {
	readonly choices: [string, string];
	readonly readings: [string, string];
	constructor(message: string, choices: [string, string], readings: [string, string]) {
		super(message);
		this.name = 'AmbiguousPlusError';
		this.choices = choices;
		this.readings = readings;
	}
}

const NUMBER_WORDS = ['zero', 'one', 'two', 'three', 'four', 'five', 'six', 'seven', 'eight', 'nine', 'ten'];

/** "two 1 µF in series = 500 nF", "10 kΩ and 4.7 kΩ in parallel = 3.2 kΩ": a network as a sentence. */
function networkReading(values: number[], unit: ValueUnit, arrangement: 'series' | 'parallel' | 'mixed', total: number): string {
	const each = values.map((v) => formatPartValue(v, unit));
	const same = each.every((e) => e === each[0]);
	const parts = same ? `${NUMBER_WORDS[values.length] ?? values.length} ${each[0]}` : `${each.slice(0, -1).join(', ')} and ${each.at(-1)}`;
	const how = arrangement === 'mixed' ? 'in series and parallel' : `in ${arrangement}`;
	return `${parts} ${how} = ${formatPartValue(total, unit)}`;
}

/** Superscript powers of ten for the readings' sentences: power(4) → "10⁴", power(-1) → "10⁻¹". */
const power = (e: number) => `10${e < 0 ? '⁻' : ''}${[...String(Math.abs(e))].map((d) => '⁰¹²³⁴⁵⁶⁷⁸⁹'[Number(d)]).join('')}`;

/**
 * Bare digits on a line of a known kind ("104", "4702", "470", "0.1"), read per IEC 60062 where they are a marking
 * (the values themselves come from decodeMarking, $lib/engineering):
 * - capacitor: 3 digits not ending in 0 are the 3-digit code in pF ("104" = 10 × 10⁴ pF = 100 nF; 8 and 9 as the
 *   last digit are ×0.01 and ×0.1); anything else bare ("470", "10", "0.1") is refused, since makers mean pF, µF or
 *   the code and the unit decides;
 * - resistor: 3 digits whose last digit is 1–6 are the 3-digit code in Ω ("104" = 100 kΩ, "472" = 4.7 kΩ) and 4 digits
 *   whose last digit is 1–6 the 4-digit code, three significant digits and a multiplier ("4702" = 470 × 10² Ω =
 *   47.0 kΩ, "1001" = 1.00 kΩ); other bare numbers ("100", "47", "1000") stay ohms as written;
 * - inductor: 3 digits whose last digit is 1–6 are the 3-digit code in µH ("101" = 10 × 10¹ µH = 100 µH; common
 *   marking practice on moulded and chip inductors, no single source); any other bare number is refused — "100" on
 *   an inductor line is never read as 100 H.
 * → the value and the sentence that says how it was read, or null when the text is not bare digits.
 */
function readBareDigits(core: string, kind: ValueKind): { value: number; codeReading?: string } | null {
	if (!/^\d+(?:[.,]\d+)?$/.test(core)) return null;
	const code = /^\d{3,4}$/.test(core) ? { sig: Number(core.slice(0, -1)), exp: Number(core.at(-1)), digits: core.length } : null;
	const exp = code ? (code.exp === 8 ? -2 : code.exp === 9 ? -1 : code.exp) : 0;
	const threeDigits = code?.digits === 3;
	const multiplierCode = !!code && code.exp >= 1 && code.exp <= 6;
	if (kind === 'capacitance') {
		if (threeDigits && code.exp !== 0) {
			const value = decodeMarking(core, 'capacitor').value;
			return { value, codeReading: `"${core}" is read as the 3-digit capacitor code: ${code.sig} × ${power(exp)} pF = ${formatPartValue(value, 'F')}.` };
		}
		const asCode = threeDigits ? ` (as a 3-digit code "${core}" would be ${formatPartValue(decodeMarking(core, 'capacitor').value, 'F')})` : '';
		throw new RangeError(`"${core}" on a capacitor line has no unit${asCode}: write it with one, e.g. ${core}p, ${core}n or ${core}u`);
	}
	if (kind === 'resistance' && multiplierCode) {
		const value = decodeMarking(core, 'resistor').value;
		return {
			value,
			codeReading: `"${core}" is read as the ${code.digits}-digit resistor code (IEC 60062): ${code.sig} × ${power(exp)} Ω = ${formatPartValue(value, 'ohm')}; for ${core} Ω write ${core}R.`
		};
	}
	if (kind === 'inductance') {
		if (threeDigits && multiplierCode) {
			const value = decodeMarking(core, 'inductor').value;
			return {
				value,
				codeReading: `"${core}" is read as the 3-digit inductor code in µH (common marking practice): ${code.sig} × ${power(exp)} µH = ${formatPartValue(value, 'H')}.`
			};
		}
		const asCode = threeDigits ? ` (as a 3-digit inductor code "${core}" would be ${formatPartValue(decodeMarking(core, 'inductor').value, 'H')})` : '';
		throw new RangeError(`"${core}" on an inductor line has no unit${asCode}: a bare number is not read as henries; write it with one, e.g. ${core}u for µH or ${core}m for mH`);
	}
	return null;
}

/** One part of a value (a network's branch or the whole value): bare digits as above, else parseValue. */
function parseOne(b: string, kind: ValueKind): { value: number; tolerancePct?: number; codeReading?: string } {
	const bare = readBareDigits(b, kind);
	if (bare) return bare;
	return parseValue(b, kind);
}

/** A network's arrangement word at the end ("1u+2u series", "1u+1u parallel"). */
const ARRANGEMENT_TAIL = /\s+(?:in\s+)?(series|parallel)$/i;

/**
 * Parse a part value as the trade writes it, for a value kind (see the notation above).
 * parsePartValue('2×1u series', 'capacitance') → { value: 5e-7, unit: 'F', parts: 2, arrangement: 'series',
 * reading: 'two 1 µF in series = 500 nF' }; parsePartValue('100u/63V', 'capacitance') → { value: 1e-4, ratingV: 63,
 * parts: 1 }; parsePartValue('104', 'capacitance') → 100 nF with a codeReading. A bare "+" between capacitor values
 * throws AmbiguousPlusError; anything unreadable a RangeError with a sentence a maker can act on.
 */
export function parsePartValue(text: string, kind: ValueKind): ParsedPartValue {
	const tails = splitTails(text);
	const { ratingV, tolerancePct } = tails;
	const acTail = tails.ratingAc ? { ratingAc: true } : {};
	// More of the trade's notation ($lib/engineering/trade-notation): "2A104J", "472J 100V", "2×10000u".
	const trade = readTradeNotation(tails.core, kind, text);
	if (trade && 'value' in trade) {
		const rV = ratingV ?? trade.ratingV;
		const tol = tolerancePct ?? trade.tolerancePct;
		return {
			value: trade.value,
			unit: 'F',
			parts: 1,
			...(rV !== undefined ? { ratingV: rV, ...(ratingV !== undefined ? acTail : {}) } : {}),
			...(tol !== undefined ? { tolerancePct: tol } : {})
		};
	}
	let core = trade?.core ?? tails.core;
	// Said outright: a count with a word ("2×1u series") or a network followed by one ("1u+2u series").
	let explicit = trade?.arrangement;
	const word = ARRANGEMENT_TAIL.exec(core);
	if (!explicit && word && /\+(?![/-])|\|\||∥/.test(core.slice(0, word.index))) {
		explicit = word[1].toLowerCase() as 'series' | 'parallel';
		core = core.slice(0, word.index).trim();
		if (explicit === 'parallel') {
			if (/\|\||∥/.test(core)) throw new RangeError(`"${text}": "parallel" after a network that already uses || is unclear; write it with || only`);
			core = core.replace(/\s*\+(?![/-])\s*/g, '||');
		} else if (/\|\||∥/.test(core)) throw new RangeError(`"${text}": "series" after a network that uses || is unclear; write it with + and || only`);
	}
	if (tolerancePct !== undefined && !(tolerancePct > 0 && tolerancePct <= 100))
		throw new RangeError(`"${text}": a tolerance must be above 0 % and at most 100 %`);
	if (ratingV !== undefined && !(ratingV > 0 && ratingV <= 100_000))
		throw new RangeError(`"${text}": a voltage rating must be above 0 V and at most 100 kV`);
	if (core === '') throw new RangeError('the value is empty');
	const extra: { ratingV?: number; ratingAc?: boolean; tolerancePct?: number } = {
		...(ratingV !== undefined ? { ratingV, ...acTail } : {}),
		...(tolerancePct !== undefined ? { tolerancePct } : {})
	};
	if (kind === 'resistance' && JUMPER_WORDS.test(core)) return { value: 0, unit: 'ohm', parts: 1, ...extra };

	// "+" joins in series (but not the "+/-" of a tolerance); "||" joins in parallel and binds tighter.
	const seriesTerms = core.split(/\+(?![/-])/).map((s) => s.trim());
	const isNetwork = seriesTerms.length > 1 || core.includes('||') || core.includes('∥');
	if (!isNetwork) {
		const p = parseOne(core, kind);
		if (p.tolerancePct !== undefined && extra.tolerancePct === undefined) extra.tolerancePct = p.tolerancePct;
		return { value: p.value, unit: UNIT_OF[kind], parts: 1, ...extra, ...(p.codeReading ? { reading: p.codeReading, codeReading: p.codeReading } : {}) };
	}
	if (seriesTerms.some((t) => t === ''))
		throw new RangeError(`"${text}": a "+" needs a value on both sides, e.g. 2×1u series for two parts in series`);
	const part = NETWORK_PART[kind];
	let parts = 0;
	let hasParallel = false;
	const all: number[] = [];
	const termValues = seriesTerms.map((term) => {
		const branches = term.split(/\|\||∥/).map((s) => s.trim());
		if (branches.some((b) => b === ''))
			throw new RangeError(`"${text}": "||" needs a value on both sides, e.g. 10k||10k for two parts in parallel`);
		const values = branches.map((b) => {
			let p;
			try {
				p = parseOne(b, kind);
			} catch (err) {
				throw new RangeError(`"${text}": part "${b}" — ${(err as Error).message}`);
			}
			if (p.value <= 0) throw new RangeError(`"${text}": every part of a network must be greater than zero ("${b}")`);
			if (p.tolerancePct !== undefined && extra.tolerancePct === undefined) extra.tolerancePct = p.tolerancePct;
			all.push(p.value);
			return p.value;
		});
		parts += values.length;
		if (values.length > 1) hasParallel = true;
		return values.length > 1 ? networkValue(part, 'parallel', values) : values[0];
	});
	if (parts > 50) throw new RangeError(`"${text}": a network of at most 50 parts`);
	const value = Number((termValues.length > 1 ? networkValue(part, 'series', termValues) : termValues[0]).toPrecision(12));
	const arrangement = termValues.length > 1 ? (hasParallel ? 'mixed' : 'series') : 'parallel';
	const unit = UNIT_OF[kind];
	// Capacitors: a "+" nobody spelled out is asked about, never guessed.
	if (kind === 'capacitance' && seriesTerms.length > 1 && explicit !== 'series') {
		const same = !hasParallel && seriesTerms.every((t) => t === seriesTerms[0]);
		const seriesForm = same ? `${seriesTerms.length}×${seriesTerms[0]} series` : `${core} series`;
		const parallelForm = core.replace(/\s*\+(?![/-])\s*/g, '||');
		const parallelValue = Number(networkValue(part, 'parallel', all).toPrecision(12));
		const seriesReading = networkReading(all, unit, arrangement, value);
		const parallelReading = networkReading(all, unit, 'parallel', parallelValue);
		throw new AmbiguousPlusError(
			`"${text}": a "+" between capacitors is read both ways by builders. Write ${seriesForm} (${seriesReading}) or ${parallelForm} (${parallelReading}).`,
			[seriesForm, parallelForm],
			[seriesReading, parallelReading]
		);
	}
	return { value, unit, parts, arrangement, ...extra, reading: networkReading(all, unit, arrangement, value) };
}

/** The micro sign (U+00B5): THE way values are written and shown (formatPartValue), never the Greek small mu. */
export const MICRO_SIGN = '\u00b5';
/** The Greek small letter mu (U+03BC), which keyboards and fonts often give instead of the micro sign. */
export const GREEK_MU = '\u03bc';

/**
 * A value as stored: the Greek small mu (U+03BC) written as the micro sign (U+00B5), so every value uses one sign.
 * withMicroSign('4μ7') → '4µ7' (U+00B5). Both parse alike (parseValue reads either); this keeps stored text uniform.
 */
export function withMicroSign(text: string): string {
	return text.replaceAll(GREEK_MU, MICRO_SIGN);
}

/**
 * The spellings of a search text that differ only in the micro sign: ['10000µ caps'] when it has neither sign, else
 * the text with every µ/μ as U+00B5 and as U+03BC (two entries), so a search for one finds text written with the other.
 */
export function microSpellings(text: string): string[] {
	if (!text.includes(MICRO_SIGN) && !text.includes(GREEK_MU)) return [text];
	return [withMicroSign(text), text.replaceAll(MICRO_SIGN, GREEK_MU)];
}

/** What GET /api/v1/parts/value answers: the value read for a part kind, its display and how it was read. */
export interface PartValueReading {
	kind: PartKind;
	value: number;
	unit: ValueUnit;
	display: string;
	parts: number;
	arrangement?: 'series' | 'parallel' | 'mixed';
	reading?: string;
	ratingV?: number;
	ratingAc?: boolean;
	tolerancePct?: number;
}

/**
 * Read a parts-list value for a part kind as the editor and the CSV import do. readPartValue('2×1u series', 'capacitor')
 * → { value: 5e-7, display: '500 nF', reading: 'two 1.00 µF in series = 500 nF', … }. Throws RangeError (an
 * AmbiguousPlusError for a bare "1u+1u") with a sentence; kinds without a value quantity (ic, hardware…) are refused.
 */
export function readPartValue(text: string, kind: PartKind): PartValueReading {
	const vk = valueKindOf(kind);
	if (!vk) throw new RangeError(`a ${kind} line keeps its value as text; only resistors, potentiometers, jumpers, capacitors and inductors have a value to read`);
	const p = parsePartValue(text, vk);
	return {
		kind,
		value: p.value,
		unit: p.unit,
		display: formatPartValue(p.value, p.unit),
		parts: p.parts,
		...(p.arrangement ? { arrangement: p.arrangement } : {}),
		...(p.reading ? { reading: p.reading } : {}),
		...(p.ratingV !== undefined ? { ratingV: p.ratingV, ratingAc: !!p.ratingAc } : {}),
		...(p.tolerancePct !== undefined ? { tolerancePct: p.tolerancePct } : {})
	};
}

/**
 * Deviation of a fitted value from the design value in percent: 100·(fitted − design)/design.
 * deviationPct(5e-7, 4.7e-7) → 6.38 (two 1 µF in series fitted for 0.47 µF). Null when design is 0 or either is missing.
 */
export function deviationPct(fitted: number | null | undefined, design: number | null | undefined): number | null {
	if (typeof fitted !== 'number' || typeof design !== 'number' || !Number.isFinite(fitted) || !Number.isFinite(design)) return null;
	if (design === 0) return null;
	return (100 * (fitted - design)) / design;
}

/** Whether a deviation stays inside a ± tolerance (inclusive); null when either is unknown. insideTolerance(6.38, 10) → true. */
export function insideTolerance(deviation: number | null | undefined, tolerancePct: number | null | undefined): boolean | null {
	if (typeof deviation !== 'number' || typeof tolerancePct !== 'number') return null;
	// Compare at display precision so +10.0 % counts as inside ±10 %.
	return Math.abs(Number(deviation.toFixed(6))) <= tolerancePct;
}

/** A deviation for display: formatDeviation(6.383) → "+6.4 %", formatDeviation(-12) → "−12.0 %". */
export function formatDeviation(deviation: number): string {
	const abs = Math.abs(deviation);
	const digits = abs >= 100 ? 0 : 1;
	const sign = Number(abs.toFixed(digits)) === 0 ? '±' : deviation > 0 ? '+' : '−';
	return `${sign}${abs.toFixed(digits)} %`;
}

/**
 * THE display of a part value (Ω, F, H) wherever parts are shown: an engineering prefix and `digits` significant
 * figures, trailing zeros kept (3 unless a field says otherwise), µ as U+00B5, Ω as U+03A9, one space.
 * formatPartValue(4700, 'ohm') → "4.70 kΩ"; formatPartValue(0.22, 'ohm') → "220 mΩ"; formatPartValue(5e-7, 'F') →
 * "500 nF"; text kinds (no number) → `text` as written.
 */
export function formatPartValue(value: number | null | undefined, unit: string | null | undefined, text = '', digits = 3): string {
	if (typeof value !== 'number' || !unit || !Number.isFinite(value)) return text;
	const symbol = unit === 'ohm' ? 'Ω' : unit;
	if (value === 0) return `0 ${symbol}`;
	const rounded = Number(Math.abs(value).toPrecision(digits));
	const exp3 = Math.min(12, Math.max(-15, Math.floor(Math.floor(Math.log10(rounded) + 1e-9) / 3) * 3));
	const prefix = PREFIXES.find(([e]) => e === exp3)![1];
	const mantissa = (rounded / 10 ** exp3).toPrecision(digits);
	// toPrecision may fall back to exponent form for mantissas ≥ 10^digits (e.g. 1000 GΩ): keep it plain.
	const plain = mantissa.includes('e') ? String(Number(mantissa)) : mantissa;
	return `${value < 0 ? '-' : ''}${plain} ${prefix}${symbol}`;
}

/**
 * A value as the maker typed it and its SI reading, for the parts list, compare, review and revision pages:
 * valueAsTyped({ valueText: '4k7', value: 4700, unit: 'ohm' }) → { typed: '4k7', si: '4.70 kΩ' }; si is null for
 * text kinds and when the typed text already says the same ("4.70 kΩ").
 */
export function valueAsTyped(l: { valueText: string | null; value: number | null; unit: string | null }): { typed: string; si: string | null } {
	const typed = (l.valueText ?? '').trim();
	const si = formatPartValue(l.value, l.unit);
	if (!si) return { typed: typed || '—', si: null };
	if (!typed) return { typed: si, si: null };
	const same = typed.replace(/\s+/g, '').replace(/[uμ]/g, 'µ').toLowerCase() === si.replace(/\s+/g, '').toLowerCase();
	return { typed, si: same ? null : si };
}

/** The design voltage rating written in a design value ("100u/63V" → 63 V DC, "100n 275VAC" → 275 V AC), volts null when none. */
export function designRatingOf(designValueText: string | null | undefined): { volts: number | null; ac: boolean } {
	if (!designValueText) return { volts: null, ac: false };
	const t = splitTails(designValueText);
	return { volts: t.ratingV ?? null, ac: !!t.ratingAc };
}

/** A voltage rating for display and the editor: voltageRatingText(275, true) → "275 V AC", voltageRatingText(63, false) → "63 V". */
export function voltageRatingText(volts: number, ac: boolean): string {
	return `${volts} V${ac ? ' AC' : ''}`;
}

/** Read a percent: "5", "5%", "±5 %", "+/-5%" → 5. */
export function parsePercent(text: string): number | null {
	const m = /^(?:±|\+\/-|\+-)?\s*(\d+(?:[.,]\d+)?)\s*%?$/.exec(text.trim());
	return m ? Number(m[1].replace(',', '.')) : null;
}

/**
 * Read a voltage rating: "63", "63V", "63 VDC", "1.5kV" → { volts, ac: false }; "275 V AC", "275VAC", "275 Vac",
 * "275 V~", "275 V a.c." → { volts: 275, ac: true } (X/Y capacitors are rated in V AC). Null when unreadable.
 */
export function parseVoltageRating(text: string): { volts: number; ac: boolean } | null {
	const m = /^(\d+(?:[.,]\d+)?)\s*(k?)\s*(?:V\s*(?:(AC|a\.c\.|~)|DC|d\.c\.)?)?$/i.exec(text.trim());
	return m ? { volts: Number(m[1].replace(',', '.')) * (m[2] ? 1000 : 1), ac: !!m[3] } : null;
}

/** Read a power rating: "0.25", "1/4", "1/4 W", "250mW" → watts. */
export function parseWatts(text: string): number | null {
	const t = text.trim();
	const frac = /^(\d+)\s*\/\s*(\d+)\s*W?$/i.exec(t);
	if (frac) return Number(frac[2]) === 0 ? null : Number(frac[1]) / Number(frac[2]);
	const m = /^(\d+(?:[.,]\d+)?)\s*(m?)\s*W?$/i.exec(t);
	if (!m) return null;
	return Number(m[1].replace(',', '.')) * (m[2] ? 1e-3 : 1);
}
