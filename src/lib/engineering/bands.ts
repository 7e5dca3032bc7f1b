/**
 * Resistor colour bands per IEC 60062: 3-band (no tolerance band, ±20 %), 4-band (2 digits),
 * 5-band (3 digits) and 6-band (5-band + temperature coefficient).
 * Colour names are lower-case English; "gray" and "purple" are accepted as spellings of grey and violet.
 */
import { InputRangeError, cleanNumber } from './values';

/** The colour names of the code, in digit order then gold, silver (API.md); pink is read as ×10⁻³ only. */
export const BAND_COLORS = [
	'black',
	'brown',
	'red',
	'orange',
	'yellow',
	'green',
	'blue',
	'violet',
	'grey',
	'white',
	'gold',
	'silver'
] as const;
/** One colour name. */
export type BandColor = (typeof BAND_COLORS)[number];

const DIGIT: Readonly<Record<string, number>> = {
	black: 0,
	brown: 1,
	red: 2,
	orange: 3,
	yellow: 4,
	green: 5,
	blue: 6,
	violet: 7,
	grey: 8,
	white: 9
};

/** Power of ten of each multiplier colour (IEC 60062; pink ×10⁻³ from the 2016 edition summary). */
const MULTIPLIER_EXP: Readonly<Record<string, number>> = {
	pink: -3,
	silver: -2,
	gold: -1,
	black: 0,
	brown: 1,
	red: 2,
	orange: 3,
	yellow: 4,
	green: 5,
	blue: 6,
	violet: 7,
	grey: 8,
	white: 9
};

/**
 * Tolerance colours (IEC 60062 chart summaries, REFERENCE.md §6.1). Orange, yellow and grey
 * disagree between charts, so reading them adds an `ambiguous` note.
 */
const TOLERANCE: Readonly<Record<string, number>> = {
	brown: 1,
	red: 2,
	green: 0.5,
	blue: 0.25,
	violet: 0.1,
	grey: 0.05,
	orange: 0.05,
	yellow: 0.02,
	gold: 5,
	silver: 10
};

const TOLERANCE_AMBIGUITY: Readonly<Record<string, string>> = {
	grey: 'grey as a tolerance band is read differently by different charts (±0.05 %, ±0.1 % or ±0.01 %); ±0.05 % per the IEC 60062 colour chart is assumed',
	orange: 'orange as a tolerance band (±0.05 % per IEC 60062) is missing or different in older charts',
	yellow: 'yellow as a tolerance band (±0.02 % per IEC 60062) is missing or different in older charts'
};

/** Temperature coefficient of the 6th band in ppm/K (IEC 60062 chart). */
const TEMPCO: Readonly<Record<string, number>> = {
	black: 250,
	brown: 100,
	red: 50,
	orange: 15,
	yellow: 25,
	green: 20,
	blue: 10,
	violet: 5,
	grey: 1
};

/** Tolerance → colour used when encoding; 20 % has no band (3-band code). */
const TOLERANCE_COLOR: ReadonlyArray<readonly [number, BandColor]> = [
	[1, 'brown'],
	[2, 'red'],
	[0.5, 'green'],
	[0.25, 'blue'],
	[0.1, 'violet'],
	[0.05, 'orange'],
	[0.02, 'yellow'],
	[5, 'gold'],
	[10, 'silver']
];

const ALIASES: Readonly<Record<string, string>> = { gray: 'grey', purple: 'violet' };

/** A reading of a band list. */
export interface BandReading {
	valueOhm: number;
	tolerancePct: number;
	tempcoPpmPerK?: number;
	/** Why the reading may be wrong (conflicting charts), when it may. */
	ambiguous?: string;
	/** The other reading when the list also decodes back to front. */
	reversed?: { valueOhm: number; tolerancePct: number };
}

/** Lower-case and alias a colour name; RangeError for a name that is not in the code. normaliseColor('Gray') → 'grey'. */
export function normaliseColor(name: string): string {
	const c = String(name).trim().toLowerCase();
	const n = ALIASES[c] ?? c;
	if (!(n in MULTIPLIER_EXP) && !(n in TOLERANCE)) throw new InputRangeError('colors', `"${name}" is not a resistor colour`);
	return n;
}

function readStrict(colors: readonly string[]): Omit<BandReading, 'reversed'> {
	const n = colors.length;
	if (n < 3 || n > 6) throw new InputRangeError('colors', 'a resistor code has 3, 4, 5 or 6 bands');
	const digitCount = n <= 4 ? 2 : 3;
	const digits = colors.slice(0, digitCount).map((c, i) => {
		const d = DIGIT[c];
		if (d === undefined) throw new InputRangeError(`colors.${i}`, `band ${i + 1} (${c}) is not a digit colour`);
		return d;
	});
	if (digits[0] === 0) throw new InputRangeError('colors.0', 'the first band cannot be black (a leading zero)');
	const multColor = colors[digitCount];
	const exp = MULTIPLIER_EXP[multColor];
	if (exp === undefined)
		throw new InputRangeError(`colors.${digitCount}`, `band ${digitCount + 1} (${multColor}) is not a multiplier colour`);
	const significand = Number(digits.join(''));
	const valueOhm = cleanNumber(exp >= 0 ? significand * 10 ** exp : significand / 10 ** -exp);
	let tolerancePct = 20;
	let ambiguous: string | undefined;
	if (n >= 4) {
		const tolColor = colors[digitCount + 1];
		const t = TOLERANCE[tolColor];
		if (t === undefined)
			throw new InputRangeError(`colors.${digitCount + 1}`, `band ${digitCount + 2} (${tolColor}) is not a tolerance colour`);
		tolerancePct = t;
		ambiguous = TOLERANCE_AMBIGUITY[tolColor];
	}
	const out: Omit<BandReading, 'reversed'> = { valueOhm, tolerancePct };
	if (n === 6) {
		const tc = TEMPCO[colors[5]];
		if (tc === undefined) throw new InputRangeError('colors.5', `band 6 (${colors[5]}) is not a temperature-coefficient colour`);
		out.tempcoPpmPerK = tc;
	}
	if (ambiguous) out.ambiguous = ambiguous;
	return out;
}

/**
 * Read a list of band colours, first band first (IEC 60062). 3 bands = ±20 %.
 * When the list also reads validly back to front, `reversed` gives that reading too
 * (orientation cannot be known from a list). Orange, yellow and grey tolerance bands add `ambiguous`.
 * valueFromBands(['yellow','violet','red','gold']) → { valueOhm: 4700, tolerancePct: 5 }.
 */
export function valueFromBands(colors: readonly string[]): BandReading {
	if (!Array.isArray(colors)) throw new InputRangeError('colors', 'colors must be a list');
	const list = colors.map((c, i) => {
		try {
			return normaliseColor(c);
		} catch {
			throw new InputRangeError(`colors.${i}`, `"${c}" is not a resistor colour`);
		}
	});
	const reading: BandReading = readStrict(list);
	if (list.length <= 5) {
		try {
			const back = readStrict([...list].reverse());
			if (back.valueOhm !== reading.valueOhm || back.tolerancePct !== reading.tolerancePct)
				reading.reversed = { valueOhm: back.valueOhm, tolerancePct: back.tolerancePct };
		} catch {
			// not readable back to front: the orientation is unambiguous
		}
	}
	return reading;
}

/**
 * Colour bands for a resistance (IEC 60062). Defaults: 4 bands at 5 %, 5 bands at 1 %, 3 bands = 20 %
 * (no tolerance band). RangeError when the value needs more significant figures than the count
 * gives or a multiplier outside silver…white. bandsFromValue(4700) → ['yellow','violet','red','gold'].
 */
export function bandsFromValue(valueOhm: number, tolerancePct?: number, bands: 3 | 4 | 5 = 4): BandColor[] {
	if (bands !== 3 && bands !== 4 && bands !== 5) throw new InputRangeError('bands', 'bands must be 3, 4 or 5');
	if (!(Number.isFinite(valueOhm) && valueOhm > 0))
		throw new InputRangeError('valueOhm', 'valueOhm must be a finite number greater than 0');
	const tol = tolerancePct ?? (bands === 5 ? 1 : bands === 4 ? 5 : 20);
	let tolColor: BandColor | undefined;
	if (bands === 3) {
		if (tol !== 20) throw new InputRangeError('tolerancePct', 'a 3-band code has no tolerance band: it always means ±20 %');
	} else {
		tolColor = TOLERANCE_COLOR.find(([t]) => t === tol)?.[1];
		if (!tolColor)
			throw new InputRangeError(
				'tolerancePct',
				tol === 20
					? '±20 % has no tolerance colour: use bands = 3'
					: `no tolerance colour for ${tol} %; use one of ${TOLERANCE_COLOR.map(([t]) => t).join(', ')} %`
			);
	}
	const sig = bands === 5 ? 3 : 2;
	const [mant, expStr] = valueOhm.toExponential(sig - 1).split('e');
	const significand = Number(mant.replace('.', ''));
	const exp = Number(expStr) - (sig - 1);
	const back = exp >= 0 ? significand * 10 ** exp : significand / 10 ** -exp;
	if (Math.abs(back - valueOhm) > 1e-9 * valueOhm)
		throw new InputRangeError(
			'valueOhm',
			`${valueOhm} Ω needs more than ${sig} significant figures; a ${bands}-band code cannot show it`
		);
	if (exp < -2 || exp > 9)
		throw new InputRangeError('valueOhm', `${valueOhm} Ω is outside what a ${bands}-band code can show (multiplier silver ×0.01 to white ×10⁹)`);
	const digitColors = String(significand)
		.split('')
		.map((d) => BAND_COLORS[Number(d)]);
	const multColor = (Object.entries(MULTIPLIER_EXP).find(([c, e]) => e === exp && c !== 'pink')?.[0] ?? 'black') as BandColor;
	return tolColor ? [...digitColors, multColor, tolColor] : [...digitColors, multColor];
}
