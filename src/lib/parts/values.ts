/**
 * Part values in the trade's notation (PRODUCT.md §4.4): parsing per part kind, fitted values written as
 * series/parallel networks, ratings and tolerances, substitution deviation, and display.
 *
 * Value notation (shown in the editor):
 * - one part: SI prefix or RKM code — `4k7`, `4.7k`, `2R2`, `0R22`, `100n`, `0.47u`, `4u7`, `10uH`, `1M0`;
 * - a network of fitted parts: `+` joins parts in SERIES, `||` joins parts in PARALLEL, and `||` binds
 *   tighter than `+` (as in circuit notes): `1u+1u` (two 1 µF in series = 500 nF), `10k||10k` (5 kΩ),
 *   `1k + 10k||10k` (6 kΩ);
 * - an optional voltage rating after a space or slash — `100u/63V`, `100u 63V` — and a tolerance —
 *   `4k7 ±1%`, `100n 10%`;
 * - a resistor position bridged by a wire: kind "jumper", or value `0R`, `0`, `link`, `jumper`.
 */
import { formatValue, networkValue, parseValue, type NetworkPart, type ValueKind, type ValueUnit } from '$lib/engineering';
import { decodeCapacitorCode, decodeVoltageCodedMarking, expandCount } from '$lib/engineering/trade-notation';

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
	/** Tolerance written after the value ("4k7 1%"). */
	tolerancePct?: number;
}

const JUMPER_WORDS = /^(jumper|link|wire|wire link|bridge|0r|0r0|0|0 ?[ωΩ]|0 ?ohms?)$/i;
const RATING_TAIL = /(?:\s*\/\s*|\s+)(\d+(?:\.\d+)?)\s*(k?)V(?:DC)?$/i;
const TOLERANCE_TAIL = /(?:\s+|\s*(?:±|\+\/-|\+-)\s*)(\d+(?:\.\d+)?)\s*%$/;

/**
 * A capacitor marking (decoded) or a count rewritten as a network ("2×1u series" → "1u+1u"); null when the
 * text is neither. Throws RangeError with the reason when it looks like one but cannot be read.
 */
function readTradeNotation(
	core: string,
	kind: ValueKind,
	text: string
): { value: number; ratingV?: number; tolerancePct?: number } | { core: string } | null {
	if (kind === 'capacitance') {
		const coded = decodeVoltageCodedMarking(core);
		if (coded) return { value: coded.value, ratingV: coded.ratingV, tolerancePct: coded.tolerancePct };
		const code = decodeCapacitorCode(core);
		if (code) return code;
	}
	try {
		const counted = expandCount(core);
		return counted ? { core: counted.text } : null;
	} catch (e) {
		throw new RangeError(`"${text}": ${(e as Error).message.replace(/^"[^"]*": /, '')}`);
	}
}

/** Split "100u/63V 10%" into the value text and its rating and tolerance tails. */
function splitTails(text: string): { core: string; ratingV?: number; tolerancePct?: number } {
	let core = text.trim();
	let ratingV: number | undefined;
	let tolerancePct: number | undefined;
	for (let i = 0; i < 2; i++) {
		const r = RATING_TAIL.exec(core);
		if (r && ratingV === undefined) {
			ratingV = Number(r[1]) * (r[2] ? 1000 : 1);
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
	return { core, ratingV, tolerancePct };
}

/**
 * Parse a part value as the trade writes it, for a value kind (see the notation above).
 * parsePartValue('1u+1u', 'capacitance') → { value: 5e-7, unit: 'F', parts: 2, arrangement: 'series' };
 * parsePartValue('100u/63V', 'capacitance') → { value: 1e-4, ratingV: 63, parts: 1 }. Throws RangeError with a
 * sentence a maker can act on.
 */
export function parsePartValue(text: string, kind: ValueKind): ParsedPartValue {
	const tails = splitTails(text);
	const { ratingV, tolerancePct } = tails;
	// More of the trade's notation ($lib/engineering/trade-notation): "2A104J", "472J 100V", "2×10000u".
	const trade = readTradeNotation(tails.core, kind, text);
	if (trade && 'value' in trade) {
		const rV = ratingV ?? trade.ratingV;
		const tol = tolerancePct ?? trade.tolerancePct;
		return { value: trade.value, unit: 'F', parts: 1, ...(rV !== undefined ? { ratingV: rV } : {}), ...(tol !== undefined ? { tolerancePct: tol } : {}) };
	}
	const core = trade?.core ?? tails.core;
	if (tolerancePct !== undefined && !(tolerancePct > 0 && tolerancePct <= 100))
		throw new RangeError(`"${text}": a tolerance must be above 0 % and at most 100 %`);
	if (ratingV !== undefined && !(ratingV > 0 && ratingV <= 100_000))
		throw new RangeError(`"${text}": a voltage rating must be above 0 V and at most 100 kV`);
	if (core === '') throw new RangeError('the value is empty');
	const extra = { ...(ratingV !== undefined ? { ratingV } : {}), ...(tolerancePct !== undefined ? { tolerancePct } : {}) };
	if (kind === 'resistance' && JUMPER_WORDS.test(core)) return { value: 0, unit: 'ohm', parts: 1, ...extra };

	// "+" joins in series (but not the "+/-" of a tolerance); "||" joins in parallel and binds tighter.
	const seriesTerms = core.split(/\+(?![/-])/).map((s) => s.trim());
	const isNetwork = seriesTerms.length > 1 || core.includes('||') || core.includes('∥');
	if (!isNetwork) {
		const p = parseValue(core, kind);
		if (p.tolerancePct !== undefined && extra.tolerancePct === undefined) extra.tolerancePct = p.tolerancePct;
		return { value: p.value, unit: p.unit, parts: 1, ...extra };
	}
	if (seriesTerms.some((t) => t === ''))
		throw new RangeError(`"${text}": a "+" needs a value on both sides, e.g. 1u+1u for two parts in series`);
	const part = NETWORK_PART[kind];
	let parts = 0;
	let hasParallel = false;
	const termValues = seriesTerms.map((term) => {
		const branches = term.split(/\|\||∥/).map((s) => s.trim());
		if (branches.some((b) => b === ''))
			throw new RangeError(`"${text}": "||" needs a value on both sides, e.g. 10k||10k for two parts in parallel`);
		const values = branches.map((b) => {
			let p;
			try {
				p = parseValue(b, kind);
			} catch (err) {
				throw new RangeError(`"${text}": part "${b}" — ${(err as Error).message}`);
			}
			if (p.value <= 0) throw new RangeError(`"${text}": every part of a network must be greater than zero ("${b}")`);
			if (p.tolerancePct !== undefined && extra.tolerancePct === undefined) extra.tolerancePct = p.tolerancePct;
			return p.value;
		});
		parts += values.length;
		if (values.length > 1) hasParallel = true;
		return values.length > 1 ? networkValue(part, 'parallel', values) : values[0];
	});
	if (parts > 50) throw new RangeError(`"${text}": a network of at most 50 parts`);
	const value = termValues.length > 1 ? networkValue(part, 'series', termValues) : termValues[0];
	const arrangement = termValues.length > 1 ? (hasParallel ? 'mixed' : 'series') : 'parallel';
	return { value: Number(value.toPrecision(12)), unit: UNIT_OF[kind], parts, arrangement, ...extra };
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

/** A part value for display: "4.7 kΩ", "500 nF"; text kinds as written. */
export function formatPartValue(value: number | null | undefined, unit: string | null | undefined, text = ''): string {
	if (typeof value === 'number' && unit) {
		try {
			return formatValue(value, unit);
		} catch {
			return text;
		}
	}
	return text;
}

/** The design voltage rating written in a design value ("100u/63V" → 63), or null. */
export function designRatingOf(designValueText: string | null | undefined): number | null {
	if (!designValueText) return null;
	return splitTails(designValueText).ratingV ?? null;
}

/** Read a percent: "5", "5%", "±5 %", "+/-5%" → 5. */
export function parsePercent(text: string): number | null {
	const m = /^(?:±|\+\/-|\+-)?\s*(\d+(?:[.,]\d+)?)\s*%?$/.exec(text.trim());
	return m ? Number(m[1].replace(',', '.')) : null;
}

/** Read a voltage rating: "63", "63V", "63 VDC", "1.5kV" → volts. */
export function parseVolts(text: string): number | null {
	const m = /^(\d+(?:[.,]\d+)?)\s*(k?)\s*(?:V|VDC|V DC|Vdc)?$/i.exec(text.trim());
	return m ? Number(m[1].replace(',', '.')) * (m[2] ? 1000 : 1) : null;
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
