// EXPLAIN (ANALYZE, BUFFERS) of every query the hot pages send (a report, not a test): home, browse,
// a build page as an anonymous reader (and what each anonymous request sends before any cache: the
// reader version and the build's head), the search page with a broad query, the API list, and the find
// queries (browse by rails and load, the API list by a part value). It runs
// the app's own load functions (bundled by scripts/lib/app-module.js) against DATABASE_URL, records
// each SQL statement they send (postgres.js debug hook), then explains each one with its parameters.
// Prints per page: how many queries (a count that grows with the data would be an N+1), each query's
// plan time, execution time and buffers, and flags any sequential scan of a large table. Then times the
// ranked-search query (the search page's list query) 50 times and prints p50/p95.
//
//   DATABASE_URL=postgres://… node scripts/explain.js [--q "toroid soft start"] [--slug lg-…] [--plans]
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
for (const [name, run] of pages) {
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

// The ranked-search query on its own: the search page's list query, 50 runs.
captured = [];
await app.searchLoad(event(`/search?q=${encodeURIComponent(q)}`));
const ranked = captured.find((c) => /<=>|ts_rank/.test(c.query));
captured = null;
if (ranked) {
	const times = [];
	for (let i = 0; i < 50; i++) {
		const [{ 'QUERY PLAN': plan }] = await sql.unsafe(`explain (analyze, format json) ${ranked.query}`, ranked.params);
		times.push(plan[0]['Execution Time'] + plan[0]['Planning Time']);
	}
	times.sort((a, b) => a - b);
	const [{ n: hits }] = await sql`select count(*)::int as n from build where status = 'published' and search @@ websearch_to_tsquery('english', ${q})`;
	console.log(`\nranked search "${q}" (${hits} matches of ${builds}): p50 ${times[24].toFixed(2)} ms, p95 ${times[47].toFixed(2)} ms (the search page's ranking query, plan + execution, 50 runs)`);
	// The whole first page of the relevance order as the app asks for it (every query, round trips included).
	const wall = [];
	for (let i = 0; i < 50; i++) {
		const t = performance.now();
		await app.listPublishedBuilds({ limit: 20, sort: 'relevance', filters: { q } });
		wall.push(performance.now() - t);
	}
	wall.sort((a, b) => a - b);
	console.log(`relevance page of 20 (listPublishedBuilds, wall clock from this script): p50 ${wall[24].toFixed(2)} ms, p95 ${wall[47].toFixed(2)} ms`);
}
console.log(seqScans ? `\n${seqScans} sequential scan(s) of large tables (see above).` : '\nNo sequential scan of a large table.');
await sql.end({ timeout: 5 });
await app.client.end({ timeout: 5 });
