/**
 * The differences between two revisions of a build, for the revisions compare page: build fields, step
 * text line by line (jsdiff's `diffLines`), spec-block values field by field, parts lines field by field
 * (snapshot.ts PART_DIFF_FIELDS: flags such as per channel and an AC rating as yes/no), and attachments
 * added or removed. Items are matched as the revision summary matches them (diffList: by id, then content,
 * then label). Pure; no I/O.
 */
import { diffLines } from 'diff';
import {
	BUILD_FIELD_NAMES,
	PART_DIFF_FIELDS,
	attachmentChanges,
	diffList,
	partContent,
	partLabel,
	partMatchKey,
	shownPartField,
	specContent,
	stableJson,
	stepContent,
	type BuildSnapshot
} from './snapshot';

export type ItemStatus = 'added' | 'removed' | 'changed' | 'same';

/** One field that differs: its name and the text before and after ('' when absent). */
export interface FieldChange {
	name: string;
	before: string;
	after: string;
}

/** A run of step text lines: kept, added or removed. */
export interface TextRun {
	kind: 'same' | 'added' | 'removed';
	text: string;
}

export interface StepDiff {
	status: ItemStatus;
	title: string;
	titleBefore: string | null;
	/** Line runs of the Markdown text (empty when the text is the same). */
	text: TextRun[];
	photos: { added: number; removed: number };
}

export interface ListItemDiff {
	status: ItemStatus;
	label: string;
	fields: FieldChange[];
}

/** A file attached or taken off between the two revisions. */
export interface AttachmentDiff {
	status: 'added' | 'removed';
	name: string;
	kind: string;
}

export interface RevisionDiff {
	fields: FieldChange[];
	steps: StepDiff[];
	specBlocks: ListItemDiff[];
	parts: ListItemDiff[];
	attachments: AttachmentDiff[];
	/** True when nothing differs. */
	empty: boolean;
}

/** A value as a reader sees it in a diff: strings as they are, numbers and booleans plainly, objects as JSON. */
function show(v: unknown): string {
	if (v === null || v === undefined) return '';
	if (typeof v === 'string') return v;
	if (typeof v === 'number' || typeof v === 'boolean') return String(v);
	return stableJson(v);
}

/** Fields of two flat-ish records that differ, nested objects flattened to dotted names ("fuse.ratingA"). */
export function recordChanges(before: Record<string, unknown>, after: Record<string, unknown>, prefix = ''): FieldChange[] {
	const out: FieldChange[] = [];
	const keys = [...new Set([...Object.keys(before ?? {}), ...Object.keys(after ?? {})])];
	for (const k of keys) {
		const a = before?.[k];
		const b = after?.[k];
		const name = prefix ? `${prefix}.${k}` : k;
		const nested = (x: unknown) => x !== null && typeof x === 'object' && !Array.isArray(x);
		if ((nested(a) || a === undefined || a === null) && (nested(b) || b === undefined || b === null) && (nested(a) || nested(b))) {
			out.push(...recordChanges((a ?? {}) as Record<string, unknown>, (b ?? {}) as Record<string, unknown>, name));
		} else if (stableJson(a) !== stableJson(b)) {
			out.push({ name, before: show(a), after: show(b) });
		}
	}
	return out;
}

/** Line runs between two texts (each run's text keeps its line breaks). */
export function textRuns(before: string, after: string): TextRun[] {
	if (before === after) return [];
	const norm = (t: string) => (t === '' || t.endsWith('\n') ? t : `${t}\n`);
	return diffLines(norm(before), norm(after)).map((c) => ({ kind: c.added ? 'added' : c.removed ? 'removed' : 'same', text: c.value }));
}

/** Pair two lists with diffList and give each item a status, in the newer list's order, removed ones last. */
function pairUp<T extends { id: string }>(prev: T[], next: T[], content: (x: T) => string, label: (x: T) => string) {
	const d = diffList(prev, next, content, label);
	const byNext = new Map(d.pairs.map(([i, j]) => [j, i]));
	const pairedPrev = new Set(d.pairs.map(([i]) => i));
	const out: { before: T | null; after: T | null }[] = next.map((n, j) => ({ before: byNext.has(j) ? prev[byNext.get(j)!] : null, after: n }));
	prev.forEach((p, i) => {
		if (!pairedPrev.has(i)) out.push({ before: p, after: null });
	});
	return out;
}

const statusOf = (before: unknown, after: unknown, same: boolean): ItemStatus => (!before ? 'added' : !after ? 'removed' : same ? 'same' : 'changed');

/**
 * Everything that differs between two snapshots (older first). Steps come with their text as line runs;
 * spec blocks and parts lines with the fields that changed (all fields for added or removed ones).
 */
export function diffRevisions(prev: BuildSnapshot, next: BuildSnapshot): RevisionDiff {
	const fields = BUILD_FIELD_NAMES.filter(([k]) => stableJson(prev.build[k]) !== stableJson(next.build[k])).map(([k, name]) => ({
		name,
		before: show(prev.build[k]),
		after: show(next.build[k])
	}));

	const steps: StepDiff[] = pairUp(prev.steps, next.steps, stepContent, (s) => s.title).map(({ before, after }) => {
		const a = before ?? null;
		const b = after ?? null;
		const photosBefore = new Set(a?.photoIds ?? []);
		const photosAfter = new Set(b?.photoIds ?? []);
		const photos = {
			added: [...photosAfter].filter((p) => !photosBefore.has(p)).length,
			removed: [...photosBefore].filter((p) => !photosAfter.has(p)).length
		};
		const same = !!a && !!b && stepContent(a) === stepContent(b) && photos.added + photos.removed === 0;
		return {
			status: statusOf(a, b, same),
			title: (b ?? a)!.title,
			titleBefore: a && b && a.title !== b.title ? a.title : null,
			text: textRuns(a?.bodyMd ?? '', b?.bodyMd ?? ''),
			photos
		};
	});

	const specBlocks: ListItemDiff[] = pairUp(prev.specBlocks, next.specBlocks, specContent, (b) => `${b.kind}:${b.title}`).map(({ before, after }) => {
		const changes = recordChanges((before?.data ?? {}) as Record<string, unknown>, (after?.data ?? {}) as Record<string, unknown>);
		if (before && after && before.title !== after.title) changes.unshift({ name: 'title', before: before.title, after: after.title });
		const item = (after ?? before)!;
		return { status: statusOf(before, after, changes.length === 0), label: `${item.kind}${item.title ? `: ${item.title}` : ''}`, fields: changes };
	});

	const parts: ListItemDiff[] = pairUp(prev.parts, next.parts, partContent, partMatchKey).map(({ before, after }) => {
		// Compared as shown: an empty text and no value are the same to a reader, an absent flag and "no" too.
		const changes = PART_DIFF_FIELDS.map((f) => ({ name: f[1], before: shownPartField(before, f), after: shownPartField(after, f) })).filter(
			(c) => c.before !== c.after
		);
		return { status: statusOf(before, after, changes.length === 0), label: partLabel((after ?? before)!), fields: changes };
	});

	const files = attachmentChanges(prev, next);
	const attachments: AttachmentDiff[] = [
		...files.added.map((a) => ({ status: 'added' as const, name: a.name, kind: a.kind })),
		...files.removed.map((a) => ({ status: 'removed' as const, name: a.name, kind: a.kind }))
	];

	const empty =
		fields.length === 0 &&
		attachments.length === 0 &&
		[...steps, ...specBlocks, ...parts].every((x) => x.status === 'same') &&
		!steps.some((s) => s.photos.added || s.photos.removed);
	return { fields, steps, specBlocks, parts, attachments, empty };
}
