/**
 * IEC 60063 preferred-number series (E3 … E192) and snapping a value to the nearest member.
 * E3–E24 are hard-coded (8 of the 24 E24 values differ from the rounded geometric series);
 * E48/E96/E192 are round(10^(i/n), 3 significant figures), with E192's one known exception 9.20
 * (from memory; the computed value is 9.19).
 */
import { InputRangeError, cleanNumber } from './values';

/** Series names, coarsest first. */
export const E_SERIES = ['E3', 'E6', 'E12', 'E24', 'E48', 'E96', 'E192'] as const;
/** One of the IEC 60063 series names. */
export type ESeriesName = (typeof E_SERIES)[number];

// IEC 60063 (as tabulated in public encyclopedia summaries of the standard), REFERENCE.md §6.4.
const E24 = [
	1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1
];
const E12 = [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2];
const E6 = [1.0, 1.5, 2.2, 3.3, 4.7, 6.8];
const E3 = [1.0, 2.2, 4.7];

function geometric(n: number): number[] {
	const out: number[] = [];
	for (let i = 0; i < n; i++) out.push(Math.round(10 ** (i / n) * 100) / 100);
	return out;
}

const TABLE: Record<ESeriesName, readonly number[]> = {
	E3,
	E6,
	E12,
	E24,
	E48: geometric(48),
	E96: geometric(96),
	// E192: the published list has 9.20 where round(10^(185/192)) gives 9.19 (from memory).
	E192: geometric(192).map((m) => (m === 9.19 ? 9.2 : m))
};

/** True when `name` is one of E_SERIES. isESeriesName('E12') → true. */
export function isESeriesName(name: string): name is ESeriesName {
	return (E_SERIES as readonly string[]).includes(name);
}

/** The decade mantissas (1 ≤ m < 10) of a series, ascending. eSeriesMantissas('E6') → [1, 1.5, 2.2, 3.3, 4.7, 6.8]. */
export function eSeriesMantissas(series: ESeriesName): number[] {
	const t = TABLE[series];
	if (!t) throw new InputRangeError('series', `unknown E-series "${String(series)}"; use one of ${E_SERIES.join(', ')}`);
	return [...t];
}

/** Result of snapping to a series; all values in the input's unit. */
export interface ESeriesSnap {
	nearest: number;
	below: number;
	above: number;
	errorPct: number;
}

/**
 * Nearest member of an E-series by ratio (log distance; a tie goes to the larger), plus the
 * largest member ≤ value and the smallest ≥ value (both may cross a decade), and
 * errorPct = 100·(nearest − value)/value. nearestESeries(5000, 'E12') → { nearest: 4700, below: 4700, above: 5600, errorPct: -6 }.
 */
export function nearestESeries(value: number, series: ESeriesName = 'E12'): ESeriesSnap {
	if (!(Number.isFinite(value) && value > 0)) throw new InputRangeError('value', 'value must be a finite number greater than 0');
	const mantissas = eSeriesMantissas(series);
	const decade = Math.floor(Math.log10(value));
	const candidates: number[] = [];
	for (let d = decade - 1; d <= decade + 1; d++) {
		for (const m of mantissas) {
			// m·100 is an integer for every series; scale from it to avoid 1.1·100 = 110.00000000000001.
			const c = cleanNumber(d >= 2 ? Math.round(m * 100) * 10 ** (d - 2) : Math.round(m * 100) / 10 ** (2 - d));
			candidates.push(c);
		}
	}
	let below = -Infinity;
	let above = Infinity;
	for (const c of candidates) {
		if (c <= value && c > below) below = c;
		if (c >= value && c < above) above = c;
	}
	const dBelow = Math.log(value / below);
	const dAbove = Math.log(above / value);
	// A tie (equal log distance, within rounding) goes to the larger value.
	const nearest = dAbove <= dBelow + 1e-12 ? above : below;
	return { nearest, below, above, errorPct: (100 * (nearest - value)) / value };
}
