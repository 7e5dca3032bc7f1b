/**
 * Request schemas of the bench-tool API routes and of spec-check (API.md). Shared by server and client.
 * Ranges are sane bounds for DIY audio; a number outside them answers 422, a wrong type or enum 400.
 */
import { z } from 'zod';
import { BAND_COLORS, E_SERIES, MARKING_KINDS, RECTIFIERS } from '$lib/engineering';
import { SPEC_KINDS, num, oneOf, pos } from '$lib/specs';

/** POST /api/v1/tools/amplifier. */
export const amplifierToolInput = z.object({
	supply: oneOf(['split', 'single'] as const),
	/** split: each rail's magnitude; single: the whole supply. */
	railV: pos(200, 'V'),
	loadOhm: num(0.5, 100_000, 'Ω'),
	dropoutV: num(0, 20, 'V').default(0),
	outputW: pos(10_000, 'W').optional(),
	/** Worst case (API.md revision 2): mains above nominal, %, and the stage's quiescent current, A. */
	mainsHighPct: num(0, 25, '%').default(10),
	quiescentA: num(0, 20, 'A').default(0)
});

/** POST /api/v1/tools/heatsink. */
export const heatsinkToolInput = z.object({
	powerW: pos(2000, 'W'),
	ambientC: num(-40, 100, '°C'),
	junctionMaxC: num(50, 250, '°C'),
	rthJcKPerW: num(0, 50, 'K/W'),
	rthCsKPerW: num(0, 20, 'K/W'),
	rthSaKPerW: num(0, 100, 'K/W').optional(),
	marginC: num(0, 100, '°C').default(0),
	/** Devices sharing the heatsink, each dissipating powerW. */
	devices: z.number({ error: 'must be a whole number' }).int('must be a whole number').min(1, 'must be at least 1').max(64, 'must be at most 64').default(1)
});

/** POST /api/v1/tools/supply. */
export const supplyToolInput = z.object({
	secondaryVac: pos(1000, 'V'),
	rectifier: oneOf(RECTIFIERS),
	diodeDropV: num(0, 5, 'V').default(0.7),
	mainsHz: num(45, 65, 'Hz'),
	loadCurrentA: num(0, 100, 'A'),
	capacitanceF: pos(10, 'F'),
	/** Worst case (API.md revision 2): transformer regulation (10 % assumed), mains above and below nominal, %. */
	regulationPct: num(0, 50, '%').default(10),
	mainsHighPct: num(0, 25, '%').default(10),
	mainsLowPct: num(0, 25, '%').default(10)
});

/** POST /api/v1/tools/gain (non-inverting stage). */
export const gainToolInput = z.object({
	rfOhm: num(0, 1e9, 'Ω'),
	riOhm: pos(1e9, 'Ω')
});

/** POST /api/v1/tools/corner (first-order RC). */
export const cornerToolInput = z.object({
	rOhm: pos(1e9, 'Ω'),
	cF: pos(10, 'F')
});

/** POST /api/v1/tools/network. */
export const networkToolInput = z.object({
	part: oneOf(['resistor', 'capacitor', 'inductor'] as const),
	arrangement: oneOf(['series', 'parallel'] as const),
	values: z
		.array(pos(1e12), { error: (iss) => (iss.input === undefined ? 'required' : 'must be a list of numbers') })
		.min(2, 'needs at least 2 values')
		.max(50, 'at most 50 values')
});

/** GET /api/v1/tools/decode?code=…&as=… */
export const decodeQuery = z.object({
	code: z.string({ error: 'required' }).max(32, 'at most 32 characters'),
	as: oneOf(MARKING_KINDS).default('auto')
});

/** Query number: a decimal string → number; anything else is a wrong type (400). */
function queryNumber(min: number, max: number, unit: string, strict = false) {
	const u = unit ? ` ${unit}` : '';
	const base = z.number({ error: 'must be a number' });
	const ranged = (strict ? base.gt(min, `must be greater than ${min}${u}`) : base.min(min, `must be at least ${min}${u}`)).max(
		max,
		`must be at most ${max}${u}`
	);
	return z
		.string({ error: (iss) => (iss.input === undefined ? 'required' : 'must be a number') })
		.transform((s) => Number(s))
		.pipe(ranged);
}

/** GET /api/v1/tools/resistor-bands?valueOhm=…&tolerancePct=…&bands=… */
export const resistorBandsValueQuery = z.object({
	valueOhm: queryNumber(0, 1e12, 'Ω', true),
	tolerancePct: queryNumber(0, 20, '%', true).optional(),
	bands: oneOf(['3', '4', '5'] as const)
		.default('4')
		.transform((b) => Number(b) as 3 | 4 | 5)
});

/** Colour names accepted in ?colors= (API.md names, plus pink as ×10⁻³ and the spellings gray/purple). */
export const COLOR_NAMES = [...BAND_COLORS, 'pink', 'gray', 'purple'] as const;

/** GET /api/v1/tools/resistor-bands?colors=brown,black,orange,gold */
export const resistorBandsColorsQuery = z.object({
	colors: z
		.string()
		.transform((s) => s.split(',').map((c) => c.trim().toLowerCase()))
		.pipe(z.array(oneOf(COLOR_NAMES)).min(3, 'needs 3 to 6 colours').max(6, 'needs 3 to 6 colours'))
});

/** GET /api/v1/tools/eseries?value=…&series=E12 */
export const eseriesQuery = z.object({
	value: queryNumber(0, 1e15, '', true),
	series: oneOf(E_SERIES).default('E12')
});

/** POST /api/v1/spec-check: the block's `data` is validated by its kind's schema afterwards. */
export const specCheckInput = z.object({
	kind: oneOf(SPEC_KINDS),
	data: z.looseObject({}, { error: (iss) => (iss.input === undefined ? 'required' : 'must be an object') })
});

/** POST /api/v1/spec-check/build: each block's `data` is validated by its kind's schema afterwards. */
export const specCheckBuildInput = z.object({
	blocks: z
		.array(specCheckInput, { error: (iss) => (iss.input === undefined ? 'required' : 'must be a list of blocks') })
		.min(1, 'needs at least 1 block')
		.max(20, 'at most 20 blocks'),
	parts: z
		.array(
			z.object({
				designators: z.string({ error: (iss) => (iss.input === undefined ? 'required' : 'must be text') }).max(500, 'at most 500 characters'),
				kind: z.string({ error: (iss) => (iss.input === undefined ? 'required' : 'must be text') }).max(40, 'at most 40 characters'),
				value: z.number({ error: (iss) => (iss.input === undefined ? 'required' : 'must be a number') }).finite().nullable(),
				ratingV: pos(100_000, 'V').nullish(),
				railToRail: z.boolean({ error: 'must be true or false' }).optional(),
				valueText: z.string({ error: 'must be text' }).max(200, 'at most 200 characters').nullish(),
				designValueText: z.string({ error: 'must be text' }).max(200, 'at most 200 characters').nullish()
			}),
			{ error: 'must be a list of part lines' }
		)
		.max(2000, 'at most 2000 lines')
		.default([])
});
