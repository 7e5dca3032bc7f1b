import { fail } from '@sveltejs/kit';
import { requireEditableBuild } from '$lib/server/builds';
import { attempt } from '$lib/server/http';
import { CSV_MAX_BYTES, buildRailV, importPartsCsv, listPartLines, previewPartsCsv, readPartsCsv, savePartsList } from '$lib/server/parts';
import { DRAFT_FIELDS, PARTS_LIMITS, emptyDraft, lineToDraft, type PartLineDraft } from '$lib/parts';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const { build } = await requireEditableBuild(params.slug, { forView: true });
	const lines = await listPartLines(build.id);
	return {
		build: { id: build.id, slug: build.slug, title: build.title, status: build.status, mainsPowered: build.mainsPowered },
		lines,
		rows: lines.map(lineToDraft),
		railV: await buildRailV(build.id)
	};
};

/** The editor's rows from a posted form: one value per row for each field, in DOM order. */
function postedRows(data: FormData): PartLineDraft[] | null {
	const cols = Object.fromEntries(DRAFT_FIELDS.map((f) => [f, data.getAll(f).map((v) => (typeof v === 'string' ? v : ''))]));
	const count = cols.kind.length;
	if (count > PARTS_LIMITS.lines) return null;
	if (DRAFT_FIELDS.some((f) => cols[f].length !== count)) return null;
	return Array.from({ length: count }, (_, i) => Object.fromEntries(DRAFT_FIELDS.map((f) => [f, cols[f][i]])) as unknown as PartLineDraft);
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
		const rows = postedRows(await request.formData());
		if (!rows) return fail(400, { error: `The form did not come through whole (at most ${PARTS_LIMITS.lines} lines).` });
		const r = await attempt(() => savePartsList(actor, build.id, rows));
		if (!r.ok) return r.failure;
		const saved = r.value;
		if (!saved.ok) return fail(422, { rows, errors: saved.errors });
		const fresh = (await listPartLines(build.id)).map(lineToDraft);
		return { rows: fresh, saved: saved.count, revision: saved.revision };
	},

	/** Row operations for browsers without JavaScript: add, remove, move. Nothing is saved. */
	rows: async ({ request, params }) => {
		await requireEditableBuild(params.slug);
		const data = await request.formData();
		const rows = postedRows(data) ?? [];
		const [op, at] = String(data.get('op') ?? '').split(':');
		const i = Number(at);
		if (op === 'add') rows.push(emptyDraft());
		else if (Number.isInteger(i) && i >= 0 && i < rows.length) {
			if (op === 'remove') rows.splice(i, 1);
			if (op === 'up' && i > 0) [rows[i - 1], rows[i]] = [rows[i], rows[i - 1]];
			if (op === 'down' && i < rows.length - 1) [rows[i + 1], rows[i]] = [rows[i], rows[i + 1]];
		}
		return { rows, unsaved: true };
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
		const fresh = (await listPartLines(build.id)).map(lineToDraft);
		return { rows: fresh, imported: imported.count, revision: imported.revision };
	},

	/** Put a CSV's lines into the table editor to fix them there (not saved until "Save parts list"). */
	toEditor: async ({ request, params }) => {
		const { build } = await requireEditableBuild(params.slug);
		const data = await request.formData();
		const csv = await postedCsv(data);
		if ('error' in csv) return fail(400, { csvError: csv.error, mode: modeOf(data) });
		const read = readPartsCsv(csv.text);
		const existing = modeOf(data) === 'append' ? (await listPartLines(build.id)).map(lineToDraft) : [];
		const rows = [...existing, ...read.rows.map((r) => r.draft)].slice(0, PARTS_LIMITS.lines);
		return { rows, unsaved: true, fromCsv: true };
	}
};
