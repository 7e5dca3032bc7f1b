import { fail } from '@sveltejs/kit';
import { requireEditableBuild } from '$lib/server/builds';
import { attempt } from '$lib/server/http';
import { CSV_MAX_BYTES, buildChannels, buildRailV, editorRowsOf, importPartsCsv, listPartLines, previewPartsCsv, readPartsCsv, savePartsList } from '$lib/server/parts';
import { DRAFT_FIELDS, PARTS_LIMITS, emptyDraft, type PartLineDraft } from '$lib/parts';
import { isUuid } from '$lib/uuid';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const { build } = await requireEditableBuild(params.slug, { forView: true });
	const lines = await listPartLines(build.id);
	return {
		build: { id: build.id, slug: build.slug, title: build.title, status: build.status, mainsPowered: build.mainsPowered },
		lines,
		...editorRowsOf(lines),
		railV: await buildRailV(build.id),
		channels: await buildChannels(build.id)
	};
};

/** Fields added to the editor with the costed parts list (issue 13). */
const LATER_FIELDS = ['mpn', 'supplier', 'unitPrice', 'currency', 'perChannel'] as const;

/**
 * The editor's rows from a posted form: one value per row for each field, in DOM order, with the id each
 * row was loaded with (`lineId`, empty for a new row; forms from before ids were posted send none).
 */
function postedRows(data: FormData): { rows: PartLineDraft[]; ids: string[] } | null {
	const cols = Object.fromEntries(DRAFT_FIELDS.map((f) => [f, data.getAll(f).map((v) => (typeof v === 'string' ? v : ''))]));
	const count = cols.kind.length;
	if (count > PARTS_LIMITS.lines) return null;
	// The costed-list columns are optional: a form from before them (or a script) may leave them out entirely.
	for (const f of LATER_FIELDS) if (cols[f].length === 0) cols[f] = Array(count).fill('');
	if (DRAFT_FIELDS.some((f) => cols[f].length !== count)) return null;
	const postedIds = data.getAll('lineId').map((v) => (isUuid(v) ? v : ''));
	if (postedIds.length !== 0 && postedIds.length !== count) return null;
	return {
		rows: Array.from({ length: count }, (_, i) => Object.fromEntries(DRAFT_FIELDS.map((f) => [f, cols[f][i]])) as unknown as PartLineDraft),
		ids: Array.from({ length: count }, (_, i) => postedIds[i] ?? '')
	};
}

/** The list version the editor loaded (partsListVersion), or null when the form did not send one. */
function postedVersion(data: FormData): string | null {
	const v = data.get('version');
	return typeof v === 'string' && /^[0-9a-f]{16}$/.test(v) ? v : null;
}

/** CSV text from an uploaded file (wins) or the textarea. */
async function postedCsv(data: FormData): Promise<{ text: string } | { error: string }> {
	const file = data.get('csvFile');
	if (file instanceof File && file.size > 0) {
		if (file.size > CSV_MAX_BYTES) return { error: `The file is larger than ${CSV_MAX_BYTES / 1_000_000} MB.` };
		const bytes = new Uint8Array(await file.arrayBuffer());
		if (bytes.includes(0)) return { error: 'That file is not text: choose a .csv file saved from a spreadsheet or text editor.' };
		const text = new TextDecoder('utf-8', { fatal: false }).decode(bytes);
		return { text };
	}
	const text = data.get('csvText');
	if (typeof text !== 'string' || text.trim() === '') return { error: 'Choose a CSV file or paste the CSV text.' };
	if (text.length > CSV_MAX_BYTES) return { error: `The CSV is larger than ${CSV_MAX_BYTES / 1_000_000} MB.` };
	return { text };
}

const modeOf = (data: FormData) => (data.get('mode') === 'append' ? 'append' : 'replace');

export const actions: Actions = {
	/** Replace the whole list with the editor's rows (all valid, or nothing is saved). */
	save: async ({ request, params }) => {
		const { actor, build } = await requireEditableBuild(params.slug);
		const data = await request.formData();
		const posted = postedRows(data);
		if (!posted) return fail(400, { error: `The form did not come through whole (at most ${PARTS_LIMITS.lines} lines).` });
		const { rows, ids } = posted;
		const version = postedVersion(data);
		const r = await attempt(() => savePartsList(actor, build.id, rows, { ids, expectedVersion: version }));
		if (!r.ok) return r.failure;
		const saved = r.value;
		if (!saved.ok && saved.conflict) {
			// Keep the maker's rows in the editor; show the stored list beside them. Saving again (with the
			// stored version) replaces it on purpose.
			return fail(409, { rows, ids, version: saved.conflict.version, conflict: saved.conflict, unsaved: true });
		}
		if (!saved.ok) return fail(422, { rows, ids, version, errors: saved.errors });
		return { ...editorRowsOf(await listPartLines(build.id)), saved: saved.count, revision: saved.revision };
	},

	/** Row operations for browsers without JavaScript: add, remove, move. Nothing is saved. */
	rows: async ({ request, params }) => {
		await requireEditableBuild(params.slug);
		const data = await request.formData();
		const { rows, ids } = postedRows(data) ?? { rows: [], ids: [] };
		const [op, at, ...rest] = String(data.get('op') ?? '').split(':');
		const i = Number(at);
		const swap = (a: number, b: number) => {
			[rows[a], rows[b]] = [rows[b], rows[a]];
			[ids[a], ids[b]] = [ids[b], ids[a]];
		};
		if (op === 'add') {
			rows.push(emptyDraft());
			ids.push('');
		} else if (Number.isInteger(i) && i >= 0 && i < rows.length) {
			if (op === 'remove') {
				rows.splice(i, 1);
				ids.splice(i, 1);
			}
			if (op === 'up' && i > 0) swap(i - 1, i);
			// One of the two rewrites offered for a bare "+" between capacitors ("2×1u series", "1u||1u").
			if (op === 'choose') rows[i].value = rest.join(':').slice(0, PARTS_LIMITS.value);
			if (op === 'down' && i < rows.length - 1) swap(i, i + 1);
		}
		return { rows, ids, version: postedVersion(data), unsaved: true };
	},

	/** Read a CSV and show what it would become, with every line's errors. Saves nothing. */
	preview: async ({ request, params }) => {
		const { build } = await requireEditableBuild(params.slug);
		const data = await request.formData();
		const csv = await postedCsv(data);
		if ('error' in csv) return fail(400, { csvError: csv.error, mode: modeOf(data) });
		const preview = previewPartsCsv(csv.text, await buildRailV(build.id));
		return { preview, csvText: csv.text, mode: modeOf(data) };
	},

	/** Save a previewed CSV: validated again on the server; nothing is stored unless every line is valid. */
	import: async ({ request, params }) => {
		const { actor, build } = await requireEditableBuild(params.slug);
		const data = await request.formData();
		const csv = await postedCsv(data);
		if ('error' in csv) return fail(400, { csvError: csv.error, mode: modeOf(data) });
		const r = await attempt(() => importPartsCsv(actor, build.id, csv.text, modeOf(data)));
		if (!r.ok) return r.failure;
		const imported = r.value;
		if (!imported.ok) return fail(422, { preview: imported.preview, csvText: csv.text, mode: modeOf(data) });
		// The editor takes the saved list (rows, ids and version), so it shows every imported line.
		return { ...editorRowsOf(await listPartLines(build.id)), imported: imported.count, total: imported.total, revision: imported.revision };
	},

	/** Put a CSV's lines into the table editor to fix them there (not saved until "Save parts list"). */
	toEditor: async ({ request, params }) => {
		const { build } = await requireEditableBuild(params.slug);
		const data = await request.formData();
		const csv = await postedCsv(data);
		if ('error' in csv) return fail(400, { csvError: csv.error, mode: modeOf(data) });
		const read = readPartsCsv(csv.text);
		const stored = editorRowsOf(await listPartLines(build.id));
		const append = modeOf(data) === 'append';
		const rows = [...(append ? stored.rows : []), ...read.rows.map((r) => r.draft)].slice(0, PARTS_LIMITS.lines);
		const ids = [...(append ? stored.ids : []), ...read.rows.map(() => '')].slice(0, PARTS_LIMITS.lines);
		return { rows, ids, version: stored.version, unsaved: true, fromCsv: true };
	}
};
