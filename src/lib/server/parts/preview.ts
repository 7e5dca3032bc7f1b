/** Import preview: what a CSV would become, line by line, without saving anything. Pure. */
import { normaliseLines, type LineError, type NormalisedPartLine, type PartLineDraft } from '$lib/parts';
import { readPartsCsv, type CsvRead } from './csv';

/** One row of an import preview: the line as read, what it normalises to, and its errors. */
export interface PreviewRow {
	line: number;
	draft: PartLineDraft;
	normalised: NormalisedPartLine | null;
	errors: LineError[];
	kindFromDesignators: boolean;
}

/** An import preview: every row with its errors, file-level errors, warnings; `ok` when it could be saved as is. */
export interface ImportPreview {
	ok: boolean;
	rows: PreviewRow[];
	fileErrors: { line: number; message: string }[];
	warnings: string[];
	mapping: CsvRead['mapping'];
}

/**
 * Read a CSV and validate every line against the build's rail, without saving anything.
 * previewPartsCsv('kind,value\nresistor,4k7\ncapacitor,banana\n', null) → ok false, rows[1].errors[0].line 3.
 */
export function previewPartsCsv(text: string, railV: number | null): ImportPreview {
	const read = readPartsCsv(text);
	const checked = normaliseLines(
		read.rows.map((r) => r.draft),
		{ railV },
		read.rows.map((r) => r.line)
	);
	const rows: PreviewRow[] = read.rows.map((r, i) => ({
		line: r.line,
		draft: r.draft,
		normalised: checked.ok ? checked.lines[i] : checked.lines[i] ?? null,
		errors: checked.ok ? [] : checked.errors.filter((e) => e.line === r.line),
		kindFromDesignators: !!r.kindFromDesignators
	}));
	const listErrors = checked.ok ? [] : checked.errors.filter((e) => e.line === 0).map((e) => ({ line: 0, message: e.message }));
	const fileErrors = [...read.errors, ...listErrors];
	return { ok: fileErrors.length === 0 && checked.ok && rows.length > 0, rows, fileErrors, warnings: read.warnings, mapping: read.mapping };
}

