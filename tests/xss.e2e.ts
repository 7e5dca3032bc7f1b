// The XSS corpus (tests/fixtures/xss-vectors.json, written for this project) through every text a member
// can write — build title and summary, steps, comments, hazard tag notes, a review summary, reports,
// profile name and bio, photo alt text, spec block titles, parts notes and substitution reasons, the
// search box — rendered in Chromium with the page's Content-Security-Policy switched OFF (bypassCSP), so
// the proof is the escaping and sanitizing itself, not the policy behind it. A global hook replaces
// alert/confirm/prompt in every frame and counts calls; payloads that call nothing set window.__xss;
// dialogs are watched too. After each render the document is also searched for active content that did
// not fire (event-handler attributes, javascript:/data: URLs, foreign scripts, frames, images from other
// hosts). Also: the Atom feeds (parsed: text only), the JSON API (values come back as data, as JSON) and
// the mails the fake SMTP server stored (their HTML rendered in Chromium). Expected: 0 executions.
import { test, expect, type Browser, type BrowserContext, type Page, type APIRequestContext } from '@playwright/test';
import sharp from 'sharp';
import fs from 'node:fs';
import path from 'node:path';
import { origin, PART_ROW, SUPPLY_FORM } from './helpers/builds';
import { DEMO_PASSWORD } from './helpers/auth';
import { postPage, throwawayMember } from './helpers/members';

const corpus = JSON.parse(fs.readFileSync(path.resolve('tests/fixtures/xss-vectors.json'), 'utf8')) as { families: Record<string, string[]> };
const VECTORS: string[] = Object.values(corpus.families).flat();
const viewer = () => process.env.MAIL_VIEWER_URL ?? 'http://127.0.0.1:2590';
const jsonHeaders = () => ({ origin: origin(), accept: 'application/json' });

test.describe.configure({ mode: 'serial' });

/** Vectors joined (by `sep`) into as few texts of at most `max` characters as fit; longer vectors alone, cut to `max`. */
function pack(max: number, sep = '\n\n', vectors = VECTORS): string[] {
	const out: string[] = [];
	let cur = '';
	for (const v0 of vectors) {
		const v = v0.slice(0, max);
		if (cur && cur.length + sep.length + v.length > max) {
			out.push(cur);
			cur = '';
		}
		cur = cur ? `${cur}${sep}${v}` : v;
	}
	if (cur) out.push(cur);
	return out;
}

// ---- the hook and the inspection ------------------------------------------------------------------------

const HOOK = () => {
	const w = window as unknown as Record<string, unknown>;
	const hit = (what: string) =>
		function () {
			try {
				const top = window.top as unknown as Record<string, unknown>;
				top.__xssHits = ((top.__xssHits as string[] | undefined) ?? []).concat(what);
			} catch {
				w.__xssHits = ((w.__xssHits as string[] | undefined) ?? []).concat(what);
			}
			return null;
		};
	w.alert = hit('alert');
	w.confirm = hit('confirm');
	w.prompt = hit('prompt');
	w.print = hit('print');
};

/** Everything in the document that could run code or leak a reader's address, as short descriptions. */
const ACTIVE_CONTENT = (root: string | undefined) => {
	const bad: string[] = [];
	const doc = root !== undefined ? new DOMParser().parseFromString(root, 'text/html') : document;
	const here = location.origin;
	const urlAttrs = ['href', 'src', 'action', 'formaction', 'xlink:href', 'data', 'poster', 'background', 'srcset', 'to', 'values', 'from', 'by'];
	for (const el of Array.from(doc.querySelectorAll('*'))) {
		for (const a of Array.from(el.attributes)) {
			const n = a.name.toLowerCase();
			if (n.startsWith('on')) bad.push(`<${el.localName} ${n}>`);
			if (n === 'srcdoc') bad.push(`<${el.localName} srcdoc>`);
			if (urlAttrs.includes(n)) {
				// eslint-disable-next-line no-control-regex
				const v = a.value.replace(/[\u0000-\u0020]/g, '').toLowerCase();
				if (/^(javascript|vbscript|livescript):/.test(v) || /^data:(?!image\/(png|jpeg|gif|webp);)/.test(v)) bad.push(`<${el.localName} ${n}=${a.value.slice(0, 60)}>`);
			}
			if (n === 'http-equiv') bad.push(`<meta http-equiv>`);
		}
		const tag = el.localName;
		if (['iframe', 'frame', 'object', 'embed', 'base', 'applet', 'portal'].includes(tag)) bad.push(`<${tag}>`);
		if (tag === 'img' || tag === 'image') {
			const src = el.getAttribute('src') ?? el.getAttribute('href') ?? '';
			if (src && !src.startsWith('data:image/')) {
				try {
					if (new URL(src, here).origin !== here) bad.push(`<${tag} src=${src.slice(0, 60)}> from another host`);
				} catch {
					/* unparsable: loads nothing */
				}
			}
		}
		if (tag === 'script') {
			const s = el as HTMLScriptElement;
			const src = s.getAttribute('src');
			const ours = src ? new URL(src, here).origin === here && new URL(src, here).pathname.startsWith('/_app/') : (s.textContent ?? '').includes('__sveltekit');
			if (root !== undefined || !ours) bad.push(`<script ${src ?? (s.textContent ?? '').slice(0, 40)}>`);
		}
	}
	return bad;
};

interface Render {
	url: string;
	executions: string[];
	active: string[];
}

/** Load `url` in `page` (hook installed), let handlers and media errors fire, and inspect. */
async function render(page: Page, url: string): Promise<Render> {
	await page.goto(url, { waitUntil: 'load' });
	await page.waitForTimeout(50);
	const moved = new URL(page.url()).pathname !== new URL(url, origin()).pathname ? [`navigated to ${page.url()}`] : [];
	const { hits, flag } = await page.evaluate(() => ({
		hits: ((window as unknown as { __xssHits?: string[] }).__xssHits ?? []).slice(),
		flag: !!(window as unknown as { __xss?: unknown }).__xss
	}));
	const active = await page.evaluate(ACTIVE_CONTENT, undefined);
	return { url, executions: [...hits, ...(flag ? ['window.__xss'] : []), ...moved], active };
}

/** A browser context with the hook in every frame, the CSP switched off, and dialogs counted as executions. */
async function hookedContext(browser: Browser): Promise<{ context: BrowserContext; dialogs: string[] }> {
	const context = await browser.newContext({ baseURL: origin(), bypassCSP: true });
	await context.addInitScript(HOOK);
	const dialogs: string[] = [];
	context.on('page', (p) => p.on('dialog', (d) => (dialogs.push(`${d.type()}: ${d.message()}`), d.dismiss().catch(() => undefined))));
	return { context, dialogs };
}

/** Run `fn` over `items`, `n` at a time. */
async function inParallel<T>(items: T[], n: number, fn: (item: T, i: number) => Promise<void>): Promise<void> {
	let next = 0;
	await Promise.all(
		Array.from({ length: Math.min(n, items.length) }, async () => {
			for (let i = next++; i < items.length; i = next++) await fn(items[i], i);
		})
	);
}

/** Render every url with a few tabs at once; → every render. */
async function renderAll(context: BrowserContext, urls: string[], tabs = 4): Promise<Render[]> {
	const queue = [...urls];
	const out: Render[] = [];
	await Promise.all(
		Array.from({ length: Math.min(tabs, urls.length) }, async () => {
			const page = await context.newPage();
			page.on('dialog', (d) => d.dismiss().catch(() => undefined));
			for (let url = queue.shift(); url !== undefined; url = queue.shift()) out.push(await render(page, url));
			await page.close();
		})
	);
	return out;
}

function expectClean(renders: Render[], dialogs: string[], surface: string) {
	const executed = renders.filter((r) => r.executions.length > 0).map((r) => `${r.url}: ${r.executions.join(', ')}`);
	const active = renders.filter((r) => r.active.length > 0).map((r) => `${r.url}: ${[...new Set(r.active)].slice(0, 5).join(' ')}`);
	expect(executed, `${surface}: executions`).toEqual([]);
	expect(dialogs, `${surface}: dialogs`).toEqual([]);
	expect(active, `${surface}: active content left in the page`).toEqual([]);
}

test('the hook and the inspection catch what they look for (a control: the corpus run raw)', async ({ browser }) => {
	// The same corpus written into a page without escaping must be caught, or the 0 below proves nothing.
	const { context, dialogs } = await hookedContext(browser);
	const page = await context.newPage();
	await page.route('**/raw-corpus', (route) =>
		route.fulfill({ contentType: 'text/html', body: `<!doctype html><title>raw</title><body>${VECTORS.map((v) => `<div>${v}</div>`).join('')}</body>` })
	);
	const r = await render(page, '/raw-corpus');
	expect(r.executions.length + dialogs.length, 'executions of the raw corpus').toBeGreaterThan(10);
	expect(r.active.length, 'active content in the raw corpus').toBeGreaterThan(50);
	await context.close();
});

// ---- fixtures: one throwaway maker writes everything; maren reviews; tomas moderates ----------------------

let maker: { handle: string; email: string };
let makerCtx: BrowserContext;
let makerDialogs: string[];
let mreq: APIRequestContext;
let derived = ''; // started from the main build (compare page)
let main = ''; // the build whose steps, comments, photos, spec blocks and parts hold the corpus
const titled: string[] = []; // builds whose titles and summaries hold the corpus
const tally: Record<string, number> = {};

async function newDraft(req: APIRequestContext, title: string, summary: string): Promise<{ status: number; slug?: string; body: string }> {
	const res = await postPage(req, '/builds/new', { title, summary, category: 'power-amp', topology: 'class-ab-chip', licence: 'CC-BY-SA-4.0' });
	const slug = res.status() === 303 ? new URL(res.headers()['location'], origin()).pathname.split('/')[2] : undefined;
	return { status: res.status(), slug, body: res.status() === 303 ? '' : await res.text() };
}

async function publish(req: APIRequestContext, slug: string) {
	const pub = await postPage(req, `/builds/${slug}/edit?/publish`, {});
	expect([200, 303], `publish ${slug}`).toContain(pub.status());
}

test.beforeAll(async ({ browser }) => {
	test.setTimeout(600_000);
	({ context: makerCtx, dialogs: makerDialogs } = await hookedContext(browser));
	mreq = makerCtx.request;
	maker = await throwawayMember(mreq, 'xss');
	expect(VECTORS.length).toBeGreaterThanOrEqual(100);

	// The main build: one step per vector (its title and its Markdown body).
	const made = await newDraft(mreq, `XSS corpus build ${Date.now().toString(36)}`, 'Every step holds one vector of the corpus.');
	expect(made.status).toBe(303);
	main = made.slug!;
	for (const [i, v] of VECTORS.entries()) {
		const res = await postPage(mreq, `/builds/${main}/edit?/addStep`, { title: v.length <= 120 ? v : `Step ${i + 1}`, bodyMd: v });
		expect(res.status(), `step ${i + 1}`).toBe(200);
	}
	tally['step titles'] = VECTORS.filter((v) => v.length <= 120).length;
	tally['step bodies'] = VECTORS.length;

	// Parts list: notes (2000) and substitution reasons (1000), one line each.
	const notes = pack(2000);
	const reasons = pack(1000);
	const lines = Math.max(notes.length, reasons.length);
	const form = new URLSearchParams();
	for (let i = 0; i < lines; i++) {
		const row: Record<string, string> = {
			...PART_ROW,
			designators: `R${i + 1}`,
			notes: notes[i] ?? '',
			designValue: reasons[i] ? '22k' : '',
			reason: reasons[i] ?? ''
		};
		for (const [k, v] of Object.entries(row)) form.append(k, v);
	}
	const parts = await mreq.post(`/builds/${main}/edit/parts?/save`, {
		data: form.toString(),
		headers: { origin: origin(), accept: 'text/html', 'content-type': 'application/x-www-form-urlencoded' },
		maxRedirects: 0
	});
	expect(parts.status(), 'parts list').toBe(200);
	tally['parts notes'] = VECTORS.length;
	tally['substitution reasons'] = VECTORS.length;

	// Photo alt text (300 characters), on the steps.
	const editHtml = await (await mreq.get(`/builds/${main}/edit`)).text();
	const stepIds = [...new Set([...editHtml.matchAll(/name="stepId" value="([0-9a-f-]{36})"/g)].map((m) => m[1]))];
	expect(stepIds.length).toBeGreaterThanOrEqual(VECTORS.length);
	const jpeg = await sharp({ create: { width: 64, height: 48, channels: 3, background: '#556b2f' } }).jpeg().toBuffer();
	await inParallel(pack(300, ' '), 2, async (alt, i) => {
		const res = await mreq.post(`/builds/${main}/photos`, {
			multipart: { purpose: 'step', stepId: stepIds[i], alt, file: { name: 'x.jpg', mimeType: 'image/jpeg', buffer: jpeg } },
			headers: jsonHeaders()
		});
		expect(res.status(), `photo with alt "${alt}"`).toBe(201);
	});
	tally['photo alt text'] = VECTORS.length;
	await publish(mreq, main);

	const d = await postPage(mreq, `/builds/${main}?/derive`, {});
	expect(d.status(), 'start from the corpus build').toBe(303);
	derived = new URL(d.headers()['location'], origin()).pathname.split('/')[2];

	// Titles (120) and summaries (600): published builds of their own, each with a spec block whose
	// title (120) holds vectors too (a build holds at most 40 blocks).
	const titles = pack(120, ' ');
	const summaries = pack(600);
	const specTitles = pack(120, ' ');
	const count = Math.max(titles.length, summaries.length, specTitles.length);
	titled.push(...new Array<string>(count).fill(''));
	await inParallel([...Array(count).keys()], 3, async (i) => {
		const d = await newDraft(mreq, titles[i] ?? `XSS summary build ${i}`, summaries[i] ?? '');
		expect(d.status, `build titled "${titles[i]}": ${d.body.slice(0, 200)}`).toBe(303);
		if (specTitles[i]) {
			const res = await postPage(mreq, `/builds/${d.slug}/edit/specs?/save`, { ...SUPPLY_FORM, title: specTitles[i] });
			expect(res.status(), `spec block "${specTitles[i]}"`).toBe(303);
		}
		const step = await postPage(mreq, `/builds/${d.slug}/edit?/addStep`, { title: 'Fixture step', bodyMd: 'Plain text.' });
		expect(step.status()).toBe(200);
		await publish(mreq, d.slug!);
		titled[i] = d.slug!;
	});
	tally['build titles'] = VECTORS.length;
	tally['spec block titles'] = VECTORS.length;
	tally['build summaries'] = VECTORS.length;

	// Comments: one vector each (Markdown), through the JSON API.
	await inParallel(VECTORS, 4, async (v) => {
		const res = await mreq.post(`/api/v1/builds/${main}/comments`, { data: { body: v }, headers: jsonHeaders() });
		expect(res.status(), `comment ${v}`).toBe(201);
	});
	tally.comments = VECTORS.length;
});

test.afterAll(async () => {
	console.log(`xss: ${VECTORS.length} vectors; surfaces: ${Object.entries(tally).map(([k, n]) => `${k} ${n}`).join(', ')}`);
	await makerCtx?.close();
});

test('build pages, editors, revisions, lists and search results render the corpus inert (maker and anonymous)', async ({ browser }) => {
	test.setTimeout(600_000);
	const urls = [
		`/builds/${main}`,
		`/builds/${main}/edit`,
		`/builds/${main}/edit/specs`,
		`/builds/${main}/edit/parts`,
		`/builds/${main}/revisions`,
		`/builds/${main}/revisions/1`,
		`/builds/${derived}/compare`,
		'/my-builds',
		`/makers/${maker.handle}`,
		'/search?q=alert',
		'/search?q=onerror',
		'/builds?q=alert',
		'/builds?sort=new',
		'/'
	];
	const mine = await renderAll(makerCtx, urls);
	expectClean(mine, makerDialogs, 'signed-in maker');
	const { context: anon, dialogs } = await hookedContext(browser);
	const theirs = await renderAll(anon, [...urls.filter((u) => !u.includes('/edit') && u !== '/my-builds'), ...titled.map((s) => `/builds/${s}`)]);
	expectClean(theirs, dialogs, 'anonymous reader');
	// The vectors are really on the pages (as text), so nothing passed only because it was dropped.
	const stepPage = await (await anon.request.get(`/builds/${main}`)).text();
	expect(stepPage).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
	await anon.close();
});

test('the search box: every vector as the query, rendered', async ({ browser }) => {
	test.setTimeout(600_000);
	const { context, dialogs } = await hookedContext(browser);
	// Queries are at most 100 characters: the vectors packed into as few as fit.
	const queries = pack(100, ' ');
	const renders = await renderAll(context, [...queries.map((q) => `/search?q=${encodeURIComponent(q)}`), ...queries.slice(0, 10).map((q) => `/builds?q=${encodeURIComponent(q)}`)]);
	tally['search box'] = VECTORS.length;
	// The API's search answers every one of them as JSON, never a page.
	await inParallel(queries, 4, async (q) => {
		const res = await context.request.get(`/api/v1/builds?q=${encodeURIComponent(q)}`);
		expect(res.status(), q).toBe(200);
		expect(res.headers()['content-type'], q).toMatch(/^application\/json/);
	});
	expectClean(renders, dialogs, 'search');
	await context.close();
});

test('hazard tag notes, a review summary and reports render inert on the review, hazard and moderation pages', async ({ browser }) => {
	test.setTimeout(600_000);
	const { context: revCtx, dialogs: revDialogs } = await hookedContext(browser);
	const r = revCtx.request;
	expect((await postPage(r, '/sign-in', { email: 'maren@starground.test', password: DEMO_PASSWORD })).status()).toBe(303);
	const html = await (await r.get(`/builds/${main}/review`)).text();
	const stepId = html.match(/data-review-target="step" data-target-id="([^"]+)"/)?.[1];
	expect(stepId).toBeTruthy();
	for (const note of pack(1500)) {
		const res = await postPage(r, `/builds/${main}/review?/raiseFlag`, { targetKind: 'step', targetId: stepId!, category: 'heat', severity: 'check', note });
		expect(res.status(), 'raise flag').toBe(200);
	}
	tally['hazard tag notes'] = VECTORS.length;
	const review = await postPage(r, `/builds/${main}/review?/submitReview`, { verdict: 'rework', summary: VECTORS.join('\n\n') });
	expect(review.status(), 'review').toBeLessThan(400);
	tally['review summary'] = VECTORS.length;
	const page = await (await mreq.get(`/builds/${main}`)).text();
	const flags = [...new Set([...page.matchAll(/data-flag="([0-9a-f-]{36})"/g)].map((m) => m[1]))];
	expect(flags.length).toBeGreaterThan(0);

	// Reports about the corpus comments, their reasons packed (2000 characters).
	const comments = ((await (await mreq.get(`/api/v1/builds/${main}/comments`)).json()) as { items: { id: string }[] }).items;
	for (const [i, reason] of pack(2000).entries()) {
		const res = await mreq.post('/api/v1/reports', { data: { targetKind: 'comment', targetId: comments[i].id, reason }, headers: jsonHeaders() });
		expect([200, 201], 'report').toContain(res.status());
	}
	tally['report reasons'] = VECTORS.length;

	const revRenders = await renderAll(revCtx, [`/builds/${main}/review`, `/builds/${main}`, '/review-desk', ...flags.map((f) => `/builds/${main}/hazards/${f}`)]);
	expectClean(revRenders, revDialogs, 'reviewer');
	const { context: modCtx, dialogs: modDialogs } = await hookedContext(browser);
	expect((await postPage(modCtx.request, '/sign-in', { email: 'tomas@starground.test', password: DEMO_PASSWORD })).status()).toBe(303);
	const modRenders = await renderAll(modCtx, ['/moderation', `/admin/members?q=${maker.handle}`]);
	expectClean(modRenders, modDialogs, 'moderator');
	expect(await (await modCtx.request.get('/moderation')).text()).toContain('onerror=alert(1)');
	const makerRenders = await renderAll(makerCtx, [`/builds/${main}`, ...flags.map((f) => `/builds/${main}/hazards/${f}`)]);
	expectClean(makerRenders, makerDialogs, 'maker after review');
	await revCtx.close();
	await modCtx.close();
});

test('profile name and bio render inert wherever the member shows', async ({ browser }) => {
	test.setTimeout(600_000);
	// A member of their own (a maker page with no builds renders fast), who comments on the corpus build.
	const { context, dialogs } = await hookedContext(browser);
	const who = await throwawayMember(context.request, 'xssp');
	expect((await context.request.post(`/api/v1/builds/${main}/comments`, { data: { body: 'Profile fixture comment.' }, headers: jsonHeaders() })).status()).toBe(201);
	const names = pack(80, ' ');
	const bios = pack(600);
	const renders: Render[] = [];
	const page = await context.newPage();
	for (let i = 0; i < Math.max(names.length, bios.length); i++) {
		const res = await postPage(context.request, '/account', { name: names[i] ?? 'Corpus Member', bio: bios[i] ?? '' });
		expect(res.status(), `profile "${names[i]}"`).toBeLessThan(400);
		renders.push(await render(page, `/makers/${who.handle}`));
	}
	// The last name also on the build page (comment byline) and the account page.
	for (const u of [`/builds/${main}`, '/account']) renders.push(await render(page, u));
	await page.close();
	tally['profile name'] = VECTORS.length;
	tally['profile bio'] = VECTORS.length;
	expectClean(renders, dialogs, 'profile');
	await context.close();
});

test('the JSON API returns the corpus as data: JSON, the text as written, HTML fields sanitized, inert when opened', async ({ browser }) => {
	test.setTimeout(300_000);
	const { context, dialogs } = await hookedContext(browser);
	const res = await context.request.get(`/api/v1/builds/${main}`);
	expect(res.headers()['content-type']).toMatch(/^application\/json/);
	expect(res.headers()['x-content-type-options']).toBe('nosniff');
	expect(res.headers()['content-security-policy']).toContain('sandbox');
	const b = (await res.json()) as { steps: { title: string; bodyMd: string; bodyHtml: string }[] };
	// eslint-disable-next-line no-control-regex
	const stored = (v: string) => v.replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/g, '');
	expect(b.steps.map((s) => s.bodyMd)).toEqual(VECTORS.map(stored));
	const page = await context.newPage();
	await page.goto('/');
	const inHtml: string[] = [];
	for (const s of b.steps) inHtml.push(...(await page.evaluate(ACTIVE_CONTENT, s.bodyHtml)));
	expect(inHtml, 'step bodyHtml from the API').toEqual([]);
	const comments = await context.request.get(`/api/v1/builds/${main}/comments`);
	expect(comments.headers()['content-type']).toMatch(/^application\/json/);
	const list = (await comments.json()) as { items: Record<string, unknown>[] };
	expect(list.items.length).toBeGreaterThanOrEqual(VECTORS.length);
	const titles = await Promise.all(titled.map(async (s) => ((await (await context.request.get(`/api/v1/builds/${s}`)).json()) as { title: string }).title));
	const norm = (t: string) => stored(t).replace(/\s+/g, ' ').trim();
	expect(titles.map(norm)).toEqual(pack(120, ' ').map(norm));
	// Opened in the browser, the API is a document of text.
	const renders = await renderAll(context, [`/api/v1/builds/${main}`, `/api/v1/builds/${main}/comments`, `/api/v1/builds?q=alert`]);
	expect(renders.flatMap((r) => r.executions)).toEqual([]);
	expect(dialogs).toEqual([]);
	await context.close();
});

test('the Atom feeds carry the corpus as text only', async ({ browser }) => {
	const { context } = await hookedContext(browser);
	const page = await context.newPage();
	await page.goto('/');
	for (const feed of ['/feed.xml', '/categories/power-amp/feed.xml']) {
		const res = await context.request.get(feed);
		expect(res.status()).toBe(200);
		expect(res.headers()['content-type']).toMatch(/^application\/atom\+xml/);
		const xml = await res.text();
		const report = await page.evaluate((x) => {
			const doc = new DOMParser().parseFromString(x, 'application/xml');
			const err = doc.querySelector('parsererror');
			const ATOM = 'http://www.w3.org/2005/Atom';
			const foreign = Array.from(doc.getElementsByTagName('*'))
				.filter((el) => el.namespaceURI !== ATOM)
				.map((el) => `${el.namespaceURI} ${el.localName}`);
			const typed = Array.from(doc.querySelectorAll('title, summary, content, subtitle, rights'))
				.filter((el) => (el.getAttribute('type') ?? 'text') !== 'text' || el.children.length > 0)
				.map((el) => `${el.localName} type=${el.getAttribute('type')}`);
			const titles = Array.from(doc.querySelectorAll('entry > title')).map((t) => t.textContent ?? '');
			return { parseError: err?.textContent ?? null, foreign, typed, titles };
		}, xml);
		expect(report.parseError, feed).toBeNull();
		expect(report.foreign, `${feed}: elements outside Atom`).toEqual([]);
		expect(report.typed, `${feed}: html/xhtml content`).toEqual([]);
		// The corpus titles are in the feed, as plain text.
		if (feed === '/feed.xml') expect(report.titles.some((t) => t.includes('<') && /alert|onerror/.test(t))).toBe(true);
	}
	await context.close();
});

test('mails about the corpus (hazard tags, review, replies) render inert', async ({ browser }) => {
	test.setTimeout(300_000);
	// A reply to one of the maker's comments, by a demo member, so a reply notification quotes the corpus.
	const comments = ((await (await mreq.get(`/api/v1/builds/${main}/comments`)).json()) as { items: { id: string }[] }).items;
	const { context, dialogs } = await hookedContext(browser);
	expect((await postPage(context.request, '/sign-in', { email: 'aiko@starground.test', password: DEMO_PASSWORD })).status()).toBe(303);
	const reply = await context.request.post(`/api/v1/builds/${main}/comments`, { data: { body: VECTORS.slice(0, 30).join('\n\n'), parentId: comments[0].id }, headers: jsonHeaders() });
	expect(reply.status()).toBe(201);
	type Msg = { subject: string; html: string };
	let msgs: Msg[] = [];
	const until = Date.now() + 30_000;
	while (Date.now() < until) {
		msgs = (await (await fetch(`${viewer()}/messages?to=${encodeURIComponent(maker.email)}`)).json()) as Msg[];
		if (msgs.some((m) => /replied/.test(m.subject)) && msgs.some((m) => /Hazard tagged/.test(m.subject)) && msgs.some((m) => /back|signed/i.test(m.subject))) break;
		await new Promise((r) => setTimeout(r, 500));
	}
	expect(msgs.some((m) => /replied/.test(m.subject)), 'reply mail').toBe(true);
	expect(msgs.some((m) => /Hazard tagged/.test(m.subject)), 'hazard tag mail').toBe(true);
	const page = await context.newPage();
	const renders: Render[] = [];
	for (const m of msgs) {
		await page.setContent(m.html, { waitUntil: 'load' });
		await page.waitForTimeout(100);
		const hits = await page.evaluate(() => [...((window as unknown as { __xssHits?: string[] }).__xssHits ?? []), ...((window as unknown as { __xss?: unknown }).__xss ? ['window.__xss'] : [])]);
		renders.push({ url: `mail "${m.subject}"`, executions: hits, active: await page.evaluate(ACTIVE_CONTENT, undefined) });
	}
	tally.mails = msgs.length;
	expect(msgs.length).toBeGreaterThan(3);
	expectClean(renders, dialogs, 'mails');
	await context.close();
});
