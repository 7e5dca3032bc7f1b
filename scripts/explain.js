// EXPLAIN (ANALYZE, BUFFERS) of every query the hot pages send (a report, not a test): home, browse,
// a build page as an anonymous reader (and what each anonymous request sends before any cache: the
// reader version and the build's head), the search page with a broad query, the API list, and the find
// queries (browse by rails and load, the API list by a part value). It runs
// the app's own load functions (bundled by scripts/lib/app-module.js) against DATABASE_URL, records
// each SQL statement they send (postgres.js debug hook), then explains each one with its parameters.
// Prints per page: how many queries (a count that grows with the data would be an N+1), each query's
// plan time, execution time and buffers, and flags any sequential scan of a large table. Then times the
// ranked-search queries (the search page's list queries) 50 times each and prints p50/p95, and what a
// write that leaves the searched text alone costs.
//
//   DATABASE_URL=postgres://… node scripts/explain.js [--q "toroid soft start"] [--slug lg-…] [--plans] [--only pages|ranked|writes]
//
// Run it against the large data set (scripts/seed-large.js; --builds 100000 for the growth figures).
import os from 'node:os';
import postgres from 'postgres';
import { loadAppModule } from './lib/app-module.js';

const arg = (name, d) => {
	const i = process.argv.indexOf(`--${name}`);
	return i > 0 ? process.argv[i + 1] : d;
};
if (!process.env.DATABASE_URL) {
	console.error('DATABASE_URL is not set');
	process.exit(1);
}
process.env.BETTER_AUTH_SECRET ??= 'explain-script-only-'.padEnd(48, 'x');
const q = arg('q', 'toroid soft start');
const showPlans = process.argv.includes('--plans');
// --only pages|ranked|writes runs one part of the report.
const only = arg('only', null);
const part = (name) => !only || only === name;
const LARGE = ['build', 'build_step', 'part_line', 'comment', 'photo', 'review', 'safety_flag', 'build_revision', 'spec_block', 'user'];

const app = await loadAppModule('scripts/lib/hot-pages.ts');
const sql = postgres(process.env.DATABASE_URL, { max: 1, onnotice: () => {} });
const [{ n: builds }] = await sql`select count(*)::int as n from build where status = 'published'`;
const slug = arg('slug', null) ?? (await sql`select slug from build where status = 'published' order by derived_count desc, published_at desc limit 1`)[0].slug;

let captured = null;
app.client.options.debug = (_conn, query, params) => {
	if (captured) captured.push({ query, params });
};

const event = (path) => {
	const url = new URL(path, 'http://127.0.0.1');
	return { url, params: { slug }, locals: { user: null, session: null }, setHeaders() {}, request: new Request(url), isDataRequest: false };
};
const pages = [
	['every anonymous request: reader version + build head', () => Promise.all([app.currentReaderVersion(), app.getBuildHead(slug)])],
	['home (lists, uncached)', () => app.homeLists()],
	['browse', () => app.browseLoad(event('/builds'))],
	['build page (anonymous, cache emptied)', () => (app.clearReaderCache(), app.buildLoad(event(`/builds/${slug}`)))],
	['search page', () => app.searchLoad(event(`/search?q=${encodeURIComponent(q)}`))],
	['API list', () => app.apiListGet(event('/api/v1/builds'))],
	['find: browse by rails 25–30 V and an 8 Ω load', () => app.browseLoad(event('/builds?railMinV=25&railMaxV=30&loadOhm=8'))],
	['find: API list by a part (4k7 resistor)', () => app.apiListGet(event('/api/v1/builds?partKind=resistor&partValue=4k7'))]
];

console.log(`${builds} published builds; build page /builds/${slug}; search "${q}"`);
console.log(`machine: ${os.cpus().length} cores, load average ${os.loadavg().map((x) => x.toFixed(2)).join(', ')}\n`);
let seqScans = 0;
for (const [name, run] of part('pages') ? pages : []) {
	await run(); // warm
	captured = [];
	await run();
	const queries = captured;
	captured = null;
	console.log(`■ ${name}: ${queries.length} queries`);
	for (const { query, params } of queries) {
		if (!/^\s*(select|with)/i.test(query)) continue;
		const [{ 'QUERY PLAN': plan }] = await sql.unsafe(`explain (analyze, buffers, format json) ${query}`, params);
		const root = plan[0];
		const scans = [];
		const walk = (node) => {
			if (node['Node Type'] === 'Seq Scan' && LARGE.includes(node['Relation Name'])) scans.push(`${node['Relation Name']} (${node['Actual Rows']} rows)`);
			for (const child of node.Plans ?? []) walk(child);
		};
		walk(root.Plan);
		seqScans += scans.length;
		const shared = (root.Plan['Shared Hit Blocks'] ?? 0) + (root.Plan['Shared Read Blocks'] ?? 0);
		const short = query.replace(/\s+/g, ' ').slice(0, 110);
		console.log(
			`  ${root['Execution Time'].toFixed(2).padStart(8)} ms exec ${root['Planning Time'].toFixed(2).padStart(6)} ms plan ${String(shared).padStart(6)} buffers  ${scans.length ? `SEQ SCAN ${scans.join(', ')}  ` : ''}${short}`
		);
		if (showPlans) {
			const [text] = [await sql.unsafe(`explain (analyze, buffers) ${query}`, params)];
			console.log(text.map((r) => '      ' + r['QUERY PLAN']).join('\n'));
		}
	}
}

// The ranked-search queries on their own (builds/list.ts relevancePage: the title-and-summary tier, and
// the steps-only tier when the page reaches it), as the search page sends them (20 a page), 50 runs
// each, summed per run: the first page of the broad query, a page deep in it (the 40th, past the
// title-and-summary matches at 10,000 builds), and a word found in many titles ("amp").
if (part('ranked')) {
	const PAGE = 20;
	const pageQueries = async (query, skip) => {
		let cursor = null;
		for (let i = 0; i < skip; i++) cursor = (await app.listPublishedBuilds({ limit: PAGE, sort: 'relevance', filters: { q: query }, cursor })).next;
		captured = [];
		await app.listPublishedBuilds({ limit: PAGE, sort: 'relevance', filters: { q: query }, cursor });
		const got = captured.filter((c) => /search_head|"search" @@/.test(c.query));
		captured = null;
		return { got, cursor };
	};
	const scenarios = [
		[`"${q}", first page`, q, 0],
		[`"${q}", page 40`, q, 39],
		['"amp", first page', 'amp', 0]
	];
	console.log(`\nranked search (load average ${os.loadavg()[0].toFixed(2)}):`);
	for (const [label, query, skip] of scenarios) {
		const { got, cursor } = await pageQueries(query, skip);
		const times = [];
		for (let i = 0; i < 50; i++) {
			let t = 0;
			for (const c of got) {
				const [{ 'QUERY PLAN': plan }] = await sql.unsafe(`explain (analyze, format json) ${c.query}`, c.params);
				t += plan[0]['Execution Time'] + plan[0]['Planning Time'];
			}
			times.push(t);
		}
		times.sort((a, b) => a - b);
		const [{ n: hits, head }] = await sql`select count(*)::int as n, count(*) filter (where search_head @@ websearch_to_tsquery('english', ${query}))::int as head
			from build where status = 'published' and search @@ websearch_to_tsquery('english', ${query})`;
		console.log(
			`  ${label}: ${hits} matches of ${builds} (${head} in title or summary); ${got.length} ranking quer${got.length === 1 ? 'y' : 'ies'}: p50 ${times[24].toFixed(2)} ms, p95 ${times[47].toFixed(2)} ms (plan + execution, 50 runs)`
		);
		if (showPlans) {
			for (const c of got) {
				const text = await sql.unsafe(`explain (analyze, buffers) ${c.query}`, c.params);
				console.log(text.map((r) => '      ' + r['QUERY PLAN']).join('\n'));
			}
		}
		// The whole page as the app asks for it (its ranking queries, round trips included).
		const wall = [];
		for (let i = 0; i < 50; i++) {
			const t = performance.now();
			await app.listPublishedBuilds({ limit: PAGE, sort: 'relevance', filters: { q: query }, cursor });
			wall.push(performance.now() - t);
		}
		wall.sort((a, b) => a - b);
		console.log(`    the page (listPublishedBuilds, wall clock from this script): p50 ${wall[24].toFixed(2)} ms, p95 ${wall[47].toFixed(2)} ms`);
	}
}
if (part('pages')) console.log(seqScans ? `\n${seqScans} sequential scan(s) of large tables (see above).` : '\nNo sequential scan of a large table.');

// What a write that does not change the searched text costs: a comment on a build (migration 0004's
// triggers touch the build row) and a save of the same search text (refreshSearchText after a step save
// that changed nothing searched), on the build with the longest search text and on the same build with
// 200,000 characters of search text (SEARCH_TEXT_MAX), each in a transaction that is rolled back.
if (part('writes')) {
	const [target] = await sql`select id, length(search_text)::int as n from build where status = 'published' order by length(search_text) desc limit 1`;
	const [author] = await sql`select id from "user" limit 1`;
	const words = ['toroid', 'reservoir', 'heatsink', 'bleeder', 'zobel', 'offset', 'rails', 'chassis', 'earth', 'bridge', 'film', 'ripple'];
	const long = Array.from({ length: 30_000 }, (_, i) => words[(i * 7) % words.length] + (i % 97)).join(' ').slice(0, 200_000);
	const ROLLBACK = new Error('rollback');
	const timeWrites = async (label, prepare) => {
		for (const [what, write] of [
			['comment insert', (tx) => tx`insert into comment (build_id, author_id, body_md, body_html) values (${target.id}, ${author.id}, 'Nice build', '<p>Nice build</p>')`],
			['same search text saved', (tx) => tx`update build set search_text = search_text where id = ${target.id}`]
		]) {
			const times = [];
			await sql
				.begin(async (tx) => {
					await prepare(tx);
					for (let i = 0; i < 21; i++) {
						const t = performance.now();
						await write(tx);
						times.push(performance.now() - t);
					}
					throw ROLLBACK;
				})
				.catch((e) => {
					if (e !== ROLLBACK) throw e;
				});
			times.shift(); // the first one warms up
			times.sort((a, b) => a - b);
			console.log(`  ${label}, ${what}: p50 ${times[10].toFixed(2)} ms, p95 ${times[18].toFixed(2)} ms (20 runs)`);
		}
	};
	console.log(`\nwrites that do not change the searched text (load average ${os.loadavg()[0].toFixed(2)}):`);
	await timeWrites(`build with the longest search text (${target.n} characters)`, async () => {});
	await timeWrites('the same build with 200,000 characters of search text', (tx) => tx`update build set search_text = ${long} where id = ${target.id}`);
}
await sql.end({ timeout: 5 });
await app.client.end({ timeout: 5 });
