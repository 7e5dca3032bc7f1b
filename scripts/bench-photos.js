// Photo pipeline benchmark (a benchmark, not a test): a 12-megapixel JPEG through the app's upload
// pipeline (processPhoto in src/lib/server/photos/photos.ts: checks, one decode, upright, WebP renditions,
// placeholder) next to sharp's own bare resize of the same file to the same widths, each in its own
// child process, interleaved, with the peak RSS of each process. Then 4 uploads at once through the
// pipeline, which decodes one full-size image at a time per process (p-limit), to show memory stays flat.
//
//   node scripts/bench-photos.js [--rounds 3] [--megapixels 12]
//
// Targets (issue 15): pipeline ≤ 1.3 × bare time, peak RSS ≤ 350 MB.
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import sharp from 'sharp';

const here = fileURLToPath(import.meta.url);
const arg = (name, d) => {
	const i = process.argv.indexOf(`--${name}`);
	return i > 0 ? process.argv[i + 1] : d;
};
const mode = arg('child', null);
const file = arg('file', null);
const rssMb = () => process.resourceUsage().maxRSS / 1024;

/** A photo-like test image: an invented bench scene in SVG with grain, 4:3, as a JPEG (quality 88). */
async function makeJpeg(megapixels) {
	const width = Math.round(Math.sqrt((megapixels * 1e6 * 4) / 3));
	const height = Math.round((width * 3) / 4);
	const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}">
		<defs><linearGradient id="g" x1="0" y1="0" x2="1" y2="1"><stop offset="0" stop-color="#6b4f32"/><stop offset="1" stop-color="#e9dcc2"/></linearGradient></defs>
		<rect width="100%" height="100%" fill="url(#g)"/>
		<rect x="${width * 0.15}" y="${height * 0.35}" width="${width * 0.7}" height="${height * 0.4}" rx="40" fill="#2f3a40"/>
		<circle cx="${width * 0.35}" cy="${height * 0.55}" r="${height * 0.12}" fill="#b87333"/>
		<circle cx="${width * 0.65}" cy="${height * 0.55}" r="${height * 0.08}" fill="#c9c2b0"/>
	</svg>`;
	const base = await sharp(Buffer.from(svg)).raw().toBuffer({ resolveWithObject: true });
	const grain = await sharp({ create: { width, height, channels: 3, noise: { type: 'gaussian', mean: 0, sigma: 16 } } }).raw().toBuffer();
	const px = base.data;
	const ch = base.info.channels;
	const out = Buffer.alloc(width * height * 3);
	for (let i = 0, j = 0; j < out.length; i += ch, j += 3) {
		for (let c = 0; c < 3; c++) out[j + c] = Math.max(0, Math.min(255, px[i + c] + grain[j + c] - 8));
	}
	return sharp(out, { raw: { width, height, channels: 3 } }).jpeg({ quality: 88 }).toBuffer();
}

if (mode) {
	// Child: time one way of making the renditions, report JSON on stdout.
	const bytes = fs.readFileSync(file);
	const runs = Number(arg('runs', 1));
	const times = [];
	let extra = {};
	if (mode === 'bare') {
		const meta = await sharp(bytes).metadata();
		const widths = [320, 640, 1280].filter((w) => w < meta.width).concat(Math.min(meta.width, 1280)).filter((w, i, a) => a.indexOf(w) === i);
		for (let r = 0; r < runs; r++) {
			const t = performance.now();
			for (const w of widths) await sharp(bytes).rotate().resize({ width: w }).webp({ quality: 80, effort: 4 }).toBuffer();
			times.push(performance.now() - t);
		}
		extra = { widths };
	} else {
		process.env.DATABASE_URL ??= 'postgres://bench@127.0.0.1:1/bench';
		process.env.BETTER_AUTH_SECRET ??= 'bench-only-secret-'.padEnd(48, 'x');
		const { loadAppModule } = await import('./lib/app-module.js');
		const photos = await loadAppModule('src/lib/server/photos/photos.ts');
		const baseline = rssMb();
		if (mode === 'pipeline') {
			let widths;
			for (let r = 0; r < runs; r++) {
				const t = performance.now();
				widths = (await photos.processPhoto(new Uint8Array(bytes))).widths;
				times.push(performance.now() - t);
			}
			extra = { widths, baselineMb: baseline };
		} else if (mode === 'concurrent') {
			const t = performance.now();
			await Promise.all([1, 2, 3, 4].map(() => photos.processPhoto(new Uint8Array(bytes))));
			times.push(performance.now() - t);
			extra = { uploads: 4, baselineMb: baseline };
		}
	}
	console.log(JSON.stringify({ mode, times, peakRssMb: rssMb(), ...extra }));
	process.exit(0);
}

const rounds = Number(arg('rounds', 3));
const mp = Number(arg('megapixels', 12));
const tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'sg-photo-bench-'));
const jpeg = path.join(tmp, 'bench.jpg');
const bytes = await makeJpeg(mp);
fs.writeFileSync(jpeg, bytes);
const meta = await sharp(bytes).metadata();
console.log(`test image: ${meta.width} × ${meta.height} JPEG (${(meta.width * meta.height / 1e6).toFixed(1)} MP, ${(bytes.length / 1e6).toFixed(1)} MB); ${rounds} rounds, interleaved`);
console.log(`machine: ${os.cpus().length} cores, load average ${os.loadavg().map((n) => n.toFixed(2)).join(', ')}`);

function child(m, runs = 1) {
	const r = spawnSync(process.execPath, [here, '--child', m, '--file', jpeg, '--runs', String(runs)], { encoding: 'utf8', env: process.env });
	if (r.status !== 0) throw new Error(`${m} failed:\n${r.stderr}`);
	return JSON.parse(r.stdout.trim().split('\n').pop());
}

const pipe = [];
const bare = [];
let pipeRss = 0;
let bareRss = 0;
let baseline = 0;
for (let r = 0; r < rounds; r++) {
	const p = child('pipeline');
	const b = child('bare');
	pipe.push(...p.times);
	bare.push(...b.times);
	pipeRss = Math.max(pipeRss, p.peakRssMb);
	bareRss = Math.max(bareRss, b.peakRssMb);
	baseline = p.baselineMb;
}
const conc = child('concurrent');
fs.rmSync(tmp, { recursive: true, force: true });
const median = (a) => [...a].sort((x, y) => x - y)[Math.floor(a.length / 2)];
const ratio = median(pipe) / median(bare);
console.table([
	{ what: 'upload pipeline (processPhoto)', 'median ms': median(pipe).toFixed(0), 'peak RSS MB': pipeRss.toFixed(0), note: `app modules loaded: ${baseline.toFixed(0)} MB before the first photo` },
	{ what: 'sharp bare resize, same widths', 'median ms': median(bare).toFixed(0), 'peak RSS MB': bareRss.toFixed(0), note: 'one sharp(file).resize().webp() per width' },
	{ what: '4 uploads at once (pipeline)', 'median ms': conc.times[0].toFixed(0), 'peak RSS MB': conc.peakRssMb.toFixed(0), note: 'one full-size decode at a time' }
]);
console.log(`pipeline / bare = ${ratio.toFixed(2)} (target ≤ 1.3: ${ratio <= 1.3 ? 'held' : 'NOT held'}); peak RSS ${Math.max(pipeRss, conc.peakRssMb).toFixed(0)} MB (target ≤ 350: ${Math.max(pipeRss, conc.peakRssMb) <= 350 ? 'held' : 'NOT held'})`);
console.log(`load average after: ${os.loadavg().map((n) => n.toFixed(2)).join(', ')}`);
