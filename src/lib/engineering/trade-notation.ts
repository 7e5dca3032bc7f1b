/**
 * More of the trade's ways of writing a fitted value, read into forms the value parser already knows
 * (kept apart from values.ts on purpose). Pure; runs in the browser (live hints) and on the server.
 *
 * - counts: "2×10000u", "2 x 4700u", "2*10k" are that many equal parts in parallel; "2×1u series" and
 *   "2×1u parallel" say it outright → "10000u||10000u", "1u+1u", "1u||1u";
 * - capacitor markings with a voltage code (EIA-198 / JIS C 5101 style, as printed on film and ceramic
 *   capacitors): "2A104J" = 100 V, 100 000 pF, J (±5 %); a plain code with a tolerance letter and a voltage
 *   written after it ("472J 100V") is read by decodeMarking once the voltage is split off;
 * - a bare "+" between capacitor values: many builders read 1u+1u as parallel (the capacitances add),
 *   others as series, so $lib/parts asks which is meant (AmbiguousPlusError) instead of reading it.
 */
import { decodeMarking, formatValue } from './values';

/** Largest count accepted in "N×value" (a bank of 50 capacitors is already a lot). */
export const MAX_COUNT = 50;

const COUNT = /^(\d{1,3})\s*(?:×|x|X|\*)\s*(\S+?)(?:\s+(?:in\s+)?(series|parallel))?$/;

/**
 * "N×value [series|parallel]" → the same network in "+" / "||" notation, or null when the text is not a
 * count. A count without a word is parallel (a bank of equal capacitors, "2×10000u" per rail).
 * expandCount('2×1u series') → { text: '1u+1u', count: 2, arrangement: 'series' }. Throws RangeError for a
 * count below 2 or above MAX_COUNT.
 */
export function expandCount(text: string): { text: string; count: number; arrangement: 'series' | 'parallel' } | null {
	const m = COUNT.exec(text.trim());
	if (!m) return null;
	const count = Number(m[1]);
	if (count < 2 || count > MAX_COUNT) throw new RangeError(`"${text}": a count of parts is between 2 and ${MAX_COUNT}`);
	const arrangement = (m[3]?.toLowerCase() as 'series' | 'parallel' | undefined) ?? 'parallel';
	return { text: Array(count).fill(m[2]).join(arrangement === 'series' ? '+' : '||'), count, arrangement };
}

/**
 * EIA voltage codes on capacitors: a digit (the power of ten) and a letter (the significand), e.g. 2A =
 * 1.0 × 10² V = 100 V, 1H = 5.0 × 10¹ V = 50 V, 2J = 6.3 × 10² V = 630 V. The letter significands (from
 * memory, as in EIA-198 / JIS C 5101-1 tables): A 1.0, B 1.25, C 1.6, D 2.0, E 2.5, F 3.15, G 4.0, H 5.0,
 * J 6.3, K 8.0, V 3.5, W 4.5, Z 9.0. Codes 0–3 only (up to 9 kV).
 */
const VOLTAGE_SIGNIFICAND: Readonly<Record<string, number>> = { A: 1, B: 1.25, C: 1.6, D: 2, E: 2.5, F: 3.15, G: 4, H: 5, J: 6.3, K: 8, V: 3.5, W: 4.5, Z: 9 };

/** The voltage of an EIA voltage code ("2A" → 100, "1H" → 50, "0J" → 6.3), or null when it is not one. */
export function voltageCodeV(code: string): number | null {
	const m = /^([0-3])([A-Z])$/.exec(code.trim().toUpperCase());
	if (!m) return null;
	const sig = VOLTAGE_SIGNIFICAND[m[2]];
	if (sig === undefined) return null;
	return Number((sig * 10 ** Number(m[1])).toPrecision(3));
}

/** A decoded capacitor marking with its voltage. */
export interface CapacitorMarking {
	value: number;
	unit: 'F';
	ratingV: number;
	tolerancePct?: number;
	/** "100 nF ±5 % 100 V" */
	display: string;
}

/**
 * Decode a capacitor marking that carries a voltage code before the value code: "2A104J" → 100 nF, ±5 %,
 * 100 V; "1H473" → 47 nF, 50 V. Null when the text does not start like one (so other readings can try);
 * RangeError with the reason when it does but a part cannot be decoded (an unknown voltage letter, a
 * tolerance letter that is not F G J K M).
 */
export function decodeVoltageCodedMarking(text: string): CapacitorMarking | null {
	const s = text.trim().replace(/\s+/g, '').toUpperCase();
	const m = /^([0-3][A-Z])(\d{3})([A-Z])?$/.exec(s);
	if (!m) return null;
	const ratingV = voltageCodeV(m[1]);
	if (ratingV === null)
		throw new RangeError(`"${text}": "${m[1]}" is not a capacitor voltage code (a digit 0–3 and one of A B C D E F G H J K V W Z, e.g. 2A = 100 V)`);
	let decoded;
	try {
		decoded = decodeMarking(`${m[2]}${m[3] ?? ''}`, 'capacitor');
	} catch (e) {
		throw new RangeError(`"${text}": the value code "${m[2]}${m[3] ?? ''}" — ${(e as Error).message}`);
	}
	const tol = decoded.tolerancePct;
	return {
		value: decoded.value,
		unit: 'F',
		ratingV,
		...(tol !== undefined ? { tolerancePct: tol } : {}),
		display: `${formatValue(decoded.value, 'F')}${tol !== undefined ? ` ±${tol} %` : ''} ${ratingV} V`
	};
}

/**
 * A three-digit capacitor code with its tolerance letter ("472J", "104K"), decoded as pF; null when the
 * text is not one. Bare digits ("104") are left to the value parser: in a value field they are as often
 * meant as µF. "472J" → 4.7 nF ±5 %.
 */
export function decodeCapacitorCode(text: string): { value: number; tolerancePct?: number } | null {
	const s = text.trim();
	if (!/^\d{3}[FGJKM]$/.test(s)) return null;
	const d = decodeMarking(s, 'capacitor');
	return { value: d.value, ...(d.tolerancePct !== undefined ? { tolerancePct: d.tolerancePct } : {}) };
}
