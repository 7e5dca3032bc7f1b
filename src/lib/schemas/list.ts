/**
 * Values of the build list's filters and orders (browse, search, the builds API), shared by the server
 * query and the pages' forms, and the query string's schema. Labels are the product's words.
 */
import { z } from 'zod';
import { BUILD_PROGRESS, CATEGORIES, TOPOLOGIES } from './build';
import { PART_KINDS, valueKindOf } from '$lib/parts/kinds';
import { parsePartValue } from '$lib/parts/values';
import { LIST_SORTS, SORT_LABELS, REVIEW_FILTERS, REVIEW_FILTER_LABELS, MAINS_FILTER_LABELS, LIST_LIMIT_DEFAULT, LIST_LIMIT_MAX, QUERY_MAX, FIND_LIMITS, FIND_KEYS, type ListSort, type ReviewFilter, type FindFilterValues } from './list-values';
export { LIST_SORTS, SORT_LABELS, REVIEW_FILTERS, REVIEW_FILTER_LABELS, MAINS_FILTER_LABELS, LIST_LIMIT_DEFAULT, LIST_LIMIT_MAX, QUERY_MAX, FIND_LIMITS, FIND_KEYS, type ListSort, type ReviewFilter, type FindFilterValues };

const oneOf = (values: readonly string[]) => ({ error: `must be one of: ${values.join(', ')}` });

// --- Find by numbers (builds/find-index.ts): rails, load, power, "builds using this part" ---------------

/**
 * A number typed in a query string, checked here with a sentence (range problems answer 400 like any other
 * malformed query, never 422: the list has nothing to compute).
 */
const findNumber = (what: string, max: number, unit: string, positive = false) =>
	z
		.string()
		.trim()
		.refine((t) => /^[+-]?(\d+(\.\d*)?|\.\d+)(e[+-]?\d+)?$/i.test(t), { message: `must be a number of ${what} (${unit}), e.g. 30`, abort: true })
		.transform(Number)
		.refine((n) => (positive ? n > 0 : n >= 0), positive ? `must be greater than 0 ${unit}` : `must be 0 ${unit} or more`)
		.refine((n) => n <= max, `must be at most ${max} ${unit}`);

const FIND_FIELDS = {
	railMinV: findNumber('volts', FIND_LIMITS.railV, 'V')
		.optional()
		.describe('Lowest rail voltage, V, each side (±): a build with a block whose rail is at least this. A single supply counts as half its total each side.'),
	railMaxV: findNumber('volts', FIND_LIMITS.railV, 'V').optional().describe('Highest rail voltage, V, each side (±).'),
	loadOhm: findNumber('ohms', FIND_LIMITS.loadOhm, 'Ω', true).optional().describe('Nominal load impedance of an amplifier block, Ω (e.g. 4 or 8).'),
	powerMinW: findNumber('watts', FIND_LIMITS.powerW, 'W')
		.optional()
		.describe('Lowest output power per channel, W: the claimed power, else what the rails allow into the load.'),
	powerMaxW: findNumber('watts', FIND_LIMITS.powerW, 'W').optional().describe('Highest output power per channel, W.'),
	partKind: z.enum(PART_KINDS, oneOf(PART_KINDS)).optional().describe('Builds using a part of this kind (with partValue and/or partPackage).'),
	partValue: z
		.string()
		.trim()
		.max(FIND_LIMITS.text, `must be at most ${FIND_LIMITS.text} characters`)
		.optional()
		.describe(
			'The part’s value in the trade’s notation (0R22, 0.22, 220m and 220mΩ are one value for a resistor; 4k7 = 4.7k); needs partKind. For kinds without a value in Ω, F or H it is matched as text, ignoring case.'
		),
	partPackage: z
		.string()
		.trim()
		.max(FIND_LIMITS.text, `must be at most ${FIND_LIMITS.text} characters`)
		.optional()
		.describe('The part’s package as the maker wrote it, ignoring case (TO-220, axial, DIP-8).')
};

/** Filters of the find fields as the list query takes them: numbers checked, the part value read in SI. */
export interface FindQuery {
	railMinV?: number;
	railMaxV?: number;
	loadOhm?: number;
	powerMinW?: number;
	powerMaxW?: number;
	partKind?: string;
	partValue?: string;
	partPackage?: string;
}

const UNIT_SYMBOL = { resistance: 'Ω', capacitance: 'F', inductance: 'H' } as const;

/**
 * The SI value of `partValue` for `partKind` (Ω, F, H), or null when the kind has none (matched as text). The
 * kind is known here, so a bare prefix reads in the kind's unit: for a resistor "220m" is 220 mΩ (the parts
 * editor, not knowing what was meant, asks). Throws RangeError with the parser's sentence.
 */
export function partValueSI(kind: string, text: string): number | null {
	const vk = valueKindOf(kind);
	if (!vk) return null;
	try {
		return parsePartValue(text, vk).value;
	} catch (e) {
		if (!/^[\d.,]+\s*[pnuµmkKMG]$/.test(text.trim())) throw e;
		return parsePartValue(`${text.trim()}${UNIT_SYMBOL[vk]}`, vk).value;
	}
}

/** Cross-field checks of the find fields: ranges the right way round, a part value with its kind and readable. */
function checkFindQuery(q: FindQuery, ctx: z.RefinementCtx): void {
	if (q.railMinV !== undefined && q.railMaxV !== undefined && q.railMinV > q.railMaxV)
		ctx.addIssue({ code: 'custom', path: ['railMinV'], message: `must not be above railMaxV (${q.railMinV} V > ${q.railMaxV} V)` });
	if (q.powerMinW !== undefined && q.powerMaxW !== undefined && q.powerMinW > q.powerMaxW)
		ctx.addIssue({ code: 'custom', path: ['powerMinW'], message: `must not be above powerMaxW (${q.powerMinW} W > ${q.powerMaxW} W)` });
	if (q.partValue) {
		if (!q.partKind) {
			ctx.addIssue({ code: 'custom', path: ['partValue'], message: 'needs partKind: say what kind of part the value is for (resistor, capacitor, …)' });
			return;
		}
		try {
			partValueSI(q.partKind, q.partValue);
		} catch (e) {
			ctx.addIssue({ code: 'custom', path: ['partValue'], message: `cannot be read as a ${q.partKind} value: ${(e as Error).message}` });
		}
	}
}

/** Query string of GET /api/v1/builds and of the browse and search pages. */
export const listQuerySchema = z.object({
	q: z.string().trim().max(QUERY_MAX, `must be at most ${QUERY_MAX} characters`).optional(),
	category: z.enum(CATEGORIES, oneOf(CATEGORIES)).optional(),
	topology: z.enum(TOPOLOGIES, oneOf(TOPOLOGIES)).optional(),
	review: z.enum(REVIEW_FILTERS, oneOf(REVIEW_FILTERS)).optional(),
	mains: z.enum(['true', 'false'], oneOf(['true', 'false'])).optional(),
	/** The maker's build status (the list item's `progress`). */
	status: z
		.enum(BUILD_PROGRESS, oneOf(BUILD_PROGRESS))
		.optional()
		.describe('The maker’s build status (each item’s `progress`): in-progress, working or abandoned'),
	maker: z
		.string()
		.trim()
		.toLowerCase()
		.regex(/^[a-z0-9][a-z0-9-]{0,39}$/, 'must be a member handle')
		.optional(),
	sort: z.enum(LIST_SORTS, oneOf(LIST_SORTS)).optional(),
	cursor: z.string().max(400).optional(),
	limit: z.coerce
		.number({ error: 'must be a whole number' })
		.int('must be a whole number')
		.min(1, 'must be at least 1')
		.max(LIST_LIMIT_MAX, `must be at most ${LIST_LIMIT_MAX}`)
		.default(LIST_LIMIT_DEFAULT),
	...FIND_FIELDS
}).superRefine(checkFindQuery);
export type ListQuery = z.infer<typeof listQuerySchema>;
