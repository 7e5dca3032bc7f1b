/**
 * Spec-block forms: each kind's fields as flat text inputs (so the forms work without JavaScript and values
 * can be typed in the trade's notation: `10000u`, `4k7`, `22k`), the zod schemas superforms validates the
 * text with, and the conversion text ⇄ block data. The block itself is validated by the kind's schema in
 * $lib/specs on the server; its issues are mapped back to these fields (a point list's issues to its line).
 */
import { z } from 'zod';
import { parseQuantity, parseValue, type ValueKind } from '$lib/engineering';
import { SPEC_KINDS, type SpecKind } from '$lib/specs';
import { SPEC_FORMS, fieldsOf, fieldName, type SpecField } from './spec-fields';

export * from './spec-fields';

/** Form schemas (one per kind, built once): every field is text; the block's own schema checks the values. */
export const specFormSchemas = Object.fromEntries(
	SPEC_KINDS.map((kind) => [
		kind,
		z.object({
			id: z.string().max(40).default(''),
			kind: z.literal(kind).default(kind),
			title: z.string().max(120, 'must be at most 120 characters').default(''),
			...Object.fromEntries(
				fieldsOf(kind).map((f) => [fieldName(f.path), z.string().max(f.type.t === 'rows' ? 200_000 : 200, 'is too long').default(f.initial ?? '')])
			)
		})
	])
) as unknown as Record<SpecKind, z.ZodObject<Record<string, z.ZodDefault<z.ZodString> | z.ZodLiteral<string>>>>;

/** A form issue: the input name and a message. */
export interface FormIssue {
	field: string;
	message: string;
}

/**
 * Read a plain number as typed: "35", "-12.5", "0,47", "1e3", "20k" (SI prefix where the unit takes one), with an
 * optional unit after it ("35 V", "1.5A", "0.01 %") — the engineering library's parseQuantity, as the bench tools.
 * readNumber('20k', 'Hz') → 20000. Null when unreadable.
 */
export function readNumber(text: string, unit = ''): number | null {
	const s = text.trim().replace(/\s*%$/, '');
	try {
		return parseQuantity(s, unit === '%' ? '' : unit);
	} catch {
		return null;
	}
}

const isOn = (s: string) => /^(on|true|yes|1)$/i.test(s.trim());
/** The sign an "each side ±" field may start with: ±, +-, +/- . */
const EACH_SIDE = /^\s*(?:±|\+\s*\/?\s*-)\s*/;

/** The number an "each side ±" text reads as, or null: eachSideValue('±30') → 30, eachSideValue('+-30 V') → 30. */
export function eachSideValue(text: string, unit = 'V'): number | null {
	const pm = EACH_SIDE.exec(text);
	const v = readNumber(pm ? text.slice(pm[0].length) : text, unit);
	return v !== null && (!pm || v >= 0) ? v : null;
}

/** Set a dot path in a plain object. */
function setPath(obj: Record<string, unknown>, path: string, value: unknown): void {
	const keys = path.split('.');
	let cur = obj;
	for (const k of keys.slice(0, -1)) {
		if (cur[k] === null || typeof cur[k] !== 'object') cur[k] = {};
		cur = cur[k] as Record<string, unknown>;
	}
	cur[keys[keys.length - 1]] = value;
}

/** Parsed rows of a points/rails textarea with the textarea line each came from. */
export interface RowsRead {
	rows: (string | number)[][];
	lines: number[];
	issues: FormIssue[];
}

/**
 * Read a textarea (or CSV) of rows: comma, semicolon or tab separated; blank lines skipped; a first line
 * without any number is taken as a header. Columns labelled "label" stay text (may be empty); the others
 * are numbers (SI prefixes allowed: 1k, 20k). Issues name the line: "line 3: "x" is not a number".
 * readRows('frequency,dB\n20,-0.5\n1k,0', ['frequency (Hz)', 'level (dB)'], 'points.response').rows → [[20,-0.5],[1000,0]].
 */
export function readRows(text: string, columns: readonly string[], field: string): RowsRead {
	const out: RowsRead = { rows: [], lines: [], issues: [] };
	const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\r|\n/);
	const numericCols = columns.map((c) => c !== 'label');
	let first = true;
	lines.forEach((raw, i) => {
		const lineNo = i + 1;
		const line = raw.trim();
		if (line === '' || line.startsWith('#')) return;
		const cells = line.split(/\s*[,;\t]\s*/);
		if (first) {
			first = false;
			if (cells.every((c) => readNumber(c) === null)) return; // header
		}
		if (out.rows.length >= 2000) {
			if (out.rows.length === 2000) out.issues.push({ field, message: `line ${lineNo}: at most 2000 rows` });
			return;
		}
		if (cells.length !== columns.length) {
			out.issues.push({ field, message: `line ${lineNo}: expected ${columns.length} values (${columns.join(', ')}), found ${cells.length}` });
			return;
		}
		const row: (string | number)[] = [];
		for (const [j, c] of cells.entries()) {
			if (!numericCols[j]) {
				row.push(c);
				continue;
			}
			const v = readNumber(c);
			if (v === null) {
				out.issues.push({ field, message: `line ${lineNo}: "${c}" is not a number (${columns[j]})` });
				return;
			}
			row.push(v);
		}
		out.rows.push(row);
		out.lines.push(lineNo);
	});
	return out;
}

/** Which list a measurements CSV holds, from its header: frequency,dB → response; power,THD → thd; else null. */
export function pointsShape(text: string): 'response' | 'thd' | null {
	const first = text.replace(/^\uFEFF/, '').split(/\r\n|\r|\n/).find((l) => l.trim() !== '');
	if (!first) return null;
	const h = first.toLowerCase().split(/\s*[,;\t]\s*/);
	if (h.length !== 2) return null;
	if (/freq|hz/.test(h[0]) && /db|level|gain/.test(h[1])) return 'response';
	if (/pow|^w$|watt|\(w\)/.test(h[0]) && /thd|dist|%/.test(h[1])) return 'thd';
	return null;
}

/** Where the list rows of a form came from, to put an issue on "line n" of the right textarea. */
export type LineMaps = Record<string, number[]>;

/**
 * Turn a form's text values into block data for `kind`. Text that is not even a number gives a form issue
 * here; ranges and required fields are the block schema's job. → { data, issues, lineMaps }.
 */
export function formToSpecData(kind: SpecKind, values: Record<string, unknown>): { data: Record<string, unknown>; issues: FormIssue[]; lineMaps: LineMaps } {
	const data: Record<string, unknown> = {};
	const issues: FormIssue[] = [];
	const lineMaps: LineMaps = {};
	const text = (f: SpecField) => {
		const v = values[fieldName(f.path)];
		return typeof v === 'string' ? v : '';
	};
	for (const section of SPEC_FORMS[kind]) {
		const fields = section.fields;
		if (section.group && fields.every((f) => text(f).trim() === '')) {
			// An optional group left blank: absent (the fuse group: no fuse).
			setPath(data, section.group, null);
			continue;
		}
		for (const f of fields) {
			const name = fieldName(f.path);
			const s = text(f).trim();
			const ty = f.type;
			if (ty.t === 'bool') {
				setPath(data, f.path, isOn(s));
				continue;
			}
			if (f.path === 'bleeder') {
				setPath(data, 'bleeder', s === 'fitted' ? true : null);
				continue;
			}
			if (f.path === 'bleeder.ohm') {
				if (s === '') continue;
				try {
					const v = parseValue(s, 'resistance').value;
					data.bleeder = { ohm: v };
				} catch (e) {
					issues.push({ field: name, message: (e as Error).message });
				}
				continue;
			}
			if (s === '') {
				if (!f.optional) setPath(data, f.path, undefined);
				continue;
			}
			switch (ty.t) {
				case 'number': {
					// "Each side ±" fields take ±30, +-30, +/-30 or 30; the text is kept to show back as typed.
					const v = ty.eachSide ? eachSideValue(s, ty.unit) : readNumber(s, ty.unit);
					if (v === null) issues.push({ field: name, message: `"${s}" is not a number${ty.unit ? ` (${ty.unit})` : ''}${ty.eachSide ? '; write ±30, +-30 or 30' : ''}` });
					else {
						setPath(data, f.path, v);
						if (ty.eachSide) setPath(data, `${f.path.replace(/V$/, '')}Text`, s);
					}
					break;
				}
				case 'value': {
					try {
						// A bare number is read in the field's own unit (Ω, F).
						setPath(data, f.path, parseValue(s, ty.kind).value);
					} catch (e) {
						issues.push({ field: name, message: (e as Error).message });
					}
					break;
				}
				case 'select':
					setPath(data, f.path, s);
					break;
				case 'list': {
					const parts = s.split(/\s*[,;]\s*|\s+/).filter(Boolean);
					const nums = parts.map((p) => readNumber(p, ty.unit));
					const bad = parts.findIndex((_, i) => nums[i] === null);
					if (bad >= 0) issues.push({ field: name, message: `value ${bad + 1} ("${parts[bad]}") is not a number` });
					else setPath(data, f.path, nums);
					break;
				}
				case 'rows': {
					const read = readRows(s, ty.columns, name);
					issues.push(...read.issues);
					lineMaps[f.path] = read.lines;
					const keys =
						f.path === 'points.response'
							? ['freqHz', 'db']
							: f.path === 'points.thd'
								? ['powerW', 'thdPct']
								: f.path === 'rails'
									? ['label', 'expectedV', 'measuredV']
									: ['label', 'expectedMa', 'measuredMa'];
					setPath(
						data,
						f.path,
						read.rows.map((r) =>
							Object.fromEntries(
								keys.map((k, i) => [k, k === 'label' ? (String(r[i]).trim() === '' ? undefined : r[i]) : r[i]]).filter(([, v]) => v !== undefined)
							)
						)
					);
					break;
				}
			}
		}
	}
	if (kind === 'supply' && data.fuse && typeof data.fuse === 'object' && (data.fuse as Record<string, unknown>).type === '')
		(data.fuse as Record<string, unknown>).type = undefined;
	return { data, issues, lineMaps };
}

const rowKeys: Record<string, string[]> = {
	'points.response': ['freqHz', 'db'],
	'points.thd': ['powerW', 'thdPct'],
	rails: ['label', 'expectedV', 'measuredV'],
	idleCurrent: ['label', 'expectedMa', 'measuredMa']
};
const rowHeaders: Record<string, string> = {
	'points.response': 'frequency,dB',
	'points.thd': 'power,THD',
	rails: '',
	idleCurrent: ''
};

function getPath(obj: unknown, path: string): unknown {
	return path.split('.').reduce<unknown>((cur, k) => (cur && typeof cur === 'object' ? (cur as Record<string, unknown>)[k] : undefined), obj);
}

/** Show a stored SI value in the trade's notation for a value field: 4700 Ω → "4k7", 1e-2 F → "10000u". */
export function valueToText(value: number, kind: ValueKind): string {
	const units: [number, string][] =
		kind === 'resistance'
			? [[1e6, 'M'], [1e3, 'k'], [1, 'R']]
			: kind === 'capacitance'
				? [[1e-6, 'u'], [1e-9, 'n'], [1e-12, 'p']]
				: [[1e-3, 'm'], [1e-6, 'u'], [1e-9, 'n']];
	for (const [scale, letter] of units) {
		if (Math.abs(value) >= scale || scale === units[units.length - 1][0]) {
			const m = Number((value / scale).toPrecision(6));
			return `${m}${letter}`;
		}
	}
	return String(value);
}

/** A stored block's data as form text, the inverse of formToSpecData (for editing). */
export function specDataToForm(kind: SpecKind, data: Record<string, unknown>): Record<string, string> {
	const out: Record<string, string> = {};
	for (const f of fieldsOf(kind)) {
		const name = fieldName(f.path);
		if (f.path === 'bleeder') {
			out[name] = data.bleeder ? 'fitted' : 'none';
			continue;
		}
		const v = getPath(data, f.path);
		const ty = f.type;
		const typed = ty.t === 'number' && ty.eachSide ? getPath(data, `${f.path.replace(/V$/, '')}Text`) : undefined;
		if (typeof typed === 'string' && typeof v === 'number' && eachSideValue(typed, ty.t === 'number' ? ty.unit : 'V') === v) out[name] = typed;
		else if (ty.t === 'bool') out[name] = v === true ? 'on' : '';
		else if (v === undefined || v === null) out[name] = '';
		else if (ty.t === 'value' && typeof v === 'number') out[name] = valueToText(v, ty.kind);
		else if (ty.t === 'list' && Array.isArray(v)) out[name] = v.join(', ');
		else if (ty.t === 'rows' && Array.isArray(v)) {
			const keys = rowKeys[f.path];
			const head = rowHeaders[f.path];
			out[name] = [head, ...v.map((r) => keys.map((k) => (r as Record<string, unknown>)[k] ?? '').join(','))].filter(Boolean).join('\n');
		} else out[name] = String(v);
	}
	return out;
}

/**
 * Put the block schema's issues on the form's inputs: the longest field path that starts the issue path
 * takes it; an issue inside a list names its line ("line 3: must be at most 200 dB"). Issues that match
 * no field go to '' (the form message).
 */
export function mapSpecIssues(kind: SpecKind, issues: readonly { path: string; message: string }[], lineMaps: LineMaps = {}): FormIssue[] {
	const paths = fieldsOf(kind)
		.map((f) => f.path)
		.sort((a, b) => b.length - a.length);
	const label = (p: string) => fieldsOf(kind).find((f) => f.path === p)?.type;
	return issues.map((i) => {
		const p = paths.find((fp) => i.path === fp || i.path.startsWith(`${fp}.`));
		if (!p) {
			// A group-level issue ("claimed" missing a field) goes to the group's first field.
			const groupField = fieldsOf(kind).find((f) => f.path.startsWith(`${i.path}.`));
			if (groupField && i.path) return { field: fieldName(groupField.path), message: i.message };
			return { field: '', message: i.path ? `${i.path}: ${i.message}` : i.message };
		}
		const rest = i.path.slice(p.length + 1).split('.').filter(Boolean);
		const ty = label(p);
		if (rest.length && /^\d+$/.test(rest[0])) {
			const idx = Number(rest[0]);
			if (ty?.t === 'rows') {
				const line = lineMaps[p]?.[idx] ?? idx + 1;
				const col = rest[1] ? ty.columns[rowKeys[p]?.indexOf(rest[1]) ?? -1] ?? rest[1] : 'row';
				return { field: fieldName(p), message: `line ${line}: ${col} ${i.message}` };
			}
			return { field: fieldName(p), message: `value ${idx + 1}: ${i.message}` };
		}
		return { field: fieldName(p), message: i.message };
	});
}
