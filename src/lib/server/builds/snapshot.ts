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

const stepContent = (s: SnapshotStep) => stableJson([s.title, s.bodyMd]);
const specContent = (b: SnapshotSpecBlock) => stableJson([b.kind, b.title, b.data]);
const partContent = (p: SnapshotPart) =>
	stableJson([
		p.designators,
		p.quantity,
		p.kind,
		p.valueText,
		p.tolerancePct,
		p.ratingV,
		p.ratingW,
		p.package,
		p.notes,
		p.designValueText,
		p.substitutionReason,
		// Costed-list fields (issue 13) count only when set, so snapshots from before them compare equal.
		...(p.ratingVAc || p.mpn || p.supplier || (p.unitPrice ?? null) !== null || (p.currency ?? null) !== null || p.perChannel
			? [!!p.ratingVAc, p.mpn ?? '', p.supplier ?? '', p.unitPrice ?? null, p.currency ?? null, !!p.perChannel]
			: [])
	]);

const FIELD_NAMES: [keyof SnapshotBuild, string][] = [
	['title', 'title'],
	['summary', 'summary'],
	['category', 'category'],
	['topology', 'topology'],
	['mainsPowered', 'mains powered'],
	['licence', 'licence']
];

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

	for (const [key, name] of FIELD_NAMES) {
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

	const parts = diffList(prev.parts, next.parts, partContent, (p) => `${p.designators}|${p.kind}`);
	const partText = counts(parts);
	if (partText) out.push(`parts: ${partText}`);

	// Attachments are matched by id only: a file replaced by another of the same name is one removed, one added.
	const prevFiles = new Set((prev.attachments ?? []).map((a) => a.id));
	const nextFiles = new Set((next.attachments ?? []).map((a) => a.id));
	const filesAdded = [...nextFiles].filter((a) => !prevFiles.has(a)).length;
	const filesRemoved = [...prevFiles].filter((a) => !nextFiles.has(a)).length;
	const fileBits = [filesAdded ? `${filesAdded} added` : '', filesRemoved ? `${filesRemoved} removed` : ''].filter(Boolean);
	if (fileBits.length) out.push(`attachments: ${fileBits.join(', ')}`);

	return out;
}

/** The one-line summary stored with a revision: "first published" for r1, else the joined phrases. */
export function summarize(prev: BuildSnapshot | null, next: BuildSnapshot): string {
	if (!prev) return 'first published';
	const bits = diffSnapshots(prev, next);
	return bits.length ? bits.join(', ') : 'no visible changes';
}
