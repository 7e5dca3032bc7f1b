/**
 * Component values in the trade's notation: SI prefixes, RKM codes (IEC 60062),
 * 3- and 4-digit markings, potentiometer markings, and the display format.
 * Pure TypeScript: no I/O, runs in the browser and on the server.
 */

/** What a value measures. */
export type ValueKind = 'resistance' | 'capacitance' | 'inductance';
/** SI base unit of a value kind. */
export type ValueUnit = 'ohm' | 'F' | 'H';
/** How to read a plain value (parseValue). */
export type ValueAs = ValueKind | 'auto';
/** How to read a component marking (decodeMarking). */
export type MarkingAs = 'resistor' | 'capacitor' | 'inductor' | 'potentiometer' | 'auto';

/** A parsed value: SI number plus its kind and unit. */
export interface ParsedValue {
	kind: ValueKind;
	value: number;
	unit: ValueUnit;
	tolerancePct?: number;
}

/** A decoded marking, field for field as API.md's decode output. */
export interface DecodedMarking extends ParsedValue {
	taper?: string;
	taperNote?: string;
	display: string;
}

/**
 * RangeError that names the input field it is about, so an API route can answer 422
 * with the right issue path. new InputRangeError('outputW', 'outputW is above …').field → 'outputW'.
 */
export class InputRangeError extends RangeError {
	readonly field: string;
	constructor(field: string, message: string) {
		super(message);
		this.name = 'InputRangeError';
		this.field = field;
	}
}

/** Marking kinds and the quantity each one carries. */
export const MARKING_KINDS = ['resistor', 'capacitor', 'inductor', 'potentiometer', 'auto'] as const;

const UNIT_OF: Record<ValueKind, ValueUnit> = { resistance: 'ohm', capacitance: 'F', inductance: 'H' };
const KIND_OF_MARKING: Record<Exclude<MarkingAs, 'auto'>, ValueKind> = {
	resistor: 'resistance',
	capacitor: 'capacitance',
	inductor: 'inductance',
	potentiometer: 'resistance'
};

/** Round away binary noise (47 × 0.1 → 4.7) without touching real digits; 12 significant figures. */
export function cleanNumber(x: number): number {
	return x === 0 ? 0 : Number(x.toPrecision(12));
}

/** SI prefixes a plain quantity may carry ("300m" A, "1.5k" W, "20k" Hz). */
export const QUANTITY_PREFIX: Readonly<Record<string, number>> = { p: 1e-12, n: 1e-9, u: 1e-6, µ: 1e-6, m: 1e-3, k: 1e3, K: 1e3, M: 1e6, G: 1e9 };
/** Units that take SI prefixes (mA, kW, mV, kHz; '' = a bare number); °C, K/W, % and ratios do not. */
const PREFIXABLE = new Set(['', 'V', 'A', 'W', 'Hz', 'VA', 's', 'J', 'Vrms', 'Vpp']);
/** Other spellings accepted for a unit. */
const UNIT_ALIASES: Readonly<Record<string, string[]>> = {
	'°C': ['°C', 'C', 'degC', '° C'],
	'K/W': ['K/W', '°C/W', 'C/W'],
	Hz: ['Hz', 'hz'],
	V: ['V', 'v'],
	Vrms: ['Vrms', 'V rms', 'V'],
	Vpp: ['Vpp', 'V p-p', 'V'],
	A: ['A', 'a'],
	W: ['W', 'w'],
	'%': ['%'],
	s: ['s']
};

/**
 * Read a plain quantity as a maker types it, in `unit`: a decimal number (point or comma, e notation, a typographic
 * minus), an optional SI prefix where the unit takes one, and an optional unit. "35" → 35, "35 V" → 35, "0,8" → 0.8,
 * "300m" or "300 mA" (unit A) → 0.3, "1.5k" (unit W) → 1500, "20k" (unit '') → 20000. Component values (Ω, F, H)
 * are read by parseValue instead. Throws RangeError with a sentence for anything else.
 */
export function parseQuantity(text: string, unit = ''): number {
	const s = String(text)
		.trim()
		.replace(/[\u2212\u2013]/g, '-')
		.replace(/\u03bc/g, 'µ');
	if (s === '') throw new RangeError('Enter a value.');
	const m = /^([+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/.exec(s);
	if (!m) throw new RangeError(`Cannot read "${text}" as a number${unit ? ` of ${unit}` : ''}: write e.g. 35${unit ? ` or 35 ${unit}` : ''}.`);
	let value = Number(m[1].replace(',', '.'));
	let rest = m[2].trim();
	const spellings = UNIT_ALIASES[unit] ?? [unit];
	const stripUnit = (r: string) => {
		for (const u of spellings) if (u && r.toLowerCase().endsWith(u.toLowerCase())) return r.slice(0, r.length - u.length).trim();
		return null;
	};
	const withoutUnit = rest === '' ? '' : stripUnit(rest);
	if (withoutUnit !== null) rest = withoutUnit;
	if (rest !== '') {
		const factor = PREFIXABLE.has(unit) ? QUANTITY_PREFIX[rest] : undefined;
		if (factor === undefined)
			throw new RangeError(
				`Cannot read "${text}"${unit ? ` as ${unit}` : ''}: ${PREFIXABLE.has(unit) ? `use a number, optionally with a prefix (m, k)${unit ? ` and ${unit}` : ''}` : `use a plain number${unit ? ` of ${unit}` : ''}`}.`
			);
		value *= factor;
	}
	if (!Number.isFinite(value)) throw new RangeError(`"${text}" is not a finite number.`);
	return cleanNumber(value);
}

/** Tolerance letters accepted after a code (API.md: F 1, G 2, J 5, K 10, M 20 %). IEC 60062 letter code. */
export const TOLERANCE_LETTERS: Readonly<Record<string, number>> = { F: 1, G: 2, J: 5, K: 10, M: 20 };

const ASYMMETRIC_LETTERS: Readonly<Record<string, string>> = {
	Z: 'Z means +80/−20 %, which is not a symmetric tolerance',
	P: 'P means +100/−0 %, which is not a symmetric tolerance',
	B: 'B means ±0.1 pF (an absolute tolerance for small capacitors), not a percentage',
	C: 'C means ±0.25 pF (an absolute tolerance for small capacitors), not a percentage',
	D: 'D means ±0.5 pF (an absolute tolerance for small capacitors), not a percentage'
};

/** Normalise spelling: µ/μ → u, Ω signs → Ω, trims; keeps letter case (m ≠ M). */
function normalise(text: string): string {
	return text
		.replace(/[\u00b5\u03bc]/g, 'u')
		.replace(/\u2126/g, 'Ω')
		.replace(/[\u2212\u2013]/g, '-')
		.trim();
}

/** Multiplier letters without a unit, per kind; 'R' is the decimal point at ×1 (IEC 60062 RKM). */
const LETTERS_NO_UNIT: Record<ValueKind, Readonly<Record<string, number>>> = {
	resistance: { R: 1, r: 1, K: 1e3, k: 1e3, M: 1e6, G: 1e9 },
	capacitance: { p: 1e-12, P: 1e-12, n: 1e-9, N: 1e-9, u: 1e-6, U: 1e-6, m: 1e-3 },
	inductance: { n: 1e-9, N: 1e-9, u: 1e-6, U: 1e-6, m: 1e-3 }
};

/** SI prefixes accepted when the unit is written out ("100 mΩ", "1 mF"). */
const SI_PREFIX: Readonly<Record<string, number>> = {
	'': 1,
	p: 1e-12,
	P: 1e-12,
	n: 1e-9,
	N: 1e-9,
	u: 1e-6,
	U: 1e-6,
	m: 1e-3,
	k: 1e3,
	K: 1e3,
	M: 1e6,
	G: 1e9,
	R: 1,
	r: 1
};

/** Which kind a multiplier letter implies when nothing else says (API.md auto rule). */
function kindFromLetter(letter: string, text: string): ValueKind {
	if ('RrKkMG'.includes(letter)) return 'resistance';
	if ('pPnNuU'.includes(letter)) return 'capacitance';
	if (letter === 'm')
		throw new RangeError(
			`"${text}": a lower-case m is ambiguous (milli, or a mistyped M for mega); write the unit, e.g. "4.7 mF", or pass the kind`
		);
	throw new RangeError(`"${text}": "${letter}" is not a multiplier letter`);
}

function unitFromSuffix(s: string): { rest: string; kind?: ValueKind } {
	const ohm = /(Ω|ohms?)$/i.exec(s);
	if (ohm) return { rest: s.slice(0, ohm.index), kind: 'resistance' };
	if (/[0-9a-zA-Z.]F$/.test(s) || /[0-9a-zA-Z.]f$/.test(s)) return { rest: s.slice(0, -1), kind: 'capacitance' };
	if (/[0-9a-zA-Z.][Hh]$/.test(s)) return { rest: s.slice(0, -1), kind: 'inductance' };
	return { rest: s };
}

/**
 * Parse a value written the way makers write it: SI prefixes with or without unit
 * ("4.7k", "4.7 kΩ", "100nF", "0.47u", "10 ohm"), RKM ("4k7", "2R2", "0R22", "R47", "4u7",
 * "1M0", "2n2", "5p6") and plain numbers (read as `as`). An optional "±5%" / " 5%" tail
 * sets tolerancePct. Throws RangeError when undecodable.
 * parseValue('4k7') → { kind: 'resistance', value: 4700, unit: 'ohm' }; parseValue('100n') → 1e-7 F.
 */
export function parseValue(text: string, as: ValueAs = 'auto'): ParsedValue {
	if (typeof text !== 'string') throw new RangeError('value text must be a string');
	let s = normalise(text);
	if (s === '') throw new RangeError('empty value');
	let tolerancePct: number | undefined;
	const tol = /(?:\s+|\s*(?:±|\+\/-|\+-)\s*)(\d+(?:\.\d+)?)\s*%$/.exec(s);
	if (tol) {
		tolerancePct = Number(tol[1]);
		if (!(tolerancePct > 0 && tolerancePct <= 100))
			throw new RangeError(`"${text}": tolerance must be above 0 % and at most 100 %`);
		s = s.slice(0, tol.index);
	}
	s = s.replace(/\s+/g, '');
	if (/^\d+,\d+/.test(s) && !s.includes('.')) s = s.replace(',', '.');
	const { rest, kind: unitKind } = unitFromSuffix(s);
	if (as !== 'auto' && unitKind && unitKind !== as)
		throw new RangeError(`"${text}" is written as a ${unitKind}, not a ${as}`);

	let magnitude: number;
	let letter = '';
	const si = /^(\d+(?:\.\d*)?|\.\d+)(?:[eE]([+-]?\d+))?([a-zA-Z]?)$/.exec(rest);
	const rkm = /^(\d*)([a-zA-Z])(\d+)$/.exec(rest);
	if (si) {
		magnitude = Number(si[1]) * (si[2] ? 10 ** Number(si[2]) : 1);
		letter = si[3];
	} else if (rkm && (rkm[1] !== '' || rkm[3] !== '')) {
		magnitude = Number(`${rkm[1] || '0'}.${rkm[3]}`);
		letter = rkm[2];
	} else {
		throw new RangeError(
			`Cannot read "${text}" as a value: expected e.g. 4.7k, 4k7, 100nF, 0.47u, 2R2 or 10 ohm`
		);
	}

	let kind: ValueKind;
	let multiplier: number;
	if (unitKind) {
		kind = unitKind;
		if (letter === 'R' || letter === 'r') {
			if (kind !== 'resistance') throw new RangeError(`"${text}": R is the ohm decimal point`);
		}
		const m = SI_PREFIX[letter];
		if (m === undefined) throw new RangeError(`"${text}": "${letter}" is not an SI prefix`);
		multiplier = m;
	} else if (letter === '') {
		if (as === 'auto')
			throw new RangeError(
				`"${text}" is a bare number: add a unit or a multiplier letter (4k7, 100n) or say which kind it is`
			);
		kind = as;
		multiplier = 1;
	} else {
		kind = as === 'auto' ? kindFromLetter(letter, text) : as;
		const m = LETTERS_NO_UNIT[kind][letter];
		if (m === undefined) {
			const implied = 'RrKkMG'.includes(letter) ? 'resistance' : 'pPnNuUm'.includes(letter) ? 'capacitance' : null;
			throw new RangeError(
				implied
					? `"${text}" reads as a ${implied}, not a ${kind}`
					: `"${text}": "${letter}" is not a multiplier letter`
			);
		}
		multiplier = m;
	}
	const value = cleanNumber(magnitude * multiplier);
	if (!Number.isFinite(value)) throw new RangeError(`"${text}" is not a finite value`);
	if (value === 0 && kind !== 'resistance')
		throw new RangeError(`"${text}": a ${kind} must be greater than zero`);
	const out: ParsedValue = { kind, value, unit: UNIT_OF[kind] };
	if (tolerancePct !== undefined) out.tolerancePct = tolerancePct;
	return out;
}

/** Engineering prefixes by power of ten (also read by $lib/parts formatPartValue). */
export const PREFIXES: ReadonlyArray<readonly [number, string]> = [
	[-15, 'f'],
	[-12, 'p'],
	[-9, 'n'],
	[-6, 'µ'],
	[-3, 'm'],
	[0, ''],
	[3, 'k'],
	[6, 'M'],
	[9, 'G'],
	[12, 'T']
];

/**
 * Display a value with 3 significant figures and an engineering prefix; µ is U+00B5,
 * Ω is U+03A9 (unit 'ohm'), one space. formatValue(4700, 'ohm') → "4.7 kΩ"; formatValue(1e-7, 'F') → "100 nF".
 */
export function formatValue(value: number, unit: ValueUnit | string): string {
	if (!Number.isFinite(value)) throw new RangeError('formatValue needs a finite number');
	const symbol = unit === 'ohm' ? 'Ω' : unit;
	if (value === 0) return `0 ${symbol}`.trim();
	const sign = value < 0 ? '-' : '';
	const rounded = Number(Math.abs(value).toPrecision(3));
	const exp10 = Number(rounded.toExponential(2).split('e')[1]);
	let exp3 = Math.floor(exp10 / 3) * 3;
	exp3 = Math.min(12, Math.max(-15, exp3));
	const prefix = PREFIXES.find(([e]) => e === exp3)?.[1] ?? '';
	const mantissa = Number((rounded / 10 ** exp3).toPrecision(3));
	return `${sign}${mantissa} ${prefix}${symbol}`.trim();
}

/** Potentiometer taper letters recognised before a value code ("B104"). */
const TAPER_LETTERS = 'ABCDFGLWXYZ';

/**
 * What a potentiometer taper letter means; it differs by region, so the text says so instead of guessing.
 * Sources: potentiometer-code support articles of a guitar-parts retailer and a pedal-builders' blog
 * (Asian/US vs older European letter sets, see REFERENCE.md §6.3).
 * taperNoteFor('A') mentions both "logarithmic" and "linear".
 */
export function taperNoteFor(letter: string): string {
	const measure =
		'Record the convention, or measure at mid-rotation: about 50 % of the track resistance means linear, about 10–20 % means audio (log).';
	switch (letter.toUpperCase()) {
		case 'A':
			return `A is logarithmic (audio) in the Asian/US convention used by most makers today, but linear in older European usage, so the letter alone is ambiguous. ${measure}`;
		case 'B':
			return `B is linear in the Asian/US convention used by most makers today, but logarithmic in older European usage. ${measure}`;
		case 'C':
			return `C is reverse-logarithmic in the Asian/US convention; older European usage has no C (it marks reverse log with F or Y). ${measure}`;
		default:
			return `${letter.toUpperCase()} is not one of the Asian/US letters A, B, C; in older European usage F or Y mark reverse log and some makers use L for log. Check the maker's data. ${measure}`;
	}
}

function digitCodeValue(digits: string, text: string): number {
	// 3 digits: two significant + multiplier; 4 digits: three significant + multiplier.
	const sig = Number(digits.slice(0, -1));
	const last = Number(digits.slice(-1));
	if (digits.length === 3) {
		// 8 → ×0.01 and 9 → ×0.1 (from memory; rare on small capacitors: "229" = 2.2 pF).
		if (last === 8) return sig / 100;
		if (last === 9) return sig / 10;
		return sig * 10 ** last;
	}
	if (last >= 8) throw new RangeError(`"${text}": a 4-digit code's multiplier digit must be 0–7`);
	return sig * 10 ** last;
}

function finishMarking(kind: ValueKind, value: number, tolerancePct?: number, taper?: string): DecodedMarking {
	const v = cleanNumber(value);
	if (!Number.isFinite(v)) throw new RangeError('marking value is not finite');
	if (v === 0 && kind !== 'resistance') throw new RangeError(`a ${kind} marking cannot be zero`);
	const out: DecodedMarking = { kind, value: v, unit: UNIT_OF[kind], display: formatValue(v, UNIT_OF[kind]) };
	if (tolerancePct !== undefined) out.tolerancePct = tolerancePct;
	if (taper !== undefined) {
		out.taper = taper;
		out.taperNote = taperNoteFor(taper);
	}
	return out;
}

function toleranceFromLetter(letter: string, text: string): number {
	const pct = TOLERANCE_LETTERS[letter];
	if (pct !== undefined) return pct;
	const why = ASYMMETRIC_LETTERS[letter];
	throw new RangeError(
		why
			? `"${text}": ${why}; the accepted tolerance letters are F, G, J, K and M`
			: `"${text}": "${letter}" is not a tolerance letter (F 1 %, G 2 %, J 5 %, K 10 %, M 20 %)`
	);
}

/** Unit of a bare digit code per kind: capacitors pF, inductors µH, resistors/pots Ω. */
const DIGIT_CODE_SCALE: Record<ValueKind, number> = { resistance: 1, capacitance: 1e-12, inductance: 1e-6 };

/** RKM letters on markings: as parseValue, plus R as the decimal point of pF (capacitors) or µH (inductors). */
function markingLetter(kind: ValueKind, letter: string): number | undefined {
	if (letter === 'R' || letter === 'r') return kind === 'resistance' ? 1 : DIGIT_CODE_SCALE[kind];
	return LETTERS_NO_UNIT[kind][letter];
}

/**
 * Decode a component marking per API.md: RKM codes ("4k7", "2R2", "100n", "4u7", "1M0"),
 * 3-digit codes (capacitor pF, inductor µH, resistor Ω), 4-digit resistor codes, an optional
 * tolerance letter F G J K M after ≥ 3 digits, potentiometer markings ("B104" → taper + ohms).
 * With 'auto': RKM letter decides; bare 3 digits → capacitor pF; bare 4 digits → resistor Ω.
 * decodeMarking('473J') → { kind: 'capacitance', value: 4.7e-8, unit: 'F', tolerancePct: 5, display: '47 nF' }.
 */
export function decodeMarking(code: string, as: MarkingAs = 'auto'): DecodedMarking {
	if (typeof code !== 'string') throw new RangeError('code must be a string');
	const s = normalise(code).replace(/\s+/g, '');
	if (s === '') throw new RangeError('empty marking');
	if (s.length > 32) throw new RangeError('marking is too long (at most 32 characters)');

	// 1. Potentiometer: taper letter + 3-digit code ("B104") or + RKM ("B10K", "A1M").
	const pot = /^([A-Za-z])-?(\d{3}|\d+(?:\.\d+)?[kKM]|\d+[kKMR]\d+)$/.exec(s);
	if (pot && TAPER_LETTERS.includes(pot[1].toUpperCase()) && (as === 'auto' || as === 'potentiometer')) {
		const inner = pot[2];
		const value = /^\d{3}$/.test(inner) ? digitCodeValue(inner, code) : parseValue(inner, 'resistance').value;
		return finishMarking('resistance', value, undefined, pot[1].toUpperCase());
	}
	if (pot && TAPER_LETTERS.includes(pot[1].toUpperCase()) && pot[1] === pot[1].toUpperCase() && /^\d{3}$/.test(pot[2]))
		throw new RangeError(`"${code}" looks like a potentiometer marking (taper letter + value), not a ${as}`);

	// 2. Digit codes with an optional letter.
	const dig = /^(\d{1,4})([A-Za-z])?$/.exec(s);
	if (dig && !(dig[2] && dig[1].length <= 2)) {
		const digits = dig[1];
		const letter: string | undefined = dig[2];
		const kind: ValueKind =
			as === 'auto' ? (digits.length === 4 ? 'resistance' : 'capacitance') : KIND_OF_MARKING[as];
		// Resistors and pots: a K/M/R after digits is the RKM multiplier ("470K" = 470 kΩ), not a tolerance.
		const rkmAfterDigits = letter !== undefined && kind === 'resistance' && 'KkMRr'.includes(letter);
		// Only a tolerance-letter candidate counts as one; "100n", "100N", "470R" are RKM.
		const toleranceCandidate =
			letter === undefined || TOLERANCE_LETTERS[letter] !== undefined || ASYMMETRIC_LETTERS[letter] !== undefined;
		if (!rkmAfterDigits && toleranceCandidate) {
			let tolerancePct: number | undefined;
			if (letter !== undefined) tolerancePct = toleranceFromLetter(letter, code);
			if (digits.length <= 2) {
				if (kind === 'inductance') throw new RangeError(`"${code}": 1- and 2-digit inductor markings are not standard`);
				// One- or two-digit markings are plain pF on capacitors (REFERENCE.md §6.2), plain Ω on resistors.
				return finishMarking(kind, Number(digits) * DIGIT_CODE_SCALE[kind], tolerancePct);
			}
			if (digits.length === 4 && kind !== 'resistance')
				throw new RangeError(`"${code}": 4-digit codes are resistor codes`);
			return finishMarking(kind, digitCodeValue(digits, code) * DIGIT_CODE_SCALE[kind], tolerancePct);
		}
	}

	// 3. RKM: digits, a multiplier letter in the decimal point's place, digits, optional tolerance letter.
	const rkm = /^(\d*)([A-Za-z])(\d*)([A-Z])?$/.exec(s);
	if (rkm && (rkm[1] !== '' || rkm[3] !== '')) {
		const [, before, letter, after, tail] = rkm;
		let kind: ValueKind;
		if (as === 'auto') {
			if (!'RrKkMmpPnNuU'.includes(letter)) throw new RangeError(`"${code}": "${letter}" is not a multiplier letter`);
			// A trailing H names the unit: "10uH" is an inductance.
			kind = tail === 'H' && 'nNuUm'.includes(letter) ? 'inductance' : kindFromLetter(letter, code);
		} else kind = KIND_OF_MARKING[as];
		const mult = markingLetter(kind, letter);
		if (mult === undefined) {
			const implied = 'RrKkMG'.includes(letter) ? 'resistor' : 'pPnNuU'.includes(letter) ? 'capacitor' : null;
			throw new RangeError(
				implied ? `"${code}" reads as a ${implied} code, not a ${as}` : `"${code}": "${letter}" is not a multiplier letter`
			);
		}
		let tolerancePct: number | undefined;
		if (tail !== undefined) {
			const unitTail = (kind === 'capacitance' && tail === 'F') || (kind === 'inductance' && tail === 'H');
			if (!unitTail) tolerancePct = toleranceFromLetter(tail, code);
		}
		return finishMarking(kind, Number(`${before || '0'}.${after}`) * mult, tolerancePct);
	}

	// 4. Anything else written with SI prefixes and a unit ("4.7 kΩ", "0.47uF").
	try {
		const parsed = parseValue(code, as === 'auto' ? 'auto' : KIND_OF_MARKING[as]);
		return finishMarking(parsed.kind, parsed.value, parsed.tolerancePct);
	} catch (err) {
		const why = err instanceof Error ? err.message : String(err);
		throw new RangeError(
			`Cannot decode "${code}"${as === 'auto' ? '' : ` as a ${as} marking`}: expected an RKM code (4k7, 2R2, 100n), a 3- or 4-digit code (104, 474K, 4702) or a potentiometer marking (B104). ${why}`
		);
	}
}
