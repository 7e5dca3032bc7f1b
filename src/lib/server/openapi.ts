/**
 * The OpenAPI 3.1 document of /api/v1, generated from the same zod schemas the routes validate with
 * (zod 4's built-in z.toJSONSchema, JSON Schema 2020-12 — the dialect OpenAPI 3.1 uses). Response
 * shapes are described with zod here too, for documentation only. Served at /api/v1/openapi.json and
 * rendered at /api/docs. The route table below must list every +server.ts under src/routes/api/v1
 * (a test walks the folder and checks).
 */
import { z } from 'zod';
import {
	amplifierToolInput,
	cornerToolInput,
	decodeQuery,
	eseriesQuery,
	gainToolInput,
	heatsinkToolInput,
	networkToolInput,
	resistorBandsColorsQuery,
	resistorBandsValueQuery,
	specCheckInput,
	specCheckBuildInput,
	supplyToolInput
} from '$lib/schemas/tools';
import { commentEditSchema, commentSchema, reportSchema } from '$lib/schemas/review';
import { suggestQuery } from '$lib/schemas/search';
import { SPEC_KINDS, specSchemas } from '$lib/specs';
import { listQuerySchema } from '$lib/schemas/list';
import { BUILD_PROGRESS } from '$lib/schemas/build';
import { partValueQuery } from '$lib/schemas/parts';
import { builtItApiBody } from '$lib/schemas/built-it';

type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';
type JsonSchema = Record<string, unknown>;

interface Operation {
	method: Method;
	path: string;
	tag: string;
	summary: string;
	description?: string;
	/** Query parameters (a zod object; each property becomes one parameter). */
	query?: z.ZodObject;
	/** JSON request body. */
	body?: z.ZodType;
	/** Schema of the 200/201 JSON answer, or a non-JSON media type. */
	response?: z.ZodType | { mediaType: string; schema: JsonSchema; description: string };
	status?: 200 | 201 | 204;
	/** Needs a signed-in member (session cookie). */
	auth?: boolean;
	/** Counts against the write rate limit (429). */
	limited?: boolean;
	/** Error statuses this operation can answer besides 405. */
	errors: number[];
	/** Public read with ETag / 304. */
	cached?: boolean;
}

// ---------------------------------------------------------------------------------------------
// Response shapes (documentation only: the routes build these objects in their domain modules).

const num = (d: string) => z.number().describe(d);
const amplifierOut = z.object({
	maxPowerW: num('Maximum sine power into the load, W'),
	peakVoltageV: num('Peak output voltage at maximum power, V'),
	peakCurrentA: num('Peak output current at maximum power, A'),
	rmsVoltageV: num('RMS output voltage at maximum power, V'),
	worstDissipationW: num('Class B worst-case dissipation per channel, 2·Vcc²/(π²·R), W'),
	railLimitPowerW: num('(V − dropout)²/(2R), W'),
	designDissipationW: num('Worst case per channel at +mainsHighPct % mains, 0.8 × loadOhm, quiescent included: 2·Vhi²/(π²·0.8R) + quiescentA·2Vhi, W'),
	highMainsTotalV: num('Total supply at high mains, 2·V·(1 + mainsHighPct/100), V'),
	minImpedanceOhm: num('0.8 × loadOhm (IEC 60268-5), Ω'),
	worstPeakCurrentA: num('Peak output current at high mains into the minimum impedance, A'),
	supplyPowerW: num('Power drawn from the rails at outputW, W').optional(),
	dissipationW: num('Dissipation at outputW, W').optional(),
	efficiency: num('Efficiency at outputW, 0–1').optional()
});
const heatsinkOut = z.object({
	requiredRthSaKPerW: num('Largest sink-to-ambient resistance that keeps each junction at junctionMaxC − marginC, (Tj − Ta − P·(θjc + θcs))/(devices·P), K/W; ≤ 0 when no heatsink can'),
	feasible: z.boolean().describe('requiredRthSaKPerW > 0'),
	sinkC: num('Heatsink temperature Ta + devices·powerW·rthSa at the given heatsink, or at the required one (an ideal 0 K/W one when none can), °C'),
	caseC: num('sinkC + powerW·rthCs, °C'),
	junctionC: num('sinkC + powerW·(rthJc + rthCs), °C'),
	devices: z.number().int().describe('Devices sharing the heatsink')
});
const supplyOut = z.object({
	peakDcV: num('√2·secondaryVac − diode drops (rated load, nominal mains), V'),
	rippleVpp: num('Ripple at loadCurrentA, V peak to peak'),
	averageDcV: num('peakDcV minus half the ripple, V'),
	offLoadPeakDcV: num('√2·secondaryVac·(1 + regulationPct/100) − drops, V'),
	highMainsPeakDcV: num('√2·secondaryVac·(1 + regulationPct/100)·(1 + mainsHighPct/100) − drops, V'),
	lowMainsAverageDcV: num('√2·secondaryVac·(1 − mainsLowPct/100) − drops − rippleVpp/2, V'),
	highMainsTotalDcV: num('Rail to rail at high mains (× 2 for bridge-split), V'),
	regulationPct: num('Regulation used (10 when not given), %'),
	mainsHighPct: num('%'),
	mainsLowPct: num('%'),
	secondaryRmsA: num('RMS current in the winding feeding one rail at loadCurrentA: capacitor input, charging pulses of RMS 1.8 × the DC current (transformer makers’ design tables), each half of a centre-tapped winding for bridge-split, /√2 for center-tap, A'),
	peakDiodeCurrentA: num('Peak of one charging pulse through a diode (triangular pulse of the same RMS), A'),
	diodeAverageA: num('Average current through one diode, A'),
	rippleCurrentA: num('RMS ripple current in one rail’s reservoir, √(pulse RMS² − loadCurrentA²), A'),
	conductionDeg: num('Duration of each charging pulse, degrees of the mains cycle')
});
const gainOut = z.object({ gain: num('Voltage gain, 1 + Rf/Ri'), gainDb: num('Gain in dB') });
const cornerOut = z.object({ cornerHz: num('First-order corner 1/(2πRC), Hz') });
const networkOut = z.object({ value: num('Series or parallel value in SI units') });
const decodeOut = z.object({
	kind: z.enum(['resistance', 'capacitance', 'inductance']),
	value: num('Value in SI units (Ω, F or H)'),
	unit: z.enum(['ohm', 'F', 'H']),
	tolerancePct: num('Tolerance from the marking, %').optional(),
	taper: z.string().describe('Potentiometer taper letter as marked').optional(),
	taperNote: z.string().optional(),
	display: z.string().describe('3 significant figures with an engineering prefix: "4.7 kΩ"')
});
const partValueOut = z.object({
	kind: z.string().describe('The part kind asked for'),
	value: num('Value in SI units (Ω, F or H)'),
	unit: z.enum(['ohm', 'F', 'H']),
	display: z.string().describe('3 significant figures with an engineering prefix: "4.70 kΩ"'),
	parts: z.number().int().describe('How many parts make it up (1 for a single part)'),
	arrangement: z.enum(['series', 'parallel', 'mixed']).optional(),
	reading: z.string().describe('The reading as a sentence: "two 1.00 µF in series = 500 nF", or how bare digits were read').optional(),
	ratingV: num('Voltage rating written after the value, V').optional(),
	ratingAc: z.boolean().describe('The rating is AC ("275 V AC", X/Y capacitors)').optional(),
	tolerancePct: num('Tolerance written with the value, %').optional()
});
const bandsOut = z.union([
	z.object({ bands: z.array(z.string()).describe('Colour names, first band first') }),
	z.object({ valueOhm: num('Resistance, Ω'), tolerancePct: num('Tolerance, %') })
]);
const eseriesOut = z.object({
	nearest: num('Nearest series value by ratio'),
	below: num('Largest series value ≤ value'),
	above: num('Smallest series value ≥ value'),
	errorPct: num('100·(nearest − value)/value')
});
const check = z.object({
	id: z.string().describe('Stable rule id of the check, e.g. supply.no-fuse (for programs and reviewers; pages show it only in a tooltip)'),
	level: z.enum(['note', 'caution', 'danger']).describe('Shown on pages with the safety-sign signal words NOTICE, CAUTION, DANGER (ANSI Z535 / ISO 3864)'),
	message: z.string(),
	values: z.record(z.string(), z.unknown())
});
const specCheckOut = z.object({ derived: z.record(z.string(), z.unknown()), checks: z.array(check) });
const specCheckBuildOut = z.object({
	blocks: z.array(specCheckOut).describe('One result per block, in the order given'),
	cross: z.array(check).describe('Checks across blocks and the parts list: cross.rails-beyond-device, cross.cap-below-rail (danger), cross.thermal-power-below-worst (caution), …')
});

const photoOut = z.object({
	id: z.string(),
	alt: z.string(),
	widthPx: z.number(),
	heightPx: z.number(),
	url: z.string(),
	renditions: z.array(z.object({ widthPx: z.number(), url: z.string() }))
});
const makerOut = z.object({ name: z.string(), handle: z.string().nullable() });
const reviewOut = z
	.object({
		label: z
			.enum(['unreviewed', 'waiting', 'safe', 'rework', 'safe-changed', 'rework-changed'])
			.describe('safe = signed off as safe at the current revision; rework = sent back for changes; *-changed = edited since'),
		text: z.string().describe('"Signed off as safe at Rev C", "Edited since sign-off at Rev C" — a peer’s opinion, never a certification'),
		verdict: z.enum(['safe', 'rework']).nullable().describe('safe = sign-off, rework = send-back; null before any review'),
		verdictRevision: z.number().int().nullable().describe('Revision number the sign-off or send-back was recorded against (1 = Rev A, 2 = Rev B, …)'),
		currentRevision: z.number().int().describe('The build’s current revision number (1 = Rev A)'),
		reviewedAt: z.string().nullable().describe('ISO 8601'),
		reviewer: z.object({ name: z.string(), handle: z.string().nullable() }).nullable(),
		waiting: z.boolean(),
		openFlags: z.number().int().describe('Hazard tags still tagged'),
		addressedFlags: z.number().int().describe('Hazard tags the maker marked fixed, waiting for a reviewer to clear them')
	})
	.nullable();
const listItem = z.object({
	slug: z.string(),
	url: z.string(),
	title: z.string(),
	summary: z.string(),
	category: z.string(),
	categoryLabel: z.string(),
	topology: z.string(),
	topologyLabel: z.string(),
	mainsPowered: z.boolean(),
	licence: z.string().describe('SPDX identifier'),
	status: z.enum(['published', 'archived']),
	progress: z.enum(BUILD_PROGRESS).describe('The maker’s build status: in-progress (still being built), working (built and working), abandoned (given up); filter with `status=`'),
	progressLabel: z.string().describe('The build status in words: In progress, Working, Abandoned'),
	revision: z.number().int(),
	derivedCount: z.number().int().describe('How many builds were started from this one (builds based on it)'),
	locked: z.boolean(),
	publishedAt: z.string().describe('ISO 8601').nullable(),
	updatedAt: z.string().describe('ISO 8601').nullable(),
	maker: makerOut,
	cover: photoOut.nullable(),
	derivedFrom: z.object({ slug: z.string(), title: z.string().nullable(), url: z.string() }).nullable().describe('The build this one was started from (“based on”), if any'),
	review: reviewOut.optional(),
	match: z
		.object({
			titleHtml: z.string().describe('Escaped title, hits in <mark>'),
			snippetHtml: z.string().describe('Escaped fragments around the hits, in <mark>')
		})
		.nullable()
		.optional()
		.describe('Only when searching (q)')
});
const listOut = z.object({
	items: z.array(listItem),
	sort: z.enum(['recent', 'most-derived', 'recently-reviewed', 'relevance']),
	nextCursor: z.string().nullable().describe('Pass as cursor= (with the same filters and sort) for the next page; null on the last page')
});
const detailOut = z.looseObject({
	slug: z.string(),
	title: z.string(),
	summary: z.string(),
	category: z.string(),
	topology: z.string(),
	mainsPowered: z.boolean(),
	status: z.enum(['draft', 'published', 'archived']),
	progress: z.enum(BUILD_PROGRESS).describe('The maker’s build status: in-progress, working, abandoned'),
	progressLabel: z.string(),
	revision: z.number().int(),
	maker: makerOut,
	cover: photoOut.nullable(),
	steps: z.array(z.looseObject({ id: z.string(), number: z.number().int(), title: z.string(), bodyHtml: z.string(), photos: z.array(photoOut) })),
	specBlocks: z.array(z.looseObject({ id: z.string(), kind: z.enum(SPEC_KINDS), data: z.record(z.string(), z.unknown()), derived: z.record(z.string(), z.unknown()), checks: z.array(check) })),
	parts: z.array(z.looseObject({ id: z.string(), designators: z.string(), quantity: z.number().int(), kind: z.string(), valueText: z.string(), value: z.number().nullable() })),
	review: reviewOut.describe('Latest review state: sign-off or send-back, the revision it was recorded against, hazard tags'),
	lineage: z.object({ derivedFrom: z.unknown().nullable(), derivedBuilds: z.array(z.unknown()) }).describe('derivedFrom: the build this one is based on; derivedBuilds: the builds based on this one')
});
const commentItem: z.ZodType = z.looseObject({
	id: z.string(),
	author: makerOut.nullable(),
	bodyHtml: z.string().describe('Sanitized HTML of the Markdown body'),
	createdAt: z.string(),
	editedAt: z.string().nullable(),
	parentId: z.string().nullable(),
	deleted: z.boolean().optional(),
	replies: z.array(z.looseObject({ id: z.string() }))
});
const commentsOut = z.object({ items: z.array(commentItem), locked: z.boolean() });
const builtItItem = z.object({
	id: z.string(),
	member: makerOut,
	mine: z.boolean().describe('The record is yours'),
	note: z.string(),
	basedOn: z.object({ slug: z.string(), title: z.string() }).nullable().describe('Their own published build based on this one'),
	photo: photoOut.nullable(),
	figures: z.object({
		railsMeasuredV: z.array(z.number()),
		maxAbsOffsetMv: z.number().nullable(),
		clipPowerW: z.number().nullable().describe('Power at 1 % THD, from their distortion points'),
		loadOhm: z.number().nullable(),
		danger: z.number().int(),
		caution: z.number().int()
	}),
	blocks: z.array(z.object({ kind: z.enum(['bringup', 'measurements']), data: z.record(z.string(), z.unknown()), derived: z.record(z.string(), z.unknown()), checks: z.array(check) })),
	recordedAt: z.string()
});
const builtItOut = z.object({ items: z.array(builtItItem), count: z.number().int() });
const reportOut = z.object({ id: z.string(), duplicate: z.boolean() });
const benchOut = z.object({ items: z.array(listItem) });
const benchSetOut = z.object({ slug: z.string(), saved: z.boolean() });
const suggestOut = z.object({ items: z.array(z.object({ slug: z.string(), title: z.string(), url: z.string() })) });

const specCheckBody = z.union(SPEC_KINDS.map((k) => z.object({ kind: z.literal(k), data: specSchemas[k] })) as unknown as [z.ZodType, z.ZodType]);
const specCheckBuildBody = z.object({ blocks: z.array(specCheckBody).min(1).max(20), parts: specCheckBuildInput.shape.parts });

// ---------------------------------------------------------------------------------------------

const READ = [400, 404];
const WRITE = [400, 401, 403, 404, 422, 429];

/** Every /api/v1 operation. Keep in step with src/routes/api/v1 (the OpenAPI test checks). */
export const OPERATIONS: Operation[] = [
	// Builds
	{
		method: 'get',
		path: '/api/v1/builds',
		tag: 'Builds',
		summary: 'List published builds',
		description:
			'Filters combine (AND). `q` searches titles, summaries, step text and parts lists (PostgreSQL full-text search, English; quotes, `or` and `-word` work) and ranks by relevance unless `sort` says otherwise: builds whose title and summary match come first, ranked (title before summary), then builds that match only in their steps and parts lists, newest first. Keyset pagination: pass `nextCursor` back as `cursor` with the same filters and sort; pages never repeat or skip a build while new builds are published. A cursor from another sort answers 400. Find by numbers: `railMinV`/`railMaxV` (each side, ±V), `loadOhm`, `powerMinW`/`powerMaxW` must all hold for one amplifier or supply block, and `partKind`/`partValue`/`partPackage` for one parts line, of the build’s latest published revision (never unpublished changes); `partValue` is read in the trade’s notation (0R22 = 0.22 = 220m for a resistor). A figure that cannot be used answers 400 with a sentence at its parameter.',
		query: listQuerySchema,
		response: listOut,
		errors: [400],
		cached: true
	},
	{
		method: 'get',
		path: '/api/v1/builds/{slug}',
		tag: 'Builds',
		summary: 'One build with steps, spec blocks, parts list, review state, and the build it is based on',
		description: 'Published and archived builds for everyone; a draft only for its maker (404 for anyone else).',
		response: detailOut,
		errors: [404],
		cached: true
	},
	{
		method: 'get',
		path: '/api/v1/builds/{slug}/parts.csv',
		tag: 'Builds',
		summary: 'The parts list as RFC 4180 CSV',
		response: { mediaType: 'text/csv', schema: { type: 'string' }, description: 'One header row, then one row per parts-list line.' },
		errors: [404],
		cached: true
	},
	// Comments
	{
		method: 'get',
		path: '/api/v1/builds/{slug}/comments',
		tag: 'Comments',
		summary: 'Comments of a build as a tree (one level of replies)',
		response: commentsOut,
		errors: READ,
		cached: true
	},
	{
		method: 'post',
		path: '/api/v1/builds/{slug}/comments',
		tag: 'Comments',
		summary: 'Post a comment, or a reply with parentId',
		description: 'Markdown body, sanitized on the server. Refused on locked builds (403).',
		body: commentSchema,
		response: commentItem,
		status: 201,
		auth: true,
		limited: true,
		errors: WRITE
	},
	{
		method: 'patch',
		path: '/api/v1/builds/{slug}/comments/{id}',
		tag: 'Comments',
		summary: 'Edit your own comment (within its edit window)',
		body: commentEditSchema,
		response: commentItem,
		auth: true,
		limited: true,
		errors: [...WRITE, 409]
	},
	{
		method: 'delete',
		path: '/api/v1/builds/{slug}/comments/{id}',
		tag: 'Comments',
		summary: 'Delete your own comment',
		status: 204,
		auth: true,
		limited: true,
		errors: WRITE
	},
	// I built this too
	{
		method: 'get',
		path: '/api/v1/builds/{slug}/built-it',
		tag: 'Builds',
		summary: 'Who built this too, with their checked bring-up and measurement blocks and figures',
		description: 'Oldest record first. Each record’s blocks are checked like any spec block (checks: note, caution, danger).',
		response: builtItOut,
		errors: READ
	},
	{
		method: 'post',
		path: '/api/v1/builds/{slug}/built-it',
		tag: 'Builds',
		summary: 'Record that you built it too (or replace your record)',
		description:
			'The figures become a bring-up block (rails, DC offset, current limiter) and, with distortion points or a load, a measurements block, checked like any spec block. 201 with the new record; 200 when it replaced yours. 422 with issue paths when a figure fails (`rails`, `dcOffsetMv`, `thd`, `loadOhm`, `basedOn`); 409 for your own or an unpublished build. A passing check is a calculation, not a safety approval.',
		body: builtItApiBody,
		response: builtItItem,
		status: 201,
		auth: true,
		limited: true,
		errors: [...WRITE, 409]
	},
	{
		method: 'delete',
		path: '/api/v1/builds/{slug}/built-it',
		tag: 'Builds',
		summary: 'Take your “I built this too” record (and its photo) off',
		status: 204,
		auth: true,
		limited: true,
		errors: WRITE
	},
	{
		method: 'post',
		path: '/api/v1/reports',
		tag: 'Comments',
		summary: 'Report a build, a comment or a member to the moderators',
		description: '201 with the new report; 200 with duplicate: true when you already reported it.',
		body: reportSchema,
		response: reportOut,
		status: 201,
		auth: true,
		limited: true,
		errors: WRITE
	},
	// Search and bench
	{
		method: 'get',
		path: '/api/v1/search/suggest',
		tag: 'Search',
		summary: 'Titles matching what has been typed so far',
		description: 'Every word must appear in the title; the last one may be a prefix. For search-as-you-type; the full search is GET /api/v1/builds?q=.',
		query: suggestQuery,
		response: suggestOut,
		errors: [400],
		cached: true
	},
	{
		method: 'get',
		path: '/api/v1/bench',
		tag: 'Bench',
		summary: 'Your bench: the builds you saved, most recently saved first',
		response: benchOut,
		auth: true,
		errors: [401, 403]
	},
	{
		method: 'post',
		path: '/api/v1/bench/{slug}',
		tag: 'Bench',
		summary: 'Save a published build to your bench (idempotent)',
		response: benchSetOut,
		auth: true,
		limited: true,
		errors: [401, 403, 404, 409, 429]
	},
	{
		method: 'delete',
		path: '/api/v1/bench/{slug}',
		tag: 'Bench',
		summary: 'Take a build off your bench (idempotent)',
		response: benchSetOut,
		auth: true,
		limited: true,
		errors: [401, 403, 404, 429]
	},
	// Spec checking and bench tools
	{
		method: 'post',
		path: '/api/v1/spec-check',
		tag: 'Spec checks',
		summary: 'Check a spec block: the values worked out from its numbers, and its checks',
		description:
			'`data` is validated by the schema of its `kind`; issue paths start with `data.`. Checks are note, caution or danger. A supply block’s `derived` also carries the rectifier’s currents at `loadCurrentA` — `secondaryRmsA`, `peakDiodeCurrentA`, `diodeAverageA`, `rippleCurrentA`, `conductionDeg` (as the supply bench tool), `windingRatedA` (`secondaryRatedA`, or `transformerVA` spread over the secondary) and `windingLoadRatio` — checked by `supply.winding-current` (caution: secondaryRmsA above windingRatedA) and `supply.ripple-current` (caution: rippleCurrentA above `capRippleRatingA` when stated). A passing check is a calculation, not a safety approval: mains, stored charge and heat can hurt — defer to local electrical codes and licensed practice.',
		body: specCheckBody,
		response: specCheckOut,
		errors: [400, 422]
	},
	{
		method: 'post',
		path: '/api/v1/spec-check/build',
		tag: 'Spec checks',
		summary: 'Check a whole build: every block, then the checks across blocks and the parts list',
		description:
			'The same computation as the build page. Inside a build whose supply block states the rails, an amplifier block’s worst-case figures use that supply’s off-load rail at high mains. Issue paths start at the body root: `blocks.2.data.railV`. A passing check is a calculation, not a safety approval: mains, stored charge and heat can hurt — defer to local electrical codes and licensed practice.',
		body: specCheckBuildBody,
		response: specCheckBuildOut,
		errors: [400, 422]
	},
	{ method: 'post', path: '/api/v1/tools/amplifier', tag: 'Bench tools', summary: 'Class AB/B output stage: power, current and dissipation', body: amplifierToolInput, response: amplifierOut, errors: [400, 422] },
	{ method: 'post', path: '/api/v1/tools/heatsink', tag: 'Bench tools', summary: 'Required heatsink resistance and junction temperature', body: heatsinkToolInput, response: heatsinkOut, errors: [400, 422] },
	{ method: 'post', path: '/api/v1/tools/supply', tag: 'Bench tools', summary: 'Capacitor-input linear supply: rail and ripple', body: supplyToolInput, response: supplyOut, errors: [400, 422] },
	{ method: 'post', path: '/api/v1/tools/gain', tag: 'Bench tools', summary: 'Non-inverting gain from Rf and Ri', body: gainToolInput, response: gainOut, errors: [400, 422] },
	{ method: 'post', path: '/api/v1/tools/corner', tag: 'Bench tools', summary: 'First-order RC corner frequency', body: cornerToolInput, response: cornerOut, errors: [400, 422] },
	{ method: 'post', path: '/api/v1/tools/network', tag: 'Bench tools', summary: 'Series or parallel combination of 2 to 50 parts', body: networkToolInput, response: networkOut, errors: [400, 422] },
	{
		method: 'get',
		path: '/api/v1/parts/value',
		tag: 'Bench tools',
		summary: 'Read a parts-list value for a part kind, as the parts editor does',
		description:
			'Trade notation per kind: RKM and SI prefixes, networks ("2×1u series", "10k||10k"), ratings ("100n 275VAC"), bare 3-digit codes ("104"; on an inductor line in µH), 4-digit resistor codes ("4702" = 47.0 kΩ, IEC 60062); any other bare number on a capacitor or inductor line is 422 with a sentence (never read as farads or henries). A bare "+" between capacitors ("1u+1u") is ambiguous: 422 with a sentence naming both "2×1u series" and "1u||1u".',
		query: partValueQuery,
		response: partValueOut,
		errors: [400, 422]
	},
	{ method: 'get', path: '/api/v1/tools/decode', tag: 'Bench tools', summary: 'Read a component marking (RKM, 3/4-digit codes, potentiometers)', query: decodeQuery, response: decodeOut, errors: [400, 422], cached: true },
	{
		method: 'get',
		path: '/api/v1/tools/resistor-bands',
		tag: 'Bench tools',
		summary: 'Resistor colour bands, both ways',
		description: 'Either `valueOhm` (with `tolerancePct`, `bands`) → `bands`, or `colors` → `valueOhm`, `tolerancePct`.',
		query: resistorBandsValueQuery.partial().extend(resistorBandsColorsQuery.partial().shape),
		response: bandsOut,
		errors: [400, 422],
		cached: true
	},
	{ method: 'get', path: '/api/v1/tools/eseries', tag: 'Bench tools', summary: 'Nearest E-series value (by ratio)', query: eseriesQuery, response: eseriesOut, errors: [400, 422], cached: true },
	// Service
	{
		method: 'get',
		path: '/api/v1/ping',
		tag: 'Service',
		summary: 'Liveness probe: a static "ok"',
		response: { mediaType: 'text/plain', schema: { type: 'string', const: 'ok' }, description: 'The string ok.' },
		errors: []
	},
	{
		method: 'get',
		path: '/api/v1/openapi.json',
		tag: 'Service',
		summary: 'This document',
		response: { mediaType: 'application/json', schema: { type: 'object' }, description: 'OpenAPI 3.1 document.' },
		errors: [],
		cached: true
	}
];

const TAG_TEXT: Record<string, string> = {
	Builds: 'Published build journals: list (filters, search, keyset cursor), detail, parts list.',
	Comments: 'Discussion on builds, and reports to the moderators.',
	Search: 'Search-as-you-type.',
	Bench: 'A member’s saved builds.',
	'Spec checks': 'Server-side checking of spec blocks.',
	'Bench tools': 'Calculators; no sign-in needed.',
	Service: 'Health and this description.'
};

/** zod → JSON Schema 2020-12 (what OpenAPI 3.1 speaks), describing what a client sends (`input`) or receives. */
function jsonSchema(schema: z.ZodType, io: 'input' | 'output'): JsonSchema {
	const out = z.toJSONSchema(schema, { io, unrepresentable: 'any', target: 'draft-2020-12' }) as JsonSchema;
	delete out.$schema;
	return out;
}

const pathParams = (path: string) =>
	[...path.matchAll(/\{(\w+)\}/g)].map(([, name]) => ({
		name,
		in: 'path',
		required: true,
		schema: name === 'id' ? { type: 'string', format: 'uuid' } : { type: 'string', pattern: '^[a-z0-9][a-z0-9-]*$' },
		description: name === 'slug' ? 'The build’s slug, as in /builds/<slug>' : 'The comment’s id'
	}));

/**
 * One parameter per property of a query schema. Numbers travel as text in a query string: where the
 * schema turns text into a number, the number's schema (with its range) is published, as OpenAPI's
 * query serialization expects.
 */
function queryParams(query: z.ZodObject) {
	type Obj = { properties?: Record<string, JsonSchema>; required?: string[] };
	const input = jsonSchema(query, 'input') as Obj;
	const output = jsonSchema(query, 'output') as Obj;
	return Object.entries(input.properties ?? {}).map(([name, s]) => {
		const out = output.properties?.[name];
		const numeric = out && (out.type === 'number' || out.type === 'integer') && s.type !== out.type;
		const schema = numeric ? { ...out, ...(s.default !== undefined ? { default: Number(s.default) } : {}) } : s;
		return {
			name,
			in: 'query',
			required: input.required?.includes(name) ?? false,
			schema,
			...(typeof schema.description === 'string' ? { description: schema.description } : {})
		};
	});
}

const ERROR_TEXT: Record<number, string> = {
	400: 'Malformed request: bad JSON, a missing field, a wrong type or a value outside an enum.',
	401: 'Sign in first (`unauthenticated`).',
	403: 'Signed in, but not allowed (`forbidden`), e.g. a suspended member or a locked build.',
	404: 'No such build or item (`not_found`); drafts look absent to everyone but their maker.',
	405: 'The route does not answer this method (`method_not_allowed`); `Allow` lists those it does.',
	409: 'The request conflicts with the current state (`conflict`).',
	422: 'A value is out of range or cannot be represented (`invalid`, with issue paths).',
	429: 'Too many writes in a short time (`rate_limited`); `Retry-After` says when to try again.'
};

/** The OpenAPI 3.1 document for the API served at `origin` (or relative, without one). */
export function openApiDocument(origin?: string) {
	const paths: Record<string, Record<string, unknown>> = {};
	for (const op of OPERATIONS) {
		const status = String(op.status ?? 200);
		const responses: Record<string, unknown> = {};
		if (op.status === 204) responses['204'] = { description: 'Done; no body.' };
		else if (op.response && 'mediaType' in op.response) {
			responses[status] = { description: op.response.description, content: { [op.response.mediaType]: { schema: op.response.schema } } };
		} else {
			responses[status] = {
				description: 'Success.',
				...(op.cached ? { headers: { ETag: { $ref: '#/components/headers/ETag' }, 'Cache-Control': { $ref: '#/components/headers/CacheControl' } } } : {}),
				content: { 'application/json': { schema: op.response ? jsonSchema(op.response, 'output') : { type: 'object' } } }
			};
		}
		if (op.cached) responses['304'] = { description: 'Not modified: the body would equal the one whose ETag was sent in If-None-Match.' };
		for (const code of [...new Set([...op.errors, 405])].sort()) responses[String(code)] = { $ref: `#/components/responses/E${code}` };
		const params = [...pathParams(op.path), ...(op.query ? queryParams(op.query) : [])];
		const operation: Record<string, unknown> = {
			operationId: `${op.method}${op.path.replace('/api/v1', '').replace(/[{}]/g, '').replace(/[^a-zA-Z0-9]+(.)?/g, (_m, c: string | undefined) => (c ? c.toUpperCase() : ''))}`,
			tags: [op.tag],
			summary: op.summary,
			...(op.description || op.limited
				? {
						description: [op.description, op.limited ? 'Counts against the write rate limit (429 `rate_limited` with `Retry-After`).' : '']
							.filter(Boolean)
							.join('\n\n')
					}
				: {}),
			...(params.length ? { parameters: params } : {}),
			...(op.body ? { requestBody: { required: true, content: { 'application/json': { schema: jsonSchema(op.body, 'input') } } } } : {}),
			responses,
			security: op.auth ? [{ session: [] }] : []
		};
		(paths[op.path] ??= {})[op.method] = operation;
	}
	const errorSchema = {
		type: 'object',
		required: ['error'],
		properties: {
			error: {
				type: 'object',
				required: ['code', 'message', 'issues'],
				properties: {
					code: {
						type: 'string',
						enum: ['invalid', 'unauthenticated', 'forbidden', 'not_found', 'method_not_allowed', 'conflict', 'too_large', 'rate_limited', 'unavailable', 'internal']
					},
					message: { type: 'string', description: 'A human sentence.' },
					issues: {
						type: 'array',
						items: {
							type: 'object',
							required: ['path', 'message'],
							properties: {
								path: { type: 'string', description: 'Dot path from the body (or query) root, array indexes as numbers: data.device.minLoadOhm' },
								message: { type: 'string' }
							}
						}
					}
				}
			}
		}
	};
	const responses: Record<string, unknown> = {};
	for (const [code, text] of Object.entries(ERROR_TEXT)) {
		responses[`E${code}`] = {
			description: text,
			...(code === '429' ? { headers: { 'Retry-After': { schema: { type: 'integer' }, description: 'Seconds to wait.' } } } : {}),
			content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } }
		};
	}
	return {
		openapi: '3.1.0',
		jsonSchemaDialect: 'https://json-schema.org/draft/2020-12/schema',
		info: {
			title: 'Starground API',
			version: '1',
			summary: 'Build journals, spec checks and bench tools for DIY audio.',
			description:
				'JSON over HTTP. Numbers are plain SI values and every numeric field name ends in its unit (railV, loadOhm, cornerHz). Errors share one envelope (components.schemas.Error). Public reads carry a weak ETag and answer 304 to If-None-Match. A sign-off as “safe” is a peer’s opinion of one revision, never a certification.'
		},
		servers: [{ url: origin ?? '/' }],
		tags: Object.entries(TAG_TEXT).map(([name, description]) => ({ name, description })),
		paths,
		components: {
			schemas: { Error: errorSchema },
			responses,
			headers: {
				ETag: { description: 'Weak validator of the body: send it back in If-None-Match.', schema: { type: 'string' } },
				CacheControl: { description: 'How long the answer may be reused.', schema: { type: 'string' } }
			},
			securitySchemes: {
				session: { type: 'apiKey', in: 'cookie', name: 'better-auth.session_token', description: 'The session cookie set by signing in on the site.' }
			}
		}
	};
}

export type OpenApiDocument = ReturnType<typeof openApiDocument>;
