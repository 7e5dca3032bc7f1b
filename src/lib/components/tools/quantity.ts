/**
 * Reading what a maker types into a bench-tool field. Component values (Ω, F, H) go through the
 * engineering library's parseValue, so `4k7`, `100n` and `10000u` mean what the trade means by them;
 * plain quantities (V, A, W, °C, K/W, Hz, %) are read here: a decimal number (comma or point), an optional
 * SI prefix where the unit takes one, and an optional unit. Nothing here computes an engineering result.
 */
import { InputRangeError, parseValue, type ValueKind } from '$lib/engineering';

/** How a field is read: a component value of one kind, or a plain number in a unit. */
export type QuantitySpec =
	| { kind: ValueKind }
	| { kind: 'plain'; unit: string; min?: number; max?: number; minExclusive?: boolean; integer?: boolean };

/** The outcome of reading a field: a number, or a sentence a maker understands. */
export type Reading = { ok: true; value: number } | { ok: false; error: string };

const PREFIX: Readonly<Record<string, number>> = { p: 1e-12, n: 1e-9, u: 1e-6, µ: 1e-6, m: 1e-3, k: 1e3, M: 1e6, G: 1e9 };
/** Units that take SI prefixes (mA, kW, mV); °C, K/W, % and ratios do not. */
const PREFIXABLE = new Set(['V', 'A', 'W', 'Hz', 'VA', 's', 'J', 'Vrms', 'Vpp']);
/** Other spellings accepted for a unit. */
const ALIASES: Readonly<Record<string, string[]>> = {
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
 * Read a plain number in `unit`: "35" → 35, "35 V" → 35, "0,8" → 0.8, "300m" or "300 mA" (unit A) → 0.3,
 * "1.5k" (unit W) → 1500. Throws RangeError with a sentence for anything else.
 */
export function parsePlain(text: string, unit: string): number {
	const s = String(text)
		.trim()
		.replace(/[\u2212\u2013]/g, '-')
		.replace(/\u03bc/g, 'µ');
	if (s === '') throw new RangeError('Enter a value.');
	const m = /^([+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/.exec(s);
	if (!m) throw new RangeError(`Cannot read "${text}" as a number${unit ? ` of ${unit}` : ''}: write e.g. 35${unit ? ` or 35 ${unit}` : ''}.`);
	let value = Number(m[1].replace(',', '.'));
	let rest = m[2].trim();
	const spellings = ALIASES[unit] ?? [unit];
	const stripUnit = (r: string) => {
		for (const u of spellings) if (u && r.toLowerCase().endsWith(u.toLowerCase())) return r.slice(0, r.length - u.length).trim();
		return null;
	};
	const withoutUnit = rest === '' ? '' : stripUnit(rest);
	if (withoutUnit !== null) rest = withoutUnit;
	if (rest !== '') {
		const factor = PREFIXABLE.has(unit) ? PREFIX[rest] : undefined;
		if (factor === undefined)
			throw new RangeError(
				`Cannot read "${text}"${unit ? ` as ${unit}` : ''}: ${PREFIXABLE.has(unit) ? `use a number, optionally with a prefix (m, k) and ${unit}` : `use a plain number${unit ? ` of ${unit}` : ''}`}.`
			);
		value *= factor;
	}
	if (!Number.isFinite(value)) throw new RangeError(`"${text}" is not a finite number.`);
	return Number(value.toPrecision(12));
}

const KIND_EXAMPLES: Record<ValueKind, string> = {
	resistance: '4k7, 2R2, 0R22, 22k or 8 ohm',
	capacitance: '100n, 4u7, 10000u or 0.47 µF',
	inductance: '10u, 1m or 4.7 µH'
};

/** Read a field by its spec; never throws. read('4k7', { kind: 'resistance' }) → { ok: true, value: 4700 }. */
export function readQuantity(text: string, spec: QuantitySpec): Reading {
	try {
		if (spec.kind === 'plain') {
			const value = parsePlain(text, spec.unit);
			const u = spec.unit ? ` ${spec.unit}` : '';
			if (spec.integer && !Number.isInteger(value)) return { ok: false, error: 'Enter a whole number.' };
			if (spec.min !== undefined) {
				if (spec.minExclusive ? !(value > spec.min) : !(value >= spec.min))
					return { ok: false, error: `Must be ${spec.minExclusive ? 'more than' : 'at least'} ${spec.min}${u}.` };
			}
			if (spec.max !== undefined && value > spec.max) return { ok: false, error: `Must be at most ${spec.max}${u}.` };
			return { ok: true, value };
		}
		if (String(text).trim() === '') return { ok: false, error: 'Enter a value.' };
		const parsed = parseValue(text, spec.kind);
		if (!(parsed.value > 0)) return { ok: false, error: `A ${spec.kind} must be more than zero.` };
		return { ok: true, value: parsed.value };
	} catch (err) {
		const message = err instanceof Error ? err.message : String(err);
		if (spec.kind === 'plain') return { ok: false, error: message };
		if (/^Cannot read/.test(message))
			return { ok: false, error: `Cannot read "${text}" as a ${spec.kind}: write e.g. ${KIND_EXAMPLES[spec.kind]}.` };
		return { ok: false, error: `${message.replace(/\.$/, '')}. Write e.g. ${KIND_EXAMPLES[spec.kind]}.` };
	}
}

/** A library call's outcome: its result, or the error with the input field it names (InputRangeError.field). */
export type Attempt<T> = { ok: true; value: T } | { ok: false; field?: string; error: string };

/** Run a library computation without letting it throw into the page. */
export function attempt<T>(compute: () => T): Attempt<T> {
	try {
		return { ok: true, value: compute() };
	} catch (err) {
		if (err instanceof InputRangeError) return { ok: false, field: err.field, error: err.message };
		return { ok: false, error: err instanceof Error ? err.message : String(err) };
	}
}

/**
 * The error of an attempt when it is about `field`, with code names replaced by labels. `labels` is the
 * field's label, or a map of every field's label (so a message naming two fields reads well).
 */
export function fieldError(result: Attempt<unknown> | null, field: string, labels: string | Readonly<Record<string, string>>): string | undefined {
	if (!result || result.ok || result.field !== field) return undefined;
	const map: Readonly<Record<string, string>> = typeof labels === 'string' ? { [field]: labels } : labels;
	let text = result.error;
	for (const [name, label] of Object.entries(map)) text = text.replace(new RegExp(`\\b${name}\\b`, 'g'), label);
	return text.charAt(0).toUpperCase() + text.slice(1);
}
