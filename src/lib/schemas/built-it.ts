/**
 * The "I built this too" form (PRODUCT.md §3): what a member measured on their own copy of a build, typed as
 * the trade writes it — lists of numbers ("27.6, -27.8"), THD points as power@THD ("10@0.02, 42@1") — and
 * turned into a bring-up block and a measurements block, which the server then checks like any block.
 * Pure (shared by the form action and its tests).
 */
import { z } from 'zod';

export const BUILT_IT_NOTE_MAX = 2000;

const numberList = (text: string): number[] | null => {
	const t = text.trim();
	if (t === '') return [];
	const parts = t.split(/[,;\s]+/).filter(Boolean);
	const out = parts.map((p) => Number(p.replace(/^\+/, '').replace('−', '-')));
	return out.every(Number.isFinite) ? out : null;
};

/** "10@0.02, 42@1" → [{ powerW: 10, thdPct: 0.02 }, { powerW: 42, thdPct: 1 }]; null when a point cannot be read. */
export function parseThdPoints(text: string): { powerW: number; thdPct: number }[] | null {
	const t = text.trim();
	if (t === '') return [];
	const out: { powerW: number; thdPct: number }[] = [];
	for (const p of t.split(/[,;]+/).map((s) => s.trim()).filter(Boolean)) {
		const m = /^([0-9.]+)\s*W?\s*@\s*([0-9.]+)\s*%?$/i.exec(p);
		if (!m || !Number.isFinite(Number(m[1])) || !Number.isFinite(Number(m[2]))) return null;
		out.push({ powerW: Number(m[1]), thdPct: Number(m[2]) });
	}
	return out;
}

const list = (what: string) =>
	z
		.string()
		.max(500, 'at most 500 characters')
		.default('')
		.transform((t, ctx) => {
			const v = numberList(t);
			if (v === null) {
				ctx.addIssue({ code: 'custom', message: `write ${what} as numbers separated by commas, e.g. 27.6, -27.8` });
				return z.NEVER;
			}
			return v;
		});

/** The form's fields, all text as a form sends them. */
export const builtItForm = z
	.object({
		note: z.string().trim().max(BUILT_IT_NOTE_MAX, `at most ${BUILT_IT_NOTE_MAX} characters`).default(''),
		basedOn: z.string().trim().max(500, 'at most 500 characters').default(''),
		currentLimited: z
			.string()
			.optional()
			.transform((v) => v === 'on' || v === 'true'),
		railsExpectedV: list('the expected rails'),
		railsMeasuredV: list('the measured rails'),
		dcOffsetMv: list('the DC offsets'),
		thdPoints: z
			.string()
			.max(2000, 'at most 2000 characters')
			.default('')
			.transform((t, ctx) => {
				const v = parseThdPoints(t);
				if (v === null) {
					ctx.addIssue({ code: 'custom', message: 'write each point as power@THD, e.g. 10@0.02, 42@1 (W @ %)' });
					return z.NEVER;
				}
				return v;
			}),
		loadOhm: z
			.string()
			.trim()
			.default('')
			.transform((t, ctx) => {
				if (t === '') return null;
				const n = Number(t);
				if (!Number.isFinite(n)) {
					ctx.addIssue({ code: 'custom', message: 'must be a number of ohms, e.g. 8' });
					return z.NEVER;
				}
				return n;
			})
	})
	.superRefine((f, ctx) => {
		if (f.railsMeasuredV.length !== f.railsExpectedV.length)
			ctx.addIssue({
				code: 'custom',
				path: ['railsMeasuredV'],
				message: `give one measured value for each expected rail (${f.railsExpectedV.length} expected, ${f.railsMeasuredV.length} measured)`
			});
		figureRules(f, ctx, { offset: 'dcOffsetMv', figures: 'railsMeasuredV' });
	});
export type BuiltItForm = z.output<typeof builtItForm>;

/** The rules both the form and the API body follow: distortion needs the offset, and at least one figure. */
function figureRules(
	f: Pick<BuiltItForm, 'railsMeasuredV' | 'dcOffsetMv' | 'thdPoints'>,
	ctx: z.RefinementCtx,
	path: { offset: string; figures: string }
): void {
	if (f.thdPoints.length && f.dcOffsetMv.length === 0)
		ctx.addIssue({ code: 'custom', path: [path.offset], message: 'measure the DC offset too (one value per channel) before distortion figures' });
	if (!f.railsMeasuredV.length && !f.dcOffsetMv.length && !f.thdPoints.length)
		ctx.addIssue({ code: 'custom', path: [path.figures], message: 'give at least one figure you measured: rails, DC offset or distortion points' });
}

const finite = z.number().refine(Number.isFinite, 'must be a finite number');

/**
 * The JSON body of `POST /api/v1/builds/{slug}/built-it` (API.md conventions: SI numbers, the unit in every
 * field name): the same figures as the form, as numbers. Checked afterwards like the form (the bring-up and
 * measurements blocks' own schemas and checks).
 */
export const builtItApiBody = z
	.object({
		note: z.string().trim().max(BUILT_IT_NOTE_MAX, `at most ${BUILT_IT_NOTE_MAX} characters`).default(''),
		basedOn: z.string().trim().max(500, 'at most 500 characters').nullish().describe('Your own published build based on this one (slug or link)'),
		currentLimited: z.boolean().default(false).describe('First power-up through a current limiter (bulb or variac)'),
		rails: z.array(z.object({ expectedV: finite, measuredV: finite })).max(8, 'at most 8 rails').default([]),
		dcOffsetMv: z.array(finite).max(8, 'at most 8 channels').default([]),
		thd: z.array(z.object({ powerW: finite, thdPct: finite })).max(50, 'at most 50 points').default([]).describe('Output power at a THD figure, W @ %'),
		loadOhm: finite.nullish()
	})
	.transform(
		(b): BuiltItForm => ({
			note: b.note,
			basedOn: b.basedOn ?? '',
			currentLimited: b.currentLimited,
			railsExpectedV: b.rails.map((r) => r.expectedV),
			railsMeasuredV: b.rails.map((r) => r.measuredV),
			dcOffsetMv: b.dcOffsetMv,
			thdPoints: b.thd,
			loadOhm: b.loadOhm ?? null
		})
	)
	.superRefine((f, ctx) => figureRules(f, ctx, { offset: 'dcOffsetMv', figures: 'rails' }));

/** The API body's field for a form field an issue names (recordBuiltIt reports form fields). */
export function apiFieldOf(formField: string): string {
	return { railsExpectedV: 'rails', railsMeasuredV: 'rails', thdPoints: 'thd' }[formField] ?? formField;
}

/** The blocks a filled form stands for: a bring-up block (rails, offsets, current limiter) and, with distortion points or a load, a measurements block. */
export function blocksOfForm(f: BuiltItForm): { kind: 'bringup' | 'measurements'; data: Record<string, unknown> }[] {
	const out: { kind: 'bringup' | 'measurements'; data: Record<string, unknown> }[] = [];
	if (f.railsMeasuredV.length || f.dcOffsetMv.length) {
		out.push({
			kind: 'bringup',
			data: {
				currentLimited: f.currentLimited,
				rails: f.railsExpectedV.map((e, i) => ({ label: e >= 0 ? `+${i + 1}` : `−${i + 1}`, expectedV: e, measuredV: f.railsMeasuredV[i] })),
				dcOffsetMv: f.dcOffsetMv
			}
		});
	}
	if (f.dcOffsetMv.length && (f.thdPoints.length || f.loadOhm !== null)) {
		out.push({
			kind: 'measurements',
			data: { dcOffsetMv: f.dcOffsetMv, ...(f.thdPoints.length ? { points: { thd: f.thdPoints } } : {}), ...(f.loadOhm !== null ? { loadOhm: f.loadOhm } : {}) }
		});
	}
	return out;
}

/** Which form field a block issue belongs to: 'bringup' + 'rails.0.measuredV' → railsMeasuredV. */
export function fieldOfIssue(kind: string, path: string): string {
	const head = path.split('.')[0];
	if (head === 'rails') return path.endsWith('expectedV') ? 'railsExpectedV' : 'railsMeasuredV';
	if (head === 'dcOffsetMv') return 'dcOffsetMv';
	if (head === 'points') return 'thdPoints';
	if (head === 'loadOhm') return 'loadOhm';
	if (head === 'currentLimited') return 'currentLimited';
	return kind === 'measurements' ? 'thdPoints' : 'railsMeasuredV';
}

/** The figures a record shows beside the others' (null where the builder did not measure it). */
export interface BuiltItFigures {
	railsMeasuredV: number[];
	maxAbsOffsetMv: number | null;
	clipPowerW: number | null;
	loadOhm: number | null;
	danger: number;
	caution: number;
}

/** Figures of a record from its stored blocks (the derived values the checks worked out). */
export function figuresOf(blocks: { kind: string; data: Record<string, unknown>; derived: Record<string, unknown>; checks: { level: string }[] }[]): BuiltItFigures {
	const b = blocks.find((x) => x.kind === 'bringup');
	const m = blocks.find((x) => x.kind === 'measurements');
	const n = (v: unknown) => (typeof v === 'number' && Number.isFinite(v) ? v : null);
	const rails = Array.isArray(b?.data.rails) ? (b!.data.rails as { measuredV: number }[]).map((r) => r.measuredV) : [];
	const all = blocks.flatMap((x) => x.checks);
	return {
		railsMeasuredV: rails,
		maxAbsOffsetMv: n(m?.derived.maxAbsOffsetMv) ?? n(b?.derived.maxAbsOffsetMv),
		clipPowerW: n(m?.derived.clipPowerW),
		loadOhm: n(m?.data.loadOhm),
		danger: all.filter((c) => c.level === 'danger').length,
		caution: all.filter((c) => c.level === 'caution').length
	};
}

/** What the original itself states, for the reference lines: its amplifier's rail (each side) and claimed or rail-limited power. */
export function referenceFigures(blocks: { kind: string; data: Record<string, unknown>; derived: Record<string, unknown> }[]): {
	railV: number | null;
	powerW: number | null;
	offsetMv: number | null;
} {
	const n = (v: unknown) => (typeof v === 'number' && Number.isFinite(v) ? v : null);
	const amp = blocks.find((b) => b.kind === 'amplifier');
	const meas = blocks.find((b) => b.kind === 'measurements');
	const claimed = amp?.data.claimed as { powerW?: unknown } | null | undefined;
	const rail = n(amp?.data.railV);
	return {
		railV: rail === null ? null : amp?.data.supply === 'single' ? rail / 2 : rail,
		powerW: n(meas?.derived.clipPowerW) ?? n(claimed?.powerW) ?? n(amp?.derived.maxPowerW),
		offsetMv: n(meas?.derived.maxAbsOffsetMv)
	};
}
