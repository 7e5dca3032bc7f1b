// Our words on screen (PRODUCT.md §3; DEVELOPERS.md "Words on screen and in code"): code and API keep the older
// names (`flag`, `verdict`, `rework`, `derive`), but what a member reads says hazard tag, sign-off / send-back, based on
// / start from. This reads the text of every page and component (text between tags, and the attributes a reader sees:
// title, placeholder, alt, aria-label) and the sentences the server answers with (error(…), fail(…) messages, mail
// paragraphs), and finds none of the older words there.
import { describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';

const root = path.resolve(__dirname, '..', '..');
const OLD_WORDS: { word: RegExp; say: string }[] = [
	{ word: /\bflag(s|ged|ging)?\b/i, say: 'hazard tag' },
	{ word: /\bverdicts?\b/i, say: 'sign-off / send-back' },
	{ word: /\brework\b/i, say: 'send-back / sent back for changes' },
	{ word: /\bderived? from\b|\bderiv(e|es|ing)\b|\bforks?\b|\bforked\b/i, say: 'based on / start from' },
	{ word: /\bbuilt upon\b|\bmost derived\b/i, say: 'started from / based on' }
];

function files(dir: string, ext: RegExp): string[] {
	const out: string[] = [];
	for (const e of fs.readdirSync(path.join(root, dir), { withFileTypes: true })) {
		const rel = path.join(dir, e.name);
		if (e.isDirectory()) out.push(...files(rel, ext));
		else if (ext.test(e.name) && !/\.spec\.ts$/.test(e.name) && !rel.includes(`${path.sep}testing${path.sep}`)) out.push(rel);
	}
	return out;
}

/** The text a reader sees in a .svelte file: text between tags (without {…} expressions) and the visible attributes. */
export function visibleSvelteText(src: string): string[] {
	const markup = src
		.replace(/<script[\s\S]*?<\/script>/g, '')
		.replace(/<style[\s\S]*?<\/style>/g, '')
		.replace(/<!--[\s\S]*?-->/g, '');
	const out: string[] = [];
	for (const m of markup.matchAll(/\b(?:title|placeholder|alt|aria-label)="([^"{]*)"/g)) out.push(m[1]);
	let text = markup;
	// Expressions may hold tags ({#if}…) and strings; drop innermost {…} until none is left.
	for (let i = 0; i < 10 && /\{[^{}]*\}/.test(text); i++) text = text.replace(/\{[^{}]*\}/g, ' ');
	text = text.replace(/<[^>]*>/g, '\n');
	out.push(...text.split('\n').map((s) => s.trim()).filter(Boolean));
	return out;
}

/** Sentence-like string arguments (with a space) of `{@render snippet(…)}` calls: headings and notes passed to a snippet. */
export function renderArguments(src: string): string[] {
	const out: string[] = [];
	for (const call of src.matchAll(/\{@render\s+\w+\(([\s\S]*?)\)\}/g))
		for (const m of call[1].matchAll(/(['"])((?:\\.|(?!\1).)*)\1/g)) if (m[2].includes(' ')) out.push(m[2]);
	return out;
}

/** The sentences a server module answers with: error(…, '…'), fail(…, { message|error: '…' }), and mail paragraphs. */
export function serverSentences(src: string): string[] {
	const code = src.replace(/^\s*(\/\/|\*|\/\*\*).*$/gm, '');
	const out: string[] = [];
	for (const m of code.matchAll(/\berror\(\s*\d{3}\s*,\s*(['`])((?:\\.|(?!\1)[\s\S])*)\1/g)) out.push(m[2]);
	for (const m of code.matchAll(/\b(?:message|error|subject|label):\s*(['`])((?:\\.|(?!\1)[\s\S])*)\1/g)) out.push(m[2]);
	return out.map((s) => s.replace(/\$\{[^}]*\}/g, '…'));
}

/** Every sentence-like string literal (two spaces or more) of a module that writes mail: subjects, paragraphs, links. */
export function mailSentences(src: string): string[] {
	const code = src.replace(/^\s*(\/\/|\*|\/\*\*).*$/gm, '');
	const out: string[] = [];
	for (const m of code.matchAll(/(['`])((?:\\.|(?!\1)[^\n])*)\1/g)) if ((m[2].match(/ /g) ?? []).length >= 2) out.push(m[2]);
	return out.map((s) => s.replace(/\$\{[^}]*\}/g, '…'));
}

/** The modules that compose mail (notifications, the review desk digest, account mail). */
const MAIL_MODULES = ['src/lib/server/notifications.ts', 'src/lib/server/reviews/digest.ts', 'src/lib/server/mail.ts', 'src/lib/server/members/account.ts'];

describe('our words on screen', () => {
	it('finds the checker working: it sees an old word in text and attributes, and not in code', () => {
		const sample = `<script>const flag = 1;</script><p class="x">Your verdict</p><button title="Flag it">{flag.id}</button>`;
		expect(visibleSvelteText(sample)).toEqual(['Flag it', 'Your verdict']);
		expect(serverSentences(`error(409, 'This build was not derived from another.'); const x = flag;`)).toEqual(['This build was not derived from another.']);
		expect(mailSentences("kind: 'flag', paragraphs: [`Hello ${to.name}, the flag is fixed.`]")).toEqual(['Hello …, the flag is fixed.']);
		expect(renderArguments(`{@render section('derived', 'Most built upon', "Builds others forked.", '/builds?sort=x', data.d)}`)).toEqual(['Most built upon', 'Builds others forked.']);
	});

	it('pages and components say hazard tag, sign-off / send-back, based on', () => {
		const found: string[] = [];
		for (const f of [...files('src/routes', /\.svelte$/), ...files('src/lib/components', /\.svelte$/)]) {
			const src = fs.readFileSync(path.join(root, f), 'utf8');
			for (const t of [...visibleSvelteText(src), ...renderArguments(src)])
				for (const o of OLD_WORDS) if (o.word.test(t)) found.push(`${f}: “${t}” (say ${o.say})`);
		}
		expect(found).toEqual([]);
	});

	it('the build list\'s order and filter labels (browse, search, the home page) say them too', async () => {
		const { SORT_LABELS, REVIEW_FILTER_LABELS } = await import('./schemas/list-values');
		const found: string[] = [];
		for (const t of [...Object.values(SORT_LABELS), ...Object.values(REVIEW_FILTER_LABELS)])
			for (const o of OLD_WORDS) if (o.word.test(t)) found.push(`list-values.ts: “${t}” (say ${o.say})`);
		expect(Object.values(SORT_LABELS).length).toBeGreaterThan(3);
		expect(found).toEqual([]);
	});

	it('the sentences the server answers and mails with say them too', () => {
		const found: string[] = [];
		for (const f of [...files('src/lib/server', /\.ts$/), ...files('src/routes', /\.ts$/)]) {
			const src = fs.readFileSync(path.join(root, f), 'utf8');
			for (const t of [...serverSentences(src), ...(MAIL_MODULES.includes(f) ? mailSentences(src) : [])])
				for (const o of OLD_WORDS) if (o.word.test(t)) found.push(`${f}: “${t}” (say ${o.say})`);
		}
		expect(MAIL_MODULES.every((m) => fs.existsSync(path.join(root, m)))).toBe(true);
		expect(found).toEqual([]);
	});
});
