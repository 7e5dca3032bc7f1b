// HTTP benchmark of a running Starground (a benchmark, not a test): requests/s and p50/p95/p99
// latency for the home page, a build page, search, the API list and POST /api/v1/spec-check, next
// to GET /api/v1/ping — a bare framework route that returns a static string. Targets run
// interleaved in rounds within one run, so a noisy machine slows them all alike and the ratios hold.
//
//   node scripts/bench.js [--url http://127.0.0.1:3000] [--duration 5] [--rounds 2] [--connections 10]
//                         [--slug some-build] [--q "soft start"]
//
// Start the app as in production first (vite build, then node build with ORIGIN and the env vars),
// ideally on a large data set (scripts/seed-large.js).
import autocannon from 'autocannon';

const arg = (name, d) => {
	const i = process.argv.indexOf(`--${name}`);
	return i > 0 ? process.argv[i + 1] : d;
};
const base = arg('url', process.env.BENCH_URL ?? 'http://127.0.0.1:3000').replace(/\/$/, '');
const duration = Number(arg('duration', 5));
const rounds = Number(arg('rounds', 2));
const connections = Number(arg('connections', 10));
const q = arg('q', 'toroid soft start');

async function firstBuildSlug() {
	const res = await fetch(`${base}/api/v1/builds?limit=1`);
	if (!res.ok) throw new Error(`GET /api/v1/builds answered ${res.status}; is the app running at ${base}?`);
	const body = await res.json();
	if (!body.items?.length) throw new Error('No published build to benchmark: seed some first (scripts/seed-large.js).');
	return body.items[0].slug;
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

const targets = [
	{ name: 'ping (static string)', path: '/api/v1/ping' },
	{ name: 'home', path: '/' },
	{ name: 'build page', path: `/builds/${slug}` },
	{ name: 'search page', path: `/search?q=${encodeURIComponent(q)}` },
	{ name: 'API list', path: '/api/v1/builds' },
	{
		name: 'POST spec-check',
		path: '/api/v1/spec-check',
		method: 'POST',
		body: JSON.stringify(specBlock),
		headers: { 'content-type': 'application/json' }
	}
];

/** One autocannon run; latencies collected per response (ms) for exact percentiles. */
function runOnce(t) {
	return new Promise((resolve, reject) => {
		const latencies = [];
		let bad = 0;
		const instance = autocannon(
			{
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

console.log(`Benchmarking ${base} — ${rounds} round(s) × ${duration} s per target, ${connections} connections; build page: /builds/${slug}`);
// A short warm-up of every target (caches, JIT, connection pools) that is not counted.
for (const t of targets) await runOnce({ ...t }).catch(() => {});

const totals = new Map(targets.map((t) => [t.name, { requests: 0, seconds: 0, latencies: [], bad: 0, errors: 0 }]));
for (let r = 0; r < rounds; r++) {
	for (const t of targets) {
		const { result, latencies, bad } = await runOnce(t);
		const s = totals.get(t.name);
		s.requests += latencies.length;
		s.seconds += result.duration;
		s.latencies.push(...latencies);
		s.bad += bad;
		s.errors += result.errors + result.timeouts;
	}
}

const ping = totals.get(targets[0].name);
const pingRps = ping.requests / ping.seconds;
const rows = targets.map((t) => {
	const s = totals.get(t.name);
	const sorted = s.latencies.sort((a, b) => a - b);
	const rps = s.requests / s.seconds;
	return {
		target: t.name,
		'req/s': rps.toFixed(0),
		'p50 ms': pct(sorted, 50).toFixed(1),
		'p95 ms': pct(sorted, 95).toFixed(1),
		'p99 ms': pct(sorted, 99).toFixed(1),
		'vs ping': t === targets[0] ? '1.00' : (rps / pingRps).toFixed(2),
		'non-2xx': s.bad + s.errors
	};
});
console.table(rows);
console.log('| target | req/s | p50 ms | p95 ms | p99 ms | vs ping |');
console.log('|---|---:|---:|---:|---:|---:|');
for (const r of rows) console.log(`| ${r.target} | ${r['req/s']} | ${r['p50 ms']} | ${r['p95 ms']} | ${r['p99 ms']} | ${r['vs ping']} |`);
if (rows.some((r) => r['non-2xx'] > 0)) {
	console.error('Some requests failed (non-2xx or errors): the figures above are not trustworthy.');
	process.exitCode = 1;
}
