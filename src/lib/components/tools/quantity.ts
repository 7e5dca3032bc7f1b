/**
 * Reading what a maker types into a bench-tool field. Component values (Ω, F, H) go through the
 * engineering library's parseValue, so `4k7`, `100n` and `10000u` mean what the trade means by them;
 * plain quantities (V, A, W, °C, K/W, Hz, %) by its parseQuantity (the spec forms read them the same way).
 * Nothing here computes an engineering result.
 */
import { InputRangeError, parseQuantity, parseValue, type ValueKind } from '$lib/engineering';

/** How a field is read: a component value of one kind, or a plain number in a unit. */
export type QuantitySpec =
	| { kind: ValueKind }
	| { kind: 'plain'; unit: string; min?: number; max?: number; minExclusive?: boolean; integer?: boolean };

/** The outcome of reading a field: a number, or a sentence a maker understands. */
export type Reading = { ok: true; value: number } | { ok: false; error: string };

/**
 * Read a plain number in `unit` (the engineering library's parseQuantity): "35" → 35, "35 V" → 35, "0,8" → 0.8,
 * "300m" or "300 mA" (unit A) → 0.3, "1.5k" (unit W) → 1500. Throws RangeError with a sentence for anything else.
 */
export const parsePlain = (text: string, unit: string): number => parseQuantity(text, unit);

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
