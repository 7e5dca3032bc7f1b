/**
 * Shared types and field helpers of the spec-block kinds (PRODUCT.md §4.3, API.md "Spec checking").
 */
import { z } from 'zod';

/** Severity of a check: note (worth knowing), caution (look at it), danger (can hurt someone or something). */
export type CheckLevel = 'note' | 'caution' | 'danger';

/** One automatic finding on a spec block; only checks that fire are returned. */
export interface Check {
	/** Stable id the UI and tests refer to, e.g. "supply.no-fuse". */
	id: string;
	level: CheckLevel;
	/** Human sentence with the numbers that made it fire. */
	message: string;
	/** The numbers compared, with units in the names. */
	values: Record<string, number | string | boolean | null>;
	/** Safety caution shown with the check where mains, stored charge or heat is involved. */
	caution?: string;
}

/** What a derive function returns: derived values (bench-tool names) and the checks that fired. */
export interface SpecResult<D extends Record<string, unknown> = Record<string, unknown>> {
	derived: D;
	checks: Check[];
}

/** Caution shown with checks about mains wiring and earthing. */
export const MAINS_CAUTION =
	'Mains voltage can kill. This check points it out and explains; it does not certify anything. Defer to local codes and licensed practice.';
/** Caution shown with checks about stored charge. */
export const CHARGE_CAUTION =
	'Reservoir capacitors keep their charge after switch-off: measure before touching and discharge through a resistor. This check certifies nothing; defer to local codes and licensed practice.';
/** Caution shown with checks about heat. */
export const HEAT_CAUTION =
	'Heatsinks and parts can get hot enough to burn and to fail. This check points it out and explains; it certifies nothing. Defer to local codes and licensed practice.';

/** Number field with inclusive bounds and clear messages: num(0.5, 1e5, 'Ω') rejects 0.2 with "must be at least 0.5 Ω". */
export function num(min: number, max: number, unit = '') {
	const u = unit ? ` ${unit}` : '';
	return z
		.number({ error: (iss) => (iss.input === undefined ? 'required' : 'must be a number') })
		.min(min, `must be at least ${min}${u}`)
		.max(max, `must be at most ${max}${u}`);
}

/** Number field that must be strictly greater than min: pos(1000, 'V') rejects 0 with "must be greater than 0 V". */
export function pos(max: number, unit = '') {
	const u = unit ? ` ${unit}` : '';
	return z
		.number({ error: (iss) => (iss.input === undefined ? 'required' : 'must be a number') })
		.gt(0, `must be greater than 0${u}`)
		.max(max, `must be at most ${max}${u}`);
}

/** Boolean field with a clear message. */
export function flag() {
	return z.boolean({ error: (iss) => (iss.input === undefined ? 'required' : 'must be true or false') });
}

/** Enum field with a clear message listing the choices. */
export function oneOf<const T extends readonly [string, ...string[]]>(values: T) {
	return z.enum(values, { error: (iss) => (iss.input === undefined ? 'required' : `must be one of ${values.join(', ')}`) });
}

/**
 * Round for messages: 3 significant figures, the same rounding as every spec display and bench tool (no trailing
 * zeros, thousands grouped from 10 000). fmt(31.0296) → "31"; fmt(40.81) → "40.8"; fmt(12345) → "12,300".
 */
export function fmt(x: number): string {
	if (!Number.isFinite(x)) return String(x);
	if (x === 0) return '0';
	return Number(x.toPrecision(3)).toLocaleString('en-GB', { maximumSignificantDigits: 3, useGrouping: Math.abs(x) >= 1e4 });
}
