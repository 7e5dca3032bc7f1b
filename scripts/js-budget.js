// JavaScript budget (a measurement, not a test): loads pages of a running Starground in Debian's
// Chromium (@playwright/test's library, executablePath /usr/bin/chromium) and sums the JavaScript they
// fetch over the network, each file gzip-compressed (zlib, level 9) as a server would send it. Targets
// (issue 15): a reader's build page ≤ 60 KB, the same signed in as its maker ≤ 90 KB, home ≤ 45 KB,
// a bench tool ≤ 50 KB (every bench tool is measured: the amplifier's row keeps its name, the other tools
// and the tools index follow browse). Every page is loaded in a fresh browser context (empty cache), so each figure is
// everything that page fetches on its own, as a first visit would; the maker's row is checked to really
// be signed in as the maker (the page must offer "Edit build").
//
//   node scripts/js-budget.js [--url http://127.0.0.1:3000] [--slug stereo-power-ic-amp-28v-rails]
//                             [--maker joss@starground.test] [--list] [--tools]
//
// --tools: the bench tools only (their rows; no sign-in, no build page), for work on the tools.
//
// Needs the demo seed (npm start seeds it): the maker's demo account signs in through the form.
import os from 'node:os';
import zlib from 'node:zlib';
import { chromium } from '@playwright/test';
import { DEMO_ACCOUNTS } from './lib/demo-accounts.js';

const arg = (name, d) => {
	const i = process.argv.indexOf(`--${name}`);
	return i > 0 ? process.argv[i + 1] : d;
};
const base = arg('url', process.env.BENCH_URL ?? 'http://127.0.0.1:3000').replace(/\/$/, '');
const slug = arg('slug', 'stereo-power-ic-amp-28v-rails');
const makerEmail = arg('maker', 'joss@starground.test');
const list = process.argv.includes('--list');
const toolsOnly = process.argv.includes('--tools');
// The bench tools (src/lib/components/tools/tools.ts BENCH_TOOLS), each held to the bench-tool budget.
const TOOLS = ['supply', 'heatsink', 'gain', 'network', 'eseries', 'codes'];

const browser = await chromium.launch({
	executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
	args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-quic']
});

/**
 * Load `path` in a fresh context (empty cache; `storageState` = a signed-in session) and wait until the
 * network is idle; → { files, raw, gzip } of the JavaScript it fetched. `check(page)` runs before closing.
 */
async function measure(path, { storageState, check } = {}) {
	const context = await browser.newContext(storageState ? { storageState } : {});
	const page = await context.newPage();
	const seen = [];
	page.on('response', (r) => {
		const type = r.headers()['content-type'] ?? '';
		if (r.request().resourceType() === 'script' || type.includes('javascript')) seen.push(r);
	});
	const res = await page.goto(base + path, { waitUntil: 'networkidle' });
	if (!res?.ok()) throw new Error(`${path}: HTTP ${res?.status()}`);
	if (check) await check(page);
	const files = [];
	for (const r of seen) {
		const body = await r.body().catch(() => Buffer.alloc(0));
		files.push({ url: r.url().replace(base, ''), raw: body.length, gzip: zlib.gzipSync(body, { level: 9 }).length });
	}
	await context.close();
	return { files, raw: files.reduce((s, f) => s + f.raw, 0), gzip: files.reduce((s, f) => s + f.gzip, 0) };
}

const kb = (n) => (n / 1024).toFixed(1);
const rows = [];
const targets = [
	...(toolsOnly
		? []
		: [
				['home', '/', 45],
				['build page, reader (not signed in)', `/builds/${slug}`, 60]
			]),
	['bench tool (amplifier)', '/tools/amplifier', 50],
	...(toolsOnly ? [] : [['browse', '/builds', null]]),
	...TOOLS.map((t) => [`bench tool (${t})`, `/tools/${t}`, 50]),
	['bench tools index', '/tools', 50]
];
const detail = [];
for (const [name, path, budget] of targets) {
	const m = await measure(path);
	rows.push({ page: name, files: m.files.length, 'raw KB': kb(m.raw), 'gzip KB': kb(m.gzip), budget: budget ? `≤ ${budget}` : '', held: budget ? (m.gzip <= budget * 1024 ? 'yes' : 'NO') : '' });
	detail.push([name, m.files]);
}

// Sign in through the form, keep the session, then measure the build page in a fresh context with it.
if (!toolsOnly) {
	const own = await browser.newContext();
	const signIn = await own.newPage();
	await signIn.goto(`${base}/sign-in`);
	await signIn.getByLabel('E-mail').fill(makerEmail);
	await signIn.getByLabel('Password').fill(DEMO_ACCOUNTS.password);
	await signIn.getByRole('button', { name: 'Sign in' }).click();
	await signIn.waitForURL((u) => !u.pathname.startsWith('/sign-in'), { timeout: 15000 });
	const storageState = await own.storageState();
	await own.close();
	const m = await measure(`/builds/${slug}`, {
		storageState,
		check: (page) => page.getByRole('link', { name: 'Edit build' }).first().waitFor({ timeout: 5000 })
	});
	rows.push({ page: 'build page, signed in as its maker', files: m.files.length, 'raw KB': kb(m.raw), 'gzip KB': kb(m.gzip), budget: '≤ 90', held: m.gzip <= 90 * 1024 ? 'yes' : 'NO' });
	detail.push(['build page, maker', m.files]);
}
await browser.close();

console.log(`${new Date().toISOString()} ${base} — JavaScript fetched per page (fresh context each), each file gzip -9; load average ${os.loadavg().map((n) => n.toFixed(2)).join(', ')}`);
console.table(rows);
if (list) {
	for (const [name, files] of detail) {
		console.log(`\n${name}:`);
		for (const f of [...files].sort((a, b) => b.gzip - a.gzip)) console.log(`  ${kb(f.gzip).padStart(6)} KB  ${f.url}`);
	}
}
