/**
 * Parts-list lines in the trade's notation (PRODUCT.md §4.4): value parsing and normalising per part kind,
 * fitted values written as series/parallel networks, substitution deviation and tolerance, and the checks
 * on substitutions that remove protection. Pure TypeScript (no I/O): runs on the server when a list is saved
 * or imported, and in the browser for the editor's hints.
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
import { decodeMarking, formatValue, networkValue, parseValue, type NetworkPart, type ValueKind, type ValueUnit } from '$lib/engineering';
import { decodeCapacitorCode, decodeVoltageCodedMarking, expandCount } from '$lib/engineering/trade-notation';

/** A potentiometer marking: taper letter and a 3-digit value code ("B104"). */
const POT_MARKING = /^[A-Z]\d{3}$/i;

/** Part kinds of a parts-list line. */
export const PART_KINDS = [
	'resistor',
	'capacitor',
	'inductor',
	'potentiometer',
	'jumper',
	'diode',
	'transistor',
	'ic',
	'regulator',
	'fuse',
	'transformer',
	'connector',
	'switch',
	'heatsink',
	'hardware',
	'other'
] as const;
/** One part kind. */
export type PartKind = (typeof PART_KINDS)[number];

/** Labels of the part kinds for selects and tables. */
export const PART_KIND_LABELS: Record<PartKind, string> = {
	resistor: 'Resistor',
	capacitor: 'Capacitor',
	inductor: 'Inductor',
	potentiometer: 'Potentiometer',
	jumper: 'Jumper (0 Ω link)',
	diode: 'Diode / rectifier',
	transistor: 'Transistor',
	ic: 'IC',
	regulator: 'Regulator',
	fuse: 'Fuse',
	transformer: 'Transformer',
	connector: 'Connector',
	switch: 'Switch',
	heatsink: 'Heatsink',
	hardware: 'Hardware',
	other: 'Other'
};

/** Spellings accepted for each kind (CSV import, case-insensitive). */
const KIND_SYNONYMS: Record<string, PartKind> = {
	r: 'resistor',
	res: 'resistor',
	resistor: 'resistor',
	resistors: 'resistor',
	c: 'capacitor',
	cap: 'capacitor',
	caps: 'capacitor',
	capacitor: 'capacitor',
	capacitors: 'capacitor',
	electrolytic: 'capacitor',
	l: 'inductor',
	ind: 'inductor',
	inductor: 'inductor',
	coil: 'inductor',
	choke: 'inductor',
	pot: 'potentiometer',
	potentiometer: 'potentiometer',
	trimmer: 'potentiometer',
	jumper: 'jumper',
	link: 'jumper',
	'wire link': 'jumper',
	'0r link': 'jumper',
	d: 'diode',
	diode: 'diode',
	rectifier: 'diode',
	bridge: 'diode',
	led: 'diode',
	q: 'transistor',
	transistor: 'transistor',
	mosfet: 'transistor',
	bjt: 'transistor',
	ic: 'ic',
	u: 'ic',
	chip: 'ic',
	'op-amp': 'ic',
	opamp: 'ic',
	regulator: 'regulator',
	reg: 'regulator',
	f: 'fuse',
	fuse: 'fuse',
	t: 'transformer',
	tr: 'transformer',
	transformer: 'transformer',
	j: 'connector',
	connector: 'connector',
	socket: 'connector',
	jack: 'connector',
	terminal: 'connector',
	sw: 'switch',
	switch: 'switch',
	relay: 'switch',
	heatsink: 'heatsink',
	'heat sink': 'heatsink',
	hardware: 'hardware',
	mech: 'hardware',
	mechanical: 'hardware',
	other: 'other'
};

/** Read a kind as typed or as found in a CSV ("Cap" → capacitor); null when unknown. */
export function normaliseKind(text: string): PartKind | null {
	const t = text.trim().toLowerCase().replace(/\s+/g, ' ');
	if ((PART_KINDS as readonly string[]).includes(t)) return t as PartKind;
	return KIND_SYNONYMS[t] ?? null;
}

/** The quantity a kind's value measures: resistor/potentiometer/jumper → resistance, capacitor → capacitance, inductor → inductance; others keep text (null). */
export function valueKindOf(kind: string): ValueKind | null {
	if (kind === 'resistor' || kind === 'potentiometer' || kind === 'jumper') return 'resistance';
	if (kind === 'capacitor') return 'capacitance';
	if (kind === 'inductor') return 'inductance';
	return null;
}

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
	'reason'
] as const satisfies readonly (keyof PartLineDraft)[];

/** An empty draft line (quantity 1, kind resistor). */
export function emptyDraft(): PartLineDraft {
	return { designators: '', quantity: '1', kind: 'resistor', value: '', tolerance: '', ratingV: '', ratingW: '', package: '', notes: '', designValue: '', reason: '' };
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
	ratingW: number | null;
	package: string;
	notes: string;
	designValueText: string | null;
	designValue: number | null;
	substitutionReason: string | null;
	deviationPct: number | null;
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
}

/** What the checks on a line need to know about the build. */
export interface PartContext {
	/** Highest rail the parts may see, V (the supply block's unloaded rail, else the amplifier block's rail). */
	railV?: number | null;
}

/** Limits of a parts list. */
export const PARTS_LIMITS = { lines: 1000, designators: 500, value: 200, package: 100, notes: 2000, reason: 1000 } as const;

const CHARGE_NOTE =
	'Capacitors keep their charge and parts run above their rating can fail violently. This check certifies nothing; defer to local codes and licensed practice.';

/** Read a percent: "5", "5%", "±5 %", "+/-5%" → 5. */
function parsePercent(text: string): number | null {
	const m = /^(?:±|\+\/-|\+-)?\s*(\d+(?:[.,]\d+)?)\s*%?$/.exec(text.trim());
	return m ? Number(m[1].replace(',', '.')) : null;
}

/** Read a voltage rating: "63", "63V", "63 VDC", "1.5kV" → volts. */
function parseVolts(text: string): number | null {
	const m = /^(\d+(?:[.,]\d+)?)\s*(k?)\s*(?:V|VDC|V DC|Vdc)?$/i.exec(text.trim());
	return m ? Number(m[1].replace(',', '.')) * (m[2] ? 1000 : 1) : null;
}

/** Read a power rating: "0.25", "1/4", "1/4 W", "250mW" → watts. */
function parseWatts(text: string): number | null {
	const t = text.trim();
	const frac = /^(\d+)\s*\/\s*(\d+)\s*W?$/i.exec(t);
	if (frac) return Number(frac[2]) === 0 ? null : Number(frac[1]) / Number(frac[2]);
	const m = /^(\d+(?:[.,]\d+)?)\s*(m?)\s*W?$/i.exec(t);
	if (!m) return null;
	return Number(m[1].replace(',', '.')) * (m[2] ? 1e-3 : 1);
}

/** Expand designators to a count: "R1, R2" → 2, "R1-R4" → 4, "C3–C5 C9" → 4. */
export function designatorCount(designators: string): number {
	let n = 0;
	for (const token of designators.split(/[\s,;]+/).filter(Boolean)) {
		const range = /^([A-Za-z]*)(\d+)\s*[-–]\s*([A-Za-z]*)(\d+)$/.exec(token);
		if (range && (range[3] === '' || range[3] === range[1]) && Number(range[4]) >= Number(range[2]))
			n += Number(range[4]) - Number(range[2]) + 1;
		else n += 1;
	}
	return n;
}

const FUSE_TEXT = /(fuse|^\s*[TF]?\s*\d+(?:\.\d+)?\s*m?A\s*[TF]?\s*$)/i;

/**
 * Checks on one normalised line:
 * - part.jumper-substitution (caution; danger where a fuse was): a 0 Ω link fitted where the design has a
 *   resistor or a fuse;
 * - part.rating-below-rail: the fitted voltage rating below the design's (caution), danger when the design
 *   part withstood the rail and the fitted one does not; for non-capacitors on a substitution line also
 *   caution when below the rail (capacitors get the cross check cross.cap-below-rail);
 * - part.outside-tolerance (note), part.no-reason (note), part.qty-mismatch (note).
 */
export function partChecks(line: Omit<NormalisedPartLine, 'checks'>, designRatingV: number | null, ctx: PartContext = {}): PartCheck[] {
	const checks: PartCheck[] = [];
	const who = line.designators || 'A line';
	const isSub = line.designValueText !== null && line.designValueText !== '';
	const railV = typeof ctx.railV === 'number' && Number.isFinite(ctx.railV) ? ctx.railV : null;

	if (isSub) {
		const fittedZero = (line.kind === 'jumper' || line.kind === 'resistor') && line.value === 0;
		const designWasResistor = typeof line.designValue === 'number' && line.designValue > 0;
		const designWasFuse = line.designValue === null && FUSE_TEXT.test(line.designValueText ?? '');
		if (fittedZero && (designWasResistor || designWasFuse || line.kind === 'jumper')) {
			const danger = designWasFuse;
			checks.push({
				id: 'part.jumper-substitution',
				level: danger ? 'danger' : 'caution',
				message: danger
					? `${who}: a wire link is fitted where the design has a fuse (${line.designValueText}); nothing then limits a fault current.`
					: `${who}: a jumper (0 Ω) is fitted where the design has ${designWasResistor ? formatPartValue(line.designValue, 'ohm') : `"${line.designValueText}"`}. A series resistor often limits current or keeps a stage stable (base/gate stopper, output isolation, Zobel); say why it is safe to leave out.`,
				values: { designators: line.designators, designValueOhm: line.designValue, fittedValueOhm: 0 },
				caution: 'Removing a protective part can let a fault burn or shock; this check certifies nothing. Defer to local codes and licensed practice.'
			});
		}
	}

	if (typeof line.ratingV === 'number') {
		if (designRatingV !== null && line.ratingV < designRatingV) {
			const danger = railV !== null && line.ratingV < railV && railV <= designRatingV;
			checks.push({
				id: 'part.rating-below-rail',
				level: danger ? 'danger' : 'caution',
				message: danger
					? `${who}: fitted rated ${line.ratingV} V where the design has ${designRatingV} V, and the ${Number(railV!.toPrecision(3))} V rail is above the fitted rating: the design part withstood the rail, this one does not.`
					: `${who}: fitted rated ${line.ratingV} V, lower than the design's ${designRatingV} V. Check the voltage it sees in this circuit.`,
				values: { designators: line.designators, ratingV: line.ratingV, designRatingV, railV },
				caution: CHARGE_NOTE
			});
		} else if (isSub && railV !== null && line.ratingV < railV && line.kind !== 'capacitor') {
			checks.push({
				id: 'part.rating-below-rail',
				level: 'caution',
				message: `${who}: the substituted part is rated ${line.ratingV} V, below the ${Number(railV.toPrecision(3))} V rail. Fine only where it never sees the rail.`,
				values: { designators: line.designators, ratingV: line.ratingV, railV },
				caution: CHARGE_NOTE
			});
		}
	}

	if (isSub && line.deviationPct !== null && line.tolerancePct !== null && insideTolerance(line.deviationPct, line.tolerancePct) === false)
		checks.push({
			id: 'part.outside-tolerance',
			level: 'note',
			message: `${who}: the fitted value is ${formatDeviation(line.deviationPct)} off the design value, outside the part's ±${line.tolerancePct} % tolerance; say why the circuit does not mind.`,
			values: { designators: line.designators, deviationPct: line.deviationPct, tolerancePct: line.tolerancePct }
		});

	if (isSub && !line.substitutionReason)
		checks.push({
			id: 'part.no-reason',
			level: 'note',
			message: `${who}: a substitution without a reason; others repeating the build will want to know why.`,
			values: { designators: line.designators }
		});

	if (line.designators.trim() && line.quantity > 0) {
		const n = designatorCount(line.designators);
		if (n !== line.quantity)
			checks.push({
				id: 'part.qty-mismatch',
				level: 'note',
				message: `${who}: ${n} designator${n === 1 ? '' : 's'} but a quantity of ${line.quantity}.`,
				values: { designators: line.designators, designatorCount: n, quantity: line.quantity }
			});
	}
	return checks;
}

/** The design voltage rating written in a design value ("100u/63V" → 63), or null. */
export function designRatingOf(designValueText: string | null | undefined): number | null {
	if (!designValueText) return null;
	return splitTails(designValueText).ratingV ?? null;
}

/**
 * Validate and normalise one draft line. `line` is its number for messages (editor row or CSV line).
 * normaliseLine({ …, kind: 'capacitor', value: '1u+1u', designValue: '0.47u', tolerance: '10' }, 3)
 * → line.deviationPct 6.38, no errors.
 */
export function normaliseLine(draft: PartLineDraft, line: number, ctx: PartContext = {}): { line?: NormalisedPartLine; errors: LineError[] } {
	const errors: LineError[] = [];
	const err = (field: LineError['field'], message: string) => errors.push({ line, field, message });
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

	const valueText = text(draft.value);
	if (valueText.length > PARTS_LIMITS.value) err('value', `the value is at most ${PARTS_LIMITS.value} characters`);
	const designText = text(draft.designValue);
	if (designText.length > PARTS_LIMITS.value) err('designValue', `the design value is at most ${PARTS_LIMITS.value} characters`);

	let tolerancePct: number | null = null;
	const tolText = text(draft.tolerance);
	if (tolText !== '') {
		const t = parsePercent(tolText);
		if (t === null) err('tolerance', `tolerance "${tolText}" must be a percentage, e.g. 5 or ±1 %`);
		else if (!(t > 0 && t <= 100)) err('tolerance', 'tolerance must be above 0 % and at most 100 %');
		else tolerancePct = t;
	}
	let ratingV: number | null = null;
	const rvText = text(draft.ratingV);
	if (rvText !== '') {
		const v = parseVolts(rvText);
		if (v === null) err('ratingV', `voltage rating "${rvText}" must be volts, e.g. 63 or 63 V`);
		else if (!(v > 0 && v <= 100_000)) err('ratingV', 'voltage rating must be above 0 V and at most 100 kV');
		else ratingV = v;
	}
	let ratingW: number | null = null;
	const rwText = text(draft.ratingW);
	if (rwText !== '') {
		const w = parseWatts(rwText);
		if (w === null) err('ratingW', `power rating "${rwText}" must be watts, e.g. 0.25, 1/4 or 250mW`);
		else if (!(w > 0 && w <= 100_000)) err('ratingW', 'power rating must be above 0 W and at most 100 kW');
		else ratingW = w;
	}

	const pkg = text(draft.package);
	if (pkg.length > PARTS_LIMITS.package) err('package', `package is at most ${PARTS_LIMITS.package} characters`);
	const notes = typeof draft.notes === 'string' ? draft.notes.replace(/\r\n?/g, '\n').trim() : '';
	if (notes.length > PARTS_LIMITS.notes) err('notes', `notes are at most ${PARTS_LIMITS.notes} characters`);
	const reason = text(draft.reason);
	if (reason.length > PARTS_LIMITS.reason) err('reason', `the reason is at most ${PARTS_LIMITS.reason} characters`);
	if (reason !== '' && designText === '') err('designValue', 'a substitution reason needs the design value it replaces');

	let value: number | null = null;
	let unit: string | null = null;
	let designValue: number | null = null;
	let designRatingV: number | null = null;
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
				if (p.ratingV !== undefined) {
					if (ratingV !== null && ratingV !== p.ratingV)
						err('ratingV', `the voltage rating is given twice: ${p.ratingV} V in the value and ${ratingV} V in the rating column`);
					ratingV = p.ratingV;
				}
				if (p.tolerancePct !== undefined) {
					if (tolerancePct !== null && tolerancePct !== p.tolerancePct)
						err('tolerance', `the tolerance is given twice: ${p.tolerancePct} % in the value and ${tolerancePct} % in the tolerance column`);
					tolerancePct = p.tolerancePct;
				}
			} catch (e) {
				err('value', `cannot read the value: ${(e as Error).message}`);
			}
		}
		if (designText !== '') {
			try {
				const d = parsePartValue(designText, vk);
				designValue = d.value;
				designRatingV = d.ratingV ?? null;
			} catch (e) {
				// A jumper may stand where the design had a fuse or other non-resistor part: keep that as text.
				if (kind === 'jumper') designRatingV = designRatingOf(designText);
				else err('designValue', `cannot read the design value: ${(e as Error).message}`);
			}
		}
	} else if (kind) {
		designRatingV = designRatingOf(designText);
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
		ratingW,
		package: pkg,
		notes,
		designValueText: designText === '' ? null : designText,
		designValue,
		substitutionReason: reason === '' ? null : reason,
		deviationPct: designText === '' ? null : deviationPct(value, designValue)
	};
	return { line: { ...base, checks: partChecks(base, designRatingV, ctx) }, errors };
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
export function lineToDraft(row: {
	designators: string;
	quantity: number;
	kind: string;
	valueText: string;
	tolerancePct: number | null;
	ratingV: number | null;
	ratingW: number | null;
	package: string;
	notes: string;
	designValueText: string | null;
	substitutionReason: string | null;
}): PartLineDraft {
	const num = (x: number | null) => (x === null || x === undefined ? '' : String(x));
	return {
		designators: row.designators,
		quantity: String(row.quantity),
		kind: row.kind,
		value: row.valueText,
		tolerance: num(row.tolerancePct),
		ratingV: num(row.ratingV),
		ratingW: num(row.ratingW),
		package: row.package,
		notes: row.notes,
		designValue: row.designValueText ?? '',
		reason: row.substitutionReason ?? ''
	};
}
