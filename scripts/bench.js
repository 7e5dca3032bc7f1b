// HTTP benchmark of a running Starground (a benchmark, not a test): requests/s and p50/p95/p99 latency
// of every target of the speed issue — home, browse, a build page (anonymous reader), the search page
// with a broad query, the API list and POST /api/v1/spec-check — next to GET /api/v1/ping, a bare
// framework route that returns a static string. Targets run interleaved in rounds within one run, so a
// noisy machine slows them all alike: the ratio to ping is the figure that holds. The machine's load
// average is printed before and after.
//
//   node scripts/bench.js [--url http://127.0.0.1:3000] [--duration 5] [--rounds 2] [--connections 32]
//                         [--slug some-build] [--q "toroid soft start"] [--only ping,build,search-miss] [--all]
//
// --all: then, in the same run, the issue's other figures — the ranked-search and hot queries
// (scripts/explain.js, needs DATABASE_URL), the JavaScript per page (scripts/js-budget.js) and the photo
// pipeline (scripts/bench-photos.js) — each in its own process, one after another.
//
// Start the app as in production first (`npm start`, or vite build then node server.js with the env
// vars), on the large data set (scripts/seed-large.js). Uses autocannon (a dev dependency).
import os from 'node:os';
import path from 'node:path';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import autocannon from 'autocannon';

const arg = (name, d) => {
	const i = process.argv.indexOf(`--${name}`);
	return i > 0 ? process.argv[i + 1] : d;
};
const base = arg('url', process.env.BENCH_URL ?? 'http://127.0.0.1:3000').replace(/\/$/, '');
const duration = Number(arg('duration', 5));
const rounds = Number(arg('rounds', 2));
const connections = Number(arg('connections', 32));
const q = arg('q', 'toroid soft start');
const only = arg('only', null)?.split(',');

async function firstBuildSlug() {
	const res = await fetch(`${base}/api/v1/builds?limit=1`);
	if (!res.ok) throw new Error(`GET /api/v1/builds answered ${res.status}; is the app running at ${base}?`);
	const body = await res.json();
	if (!body.items?.length) throw new Error('No published build to benchmark: seed some first (scripts/seed-large.js).');
	return body.items[0].slug;
}

/** How many published builds the query matches (only when DATABASE_URL is set). */
async function matches(query) {
	if (!process.env.DATABASE_URL) return null;
	const { default: postgres } = await import('postgres');
	const sql = postgres(process.env.DATABASE_URL, { max: 1, onnotice: () => {} });
	try {
		const [r] = await sql`select count(*)::int as n from build where status = 'published' and search @@ websearch_to_tsquery('english', ${query})`;
		return r.n;
	} finally {
		await sql.end({ timeout: 5 });
	}
}

const slug = arg('slug', null) ?? (await firstBuildSlug());
const specBlock = {
	kind: 'amplifier',
	data: {
		channels: 2,
		topology: 'class-ab-chip',
		supply: 'split',
		railV: 28,
		loadOhm: 8,
		device: { maxSupplyV: 84, dropoutV: 3, junctionMaxC: 150, rthJcKPerW: 1.5, minLoadOhm: 4 },
		gain: { rfOhm: 22000, riOhm: 680 },
		claimed: { powerW: 40, thdPct: 0.1 }
	}
};

/** Targets; `goal` is the issue's target ratio to ping (and p99 where it names one). */
const targets = [
	{ key: 'ping', name: 'ping (static string)', path: '/api/v1/ping' },
	{ key: 'home', name: 'home', path: '/', goal: 0.35 },
	{ key: 'browse', name: 'browse', path: '/builds', goal: 0.35 },
	{ key: 'build', name: 'build page (anonymous)', path: `/builds/${slug}`, goal: 0.3, p99: 150 },
	{ key: 'search', name: `search page ("${q}")`, path: `/search?q=${encodeURIComponent(q)}`, goal: 0.15, p99: 300 },
	{ key: 'api', name: 'API list', path: '/api/v1/builds', goal: 0.35 },
	{
		key: 'spec',
		name: 'POST spec-check',
		path: '/api/v1/spec-check',
		method: 'POST',
		body: JSON.stringify(specBlock),
		headers: { 'content-type': 'application/json' },
		goal: 0.9
	},
	// The same search with a query string no cache has seen (a counter in an unused parameter): what a
	// search costs when the list cache cannot answer (for information; last, so its slow requests still
	// in flight when its time is up do not weigh on another target).
	{ key: 'search-miss', name: 'search page, never cached', path: `/search?q=${encodeURIComponent(q)}`, unique: true }
].filter((t) => !only || t.key === 'ping' || only.includes(t.key));

/** One autocannon run; latencies collected per response (ms) for exact percentiles. */
let uniqueCounter = 0;
function runOnce(t) {
	return new Promise((resolve, reject) => {
		const latencies = [];
		let bad = 0;
		const instance = autocannon(
			{
				...(t.unique ? { requests: [{ setupRequest: (req) => ({ ...req, path: `${t.path}&bench=${++uniqueCounter}` }) }] } : {}),
				url: base + t.path,
				method: t.method ?? 'GET',
				body: t.body,
				headers: { accept: t.method ? 'application/json' : 'text/html', ...(t.headers ?? {}) },
				connections,
				duration
			},
			(err, result) => (err ? reject(err) : resolve({ result, latencies, bad }))
		);
		instance.on('response', (_client, statusCode, _bytes, ms) => {
			latencies.push(ms);
			if (statusCode < 200 || statusCode >= 300) bad++;
		});
	});
}

const pct = (sorted, p) => (sorted.length ? sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)] : NaN);
const load = () => os.loadavg().map((n) => n.toFixed(2)).join(', ');

const total = await matches(q);
console.log(`Benchmarking ${base} — ${rounds} round(s) × ${duration} s per target, ${connections} connections`);
console.log(`build page: /builds/${slug}; search "${q}"${total != null ? ` matches ${total} builds` : ''}`);
console.log(`machine: ${os.cpus().length} cores, load average before: ${load()}`);
// A short warm-up of every target (caches, JIT, connection pools) that is not counted.
for (const t of targets) await runOnce({ ...t }).catch(() => {});

const totals = new Map(targets.map((t) => [t.key, { requests: 0, seconds: 0, latencies: [], bad: 0, errors: 0 }]));
for (let r = 0; r < rounds; r++) {
	for (const t of targets) {
		// Let what the previous target left in flight finish first (the never-cached search leaves seconds' worth).
		const pause = t === targets[0] ? 6000 : 1500;
		await new Promise((done) => setTimeout(done, pause));
		const { result, latencies, bad } = await runOnce(t);
		const s = totals.get(t.key);
		s.requests += latencies.length;
		s.seconds += result.duration;
		s.latencies.push(...latencies);
		s.bad += bad;
		s.errors += result.errors + result.timeouts;
	}
}

const ping = totals.get('ping');
const pingRps = ping.requests / ping.seconds;
const rows = targets.map((t) => {
	const s = totals.get(t.key);
	const sorted = s.latencies.sort((a, b) => a - b);
	const rps = s.requests / s.seconds;
	const ratio = rps / pingRps;
	const p99 = pct(sorted, 99);
	const held = t.goal == null ? '' : ratio >= t.goal && (t.p99 == null || p99 <= t.p99) ? 'yes' : 'NO';
	return {
		target: t.name,
		'req/s': rps.toFixed(0),
		'p50 ms': pct(sorted, 50).toFixed(1),
		'p95 ms': pct(sorted, 95).toFixed(1),
		'p99 ms': p99.toFixed(1),
		'vs ping': t.key === 'ping' ? '1.00' : ratio.toFixed(2),
		target_: t.goal == null ? '' : `≥ ${t.goal}${t.p99 ? `, p99 ≤ ${t.p99}` : ''}`,
		held,
		'non-2xx': s.bad + s.errors
	};
});
console.table(rows);
console.log(`load average after: ${load()}`);
console.log('| target | req/s | p50 ms | p95 ms | p99 ms | vs ping | target | held |');
console.log('|---|---:|---:|---:|---:|---:|---|---|');
for (const r of rows) console.log(`| ${r.target} | ${r['req/s']} | ${r['p50 ms']} | ${r['p95 ms']} | ${r['p99 ms']} | ${r['vs ping']} | ${r.target_} | ${r.held} |`);
if (rows.some((r) => r['non-2xx'] > 0)) {
	console.error('Some requests failed (non-2xx or errors): the figures above are not trustworthy.');
	process.exitCode = 1;
}

if (process.argv.includes('--all')) {
	const here = path.dirname(fileURLToPath(import.meta.url));
	const steps = [...(process.env.DATABASE_URL ? [['explain.js']] : []), ['js-budget.js', '--url', base], ['bench-photos.js']];
	if (!process.env.DATABASE_URL) console.log('\nDATABASE_URL is not set: scripts/explain.js (ranked search, hot queries) skipped.');
	for (const [script, ...args] of steps) {
		console.log(`\n$ node scripts/${script} ${args.join(' ')}`);
		const r = spawnSync(process.execPath, [path.join(here, script), ...args], { stdio: 'inherit' });
		if (r.status !== 0) {
			console.error(`scripts/${script} failed (${r.status ?? r.signal}).`);
			process.exitCode = 1;
		}
	}
}
