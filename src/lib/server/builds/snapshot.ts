/**
 * The frozen state of a build at one revision (stored in build_revision.snapshot) and the diff summary
 * between two of them: "2 steps changed, title changed, parts: 1 added". Pure; no I/O.
 */
import type { PartLineFields } from '$lib/parts';

export interface SnapshotBuild {
	title: string;
	summary: string;
	category: string;
	topology: string;
	mainsPowered: boolean;
	licence: string;
	coverPhotoId: string | null;
}

export interface SnapshotStep {
	id: string;
	title: string;
	bodyMd: string;
	bodyHtml: string;
	/** Photos of the step, in order. */
	photoIds: string[];
}

export interface SnapshotSpecBlock {
	id: string;
	kind: string;
	title: string;
	data: Record<string, unknown>;
	derived: Record<string, unknown>;
	checks: unknown[];
}

/** Part-line fields added after the first revisions were taken (issue 13): absent from older snapshots. */
type LaterPartFields = 'ratingVAc' | 'mpn' | 'supplier' | 'unitPrice' | 'currency' | 'perChannel';

export interface SnapshotPart extends Omit<PartLineFields, LaterPartFields>, Partial<Pick<PartLineFields, LaterPartFields>> {
	id: string;
	/** Checks stored with the line at that time (not compared by the diff: they follow from the fields). */
	checks?: unknown[];
}

/** Everything a revision records. Steps, spec blocks and parts are in their display order. */
export interface BuildSnapshot {
	version: 1;
	build: SnapshotBuild;
	steps: SnapshotStep[];
	specBlocks: SnapshotSpecBlock[];
	parts: SnapshotPart[];
	/** Files attached to the build (absent in snapshots taken before attachments existed). */
	attachments?: SnapshotAttachment[];
}

export interface SnapshotAttachment {
	id: string;
	name: string;
	kind: string;
}

/** JSON with object keys sorted, so equal content compares equal whatever the key order (jsonb reorders keys). */
export function stableJson(value: unknown): string {
	if (Array.isArray(value)) return `[${value.map(stableJson).join(',')}]`;
	if (value && typeof value === 'object') {
		const entries = Object.entries(value as Record<string, unknown>)
			.filter(([, v]) => v !== undefined)
			.sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
		return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${stableJson(v)}`).join(',')}}`;
	}
	return JSON.stringify(value ?? null);
}

interface ListDiff {
	added: number;
	removed: number;
	changed: number;
	/** Pairs [previous index, next index] of items present in both. */
	pairs: [number, number][];
}

/**
 * Match two lists of items: first by id, then (for items whose ids changed, e.g. a list saved by
 * delete-and-insert) by identical content, then by label. Whatever is left is added or removed.
 */
export function diffList<T extends { id: string }>(
	prev: T[],
	next: T[],
	content: (item: T) => string,
	label: (item: T) => string
): ListDiff {
	const pairs: [number, number][] = [];
	let changed = 0;
	const prevLeft = new Set(prev.map((_, i) => i));
	const nextLeft = new Set(next.map((_, i) => i));
	const prevById = new Map(prev.map((p, i) => [p.id, i]));

	next.forEach((n, j) => {
		const i = prevById.get(n.id);
		if (i === undefined || !prevLeft.has(i)) return;
		prevLeft.delete(i);
		nextLeft.delete(j);
		pairs.push([i, j]);
		if (content(prev[i]) !== content(n)) changed++;
	});

	const pass = (key: (item: T) => string, counts: boolean) => {
		const byKey = new Map<string, number[]>();
		for (const i of prevLeft) {
			const k = key(prev[i]);
			byKey.set(k, [...(byKey.get(k) ?? []), i]);
		}
		for (const j of [...nextLeft]) {
			const candidates = byKey.get(key(next[j]));
			const i = candidates?.shift();
			if (i === undefined) continue;
			prevLeft.delete(i);
			nextLeft.delete(j);
			pairs.push([i, j]);
			if (counts && content(prev[i]) !== content(next[j])) changed++;
		}
	};
	pass(content, false);
	pass((item) => label(item).trim().toLowerCase(), true);

	return { added: nextLeft.size, removed: prevLeft.size, changed, pairs };
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** "1 added, 2 changed" from counts, skipping zeros. */
function counts(d: ListDiff): string {
	return [
		d.added ? `${d.added} added` : '',
		d.changed ? `${d.changed} changed` : '',
		d.removed ? `${d.removed} removed` : ''
	]
		.filter(Boolean)
		.join(', ');
}

/** What counts as a step's content (its photos are compared apart). */
export const stepContent = (s: SnapshotStep) => stableJson([s.title, s.bodyMd]);
/** What counts as a spec block's content (derived values and checks follow from it). */
export const specContent = (b: SnapshotSpecBlock) => stableJson([b.kind, b.title, b.data]);

/** The build fields a revision records and a diff names, with their names on screen. */
export const BUILD_FIELD_NAMES: readonly [keyof SnapshotBuild, string][] = [
	['title', 'title'],
	['summary', 'summary'],
	['category', 'category'],
	['topology', 'topology'],
	['mainsPowered', 'mains powered'],
	['licence', 'licence']
];

const yesNo = (v: unknown) => (v ? 'yes' : 'no');

/**
 * The fields of a parts line a reader sees, as a diff names and shows them: [field, name on screen, how shown].
 * Text as typed; numbers plainly; flags as yes/no. Blank, null and absent read alike (and an absent flag as "no"), so
 * snapshots taken before a field existed compare equal to ones with it unset.
 */
export const PART_DIFF_FIELDS: readonly [keyof SnapshotPart, string, (v: unknown) => string][] = (
	[
		['designators', 'designators'],
		['quantity', 'quantity'],
		['kind', 'kind'],
		['valueText', 'value'],
		['tolerancePct', 'tolerance %'],
		['ratingV', 'rating V'],
		['ratingVAc', 'voltage rating is AC', yesNo],
		['ratingW', 'rating W'],
		['package', 'package'],
		['notes', 'notes'],
		['designValueText', 'design value'],
		['substitutionReason', 'substitution reason'],
		['mpn', 'manufacturer part number'],
		['supplier', 'supplier'],
		['unitPrice', 'unit price'],
		['currency', 'currency'],
		['perChannel', 'per channel', yesNo]
	] as [keyof SnapshotPart, string, ((v: unknown) => string)?][]
).map(([k, name, show]) => [k, name, show ?? ((v: unknown) => (v === null || v === undefined ? '' : String(v)))]);

/** A parts line's field as a reader sees it (PART_DIFF_FIELDS); no line reads as a line with the field unset ('' or "no"). */
export const shownPartField = (p: SnapshotPart | null | undefined, field: (typeof PART_DIFF_FIELDS)[number]): string => field[2](p?.[field[0]]);

/** What counts as a parts line's content: every field as shown. */
export const partContent = (p: SnapshotPart) => stableJson(PART_DIFF_FIELDS.map((f) => shownPartField(p, f)));

/** A parts line's label in summaries and diffs: "R1 0R22", or its kind. */
export const partLabel = (p: SnapshotPart) => [p.designators, p.valueText || p.kind].filter(Boolean).join(' ') || p.kind;
/** The key a parts line is matched by when its id changed. */
export const partMatchKey = (p: SnapshotPart) => `${p.designators}|${p.kind}`;

/** Attachments added and removed between two snapshots, matched by id only (a file replaced by another of the same name is one removed, one added). */
export function attachmentChanges(prev: BuildSnapshot, next: BuildSnapshot): { added: SnapshotAttachment[]; removed: SnapshotAttachment[] } {
	const prevIds = new Set((prev.attachments ?? []).map((a) => a.id));
	const nextIds = new Set((next.attachments ?? []).map((a) => a.id));
	return {
		added: (next.attachments ?? []).filter((a) => !prevIds.has(a.id)),
		removed: (prev.attachments ?? []).filter((a) => !nextIds.has(a.id))
	};
}

/** The stored fields of a parts line, in column order: THE list a snapshot keeps and the API shows (with id and checks). */
export const PART_LINE_KEYS = [
	'designators',
	'quantity',
	'kind',
	'valueText',
	'value',
	'unit',
	'tolerancePct',
	'ratingV',
	'ratingVAc',
	'ratingW',
	'package',
	'notes',
	'designValueText',
	'designValue',
	'substitutionReason',
	'deviationPct',
	'mpn',
	'supplier',
	'unitPrice',
	'currency',
	'perChannel'
] as const satisfies readonly (keyof PartLineFields)[];
// Every stored field is in the list: a field added to PartLineFields and not here fails to compile.
const everyPartField: Exclude<keyof PartLineFields, (typeof PART_LINE_KEYS)[number]> extends never ? true : never = true;
void everyPartField;

/** The spec block fields a snapshot keeps and the API shows. */
export const SPEC_BLOCK_KEYS = ['id', 'kind', 'title', 'data', 'derived', 'checks'] as const satisfies readonly (keyof SnapshotSpecBlock)[];

/** `keys` of `o`, in that order. */
function pick<T, K extends keyof T>(o: T, keys: readonly K[]): Pick<T, K> {
	return Object.fromEntries(keys.map((k) => [k, o[k]])) as Pick<T, K>;
}

/** A parts line (a part_line row) as a snapshot keeps it: id, the stored fields (PART_LINE_KEYS) and its checks. */
export function snapshotPart<P extends PartLineFields & { id: string; checks: unknown }>(p: P): Pick<P, 'id' | (typeof PART_LINE_KEYS)[number] | 'checks'> {
	return pick(p, ['id', ...PART_LINE_KEYS, 'checks']);
}

/** What a field absent from an older snapshot means (fields added later, issue 13); any other absent field is null. */
const LATER_PART_DEFAULTS: Partial<Record<(typeof PART_LINE_KEYS)[number], unknown>> = { ratingVAc: false, mpn: '', supplier: '', perChannel: false };

/** A snapshot's parts line as a whole stored line (PART_LINE_KEYS), fields it predates filled with their defaults. */
export function partLineOfSnapshot(p: SnapshotPart): PartLineFields & { id: string; checks: unknown[] } {
	const fields = Object.fromEntries(PART_LINE_KEYS.map((k) => [k, p[k] ?? LATER_PART_DEFAULTS[k] ?? null])) as unknown as PartLineFields;
	return { ...fields, id: p.id, checks: p.checks ?? [] };
}

/** A spec block as a snapshot keeps it and the API shows it. */
export function snapshotSpecBlock<B extends SnapshotSpecBlock>(b: B): Pick<B, (typeof SPEC_BLOCK_KEYS)[number]> {
	return pick(b, SPEC_BLOCK_KEYS);
}

/**
 * What changed between two snapshots, as short phrases in a fixed order (steps, build fields, photos,
 * spec blocks, parts). An empty list means nothing a reader would see changed.
 * diffSnapshots(a, b) → ['2 steps changed', 'title changed', 'parts: 1 added'].
 */
export function diffSnapshots(prev: BuildSnapshot, next: BuildSnapshot): string[] {
	const out: string[] = [];

	const steps = diffList(prev.steps, next.steps, stepContent, (s) => s.title);
	if (steps.added) out.push(`${plural(steps.added, 'step')} added`);
	if (steps.changed) out.push(`${plural(steps.changed, 'step')} changed`);
	if (steps.removed) out.push(`${plural(steps.removed, 'step')} removed`);
	const order = [...steps.pairs].sort((a, b) => a[1] - b[1]).map(([i]) => i);
	if (order.some((v, k) => k > 0 && v < order[k - 1])) out.push('steps reordered');

	for (const [key, name] of BUILD_FIELD_NAMES) {
		if (stableJson(prev.build[key]) !== stableJson(next.build[key])) out.push(`${name} changed`);
	}

	const prevPhotos = new Set(prev.steps.flatMap((s) => s.photoIds));
	const nextPhotos = new Set(next.steps.flatMap((s) => s.photoIds));
	const photosAdded = [...nextPhotos].filter((p) => !prevPhotos.has(p)).length;
	const photosRemoved = [...prevPhotos].filter((p) => !nextPhotos.has(p)).length;
	const photoBits = [photosAdded ? `${photosAdded} added` : '', photosRemoved ? `${photosRemoved} removed` : ''].filter(Boolean);
	if (photoBits.length) out.push(`photos: ${photoBits.join(', ')}`);
	if ((prev.build.coverPhotoId ?? null) !== (next.build.coverPhotoId ?? null)) out.push('cover photo changed');

	const specs = diffList(prev.specBlocks, next.specBlocks, specContent, (b) => `${b.kind}:${b.title}`);
	const specText = counts(specs);
	if (specText) out.push(`spec blocks: ${specText}`);

	const parts = diffList(prev.parts, next.parts, partContent, partMatchKey);
	const partText = counts(parts);
	if (partText) out.push(`parts: ${partText}`);

	const files = attachmentChanges(prev, next);
	const fileBits = [files.added.length ? `${files.added.length} added` : '', files.removed.length ? `${files.removed.length} removed` : ''].filter(Boolean);
	if (fileBits.length) out.push(`attachments: ${fileBits.join(', ')}`);

	return out;
}

/** The one-line summary stored with a revision: "first published" for r1, else the joined phrases. */
export function summarize(prev: BuildSnapshot | null, next: BuildSnapshot): string {
	if (!prev) return 'first published';
	const bits = diffSnapshots(prev, next);
	return bits.length ? bits.join(', ') : 'no visible changes';
}
