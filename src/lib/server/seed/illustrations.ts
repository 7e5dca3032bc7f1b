// Illustrative images for the demo scenario, drawn here as SVG (no photos from elsewhere) and
// rendered to JPEG by sharp in the photo pipeline. Each motif is a simple bench-notebook sketch.
import { escapeUTF8 } from 'entities';

export type Motif = 'board' | 'heatsink' | 'transformer' | 'chassis' | 'scope' | 'crossover' | 'caps' | 'meter';

const PAPER = '#f4ecdc';
const INK = '#2b2722';
const COPPER = '#b0592b';
const GRID = '#d9ccb4';

function grid(w: number, h: number): string {
	let s = '';
	for (let x = 0; x <= w; x += 40) s += `<line x1="${x}" y1="0" x2="${x}" y2="${h}" stroke="${GRID}" stroke-width="1"/>`;
	for (let y = 0; y <= h; y += 40) s += `<line x1="0" y1="${y}" x2="${w}" y2="${y}" stroke="${GRID}" stroke-width="1"/>`;
	return s;
}

function body(motif: Motif, seed: number): string {
	const r = (n: number) => ((Math.sin(seed * 97.13 + n * 13.7) + 1) / 2);
	switch (motif) {
		case 'board': {
			let parts = `<rect x="140" y="140" width="920" height="520" rx="18" fill="#3f6b4a" stroke="${INK}" stroke-width="4"/>`;
			for (let i = 0; i < 14; i++) {
				const x = 190 + (i % 7) * 120;
				const y = 200 + Math.floor(i / 7) * 220;
				parts += `<rect x="${x}" y="${y}" width="70" height="${26 + r(i) * 30}" rx="6" fill="#d9c9a3" stroke="${INK}" stroke-width="3"/>`;
				parts += `<line x1="${x + 35}" y1="${y + 60}" x2="${x + 35}" y2="${y + 150}" stroke="${COPPER}" stroke-width="6"/>`;
			}
			parts += `<circle cx="900" cy="560" r="60" fill="#1f3550" stroke="${INK}" stroke-width="4"/><circle cx="760" cy="560" r="60" fill="#1f3550" stroke="${INK}" stroke-width="4"/>`;
			return parts;
		}
		case 'heatsink': {
			let fins = `<rect x="260" y="520" width="680" height="60" fill="#8d969e" stroke="${INK}" stroke-width="4"/>`;
			for (let i = 0; i < 12; i++) fins += `<rect x="${270 + i * 56}" y="180" width="26" height="340" fill="#a7b0b8" stroke="${INK}" stroke-width="3"/>`;
			fins += `<rect x="520" y="590" width="160" height="90" fill="#222" stroke="${INK}" stroke-width="3"/><rect x="540" y="600" width="120" height="14" fill="${COPPER}"/>`;
			for (let i = 0; i < 5; i++) fins += `<line x1="${548 + i * 26}" y1="680" x2="${548 + i * 26}" y2="740" stroke="#c8c8c8" stroke-width="6"/>`;
			return fins;
		}
		case 'transformer':
			return `<circle cx="600" cy="400" r="230" fill="#556270" stroke="${INK}" stroke-width="5"/><circle cx="600" cy="400" r="90" fill="${PAPER}" stroke="${INK}" stroke-width="5"/>
				<path d="M380 400 Q600 150 820 400" stroke="${COPPER}" stroke-width="10" fill="none"/><path d="M380 400 Q600 650 820 400" stroke="${COPPER}" stroke-width="10" fill="none"/>
				<line x1="830" y1="360" x2="1050" y2="300" stroke="#c0392b" stroke-width="8"/><line x1="830" y1="440" x2="1050" y2="500" stroke="#2c3e50" stroke-width="8"/>`;
		case 'chassis':
			return `<rect x="120" y="240" width="960" height="360" fill="#b9bec4" stroke="${INK}" stroke-width="5"/><rect x="150" y="270" width="900" height="300" fill="#9aa1a8"/>
				<circle cx="300" cy="420" r="44" fill="#333"/><circle cx="460" cy="420" r="30" fill="#ddd" stroke="${INK}" stroke-width="3"/>
				<rect x="880" y="380" width="120" height="80" fill="#222"/><path d="M940 470 v70 m-20 0 h40 m-30 14 h20" stroke="#2f6b4f" stroke-width="6" fill="none"/>`;
		case 'scope': {
			let trace = '';
			for (let x = 0; x <= 760; x += 8) trace += `${x === 0 ? 'M' : 'L'}${220 + x} ${400 + Math.sin(x / (40 + r(1) * 30)) * (120 + r(2) * 40)} `;
			return `<rect x="180" y="180" width="840" height="440" rx="16" fill="#14261c" stroke="${INK}" stroke-width="5"/>
				<path d="${trace}" stroke="#7fe0a0" stroke-width="5" fill="none"/><line x1="180" y1="400" x2="1020" y2="400" stroke="#2e5a40" stroke-width="2"/>`;
		}
		case 'crossover':
			return `<rect x="160" y="200" width="880" height="400" rx="10" fill="#e2d3b5" stroke="${INK}" stroke-width="4"/>
				<circle cx="330" cy="400" r="110" fill="none" stroke="${COPPER}" stroke-width="26"/><circle cx="330" cy="400" r="60" fill="none" stroke="${COPPER}" stroke-width="22"/>
				<rect x="540" y="300" width="200" height="70" rx="30" fill="#d35400" stroke="${INK}" stroke-width="3"/><rect x="540" y="420" width="200" height="70" rx="30" fill="#d35400" stroke="${INK}" stroke-width="3"/>
				<rect x="800" y="330" width="170" height="46" fill="#f7f2e8" stroke="${INK}" stroke-width="3"/>`;
		case 'caps': {
			let c = '';
			for (let i = 0; i < 4; i++) c += `<rect x="${220 + i * 200}" y="220" width="150" height="320" rx="20" fill="#1f3550" stroke="${INK}" stroke-width="4"/><rect x="${220 + i * 200}" y="220" width="30" height="320" fill="#6d86a8"/>`;
			c += `<rect x="180" y="560" width="840" height="50" fill="${COPPER}" stroke="${INK}" stroke-width="3"/>`;
			return c;
		}
		case 'meter':
			return `<rect x="300" y="150" width="600" height="520" rx="40" fill="#e0b12f" stroke="${INK}" stroke-width="5"/><rect x="370" y="210" width="460" height="150" fill="#c9d6c3" stroke="${INK}" stroke-width="4"/>
				<text x="600" y="320" font-family="monospace" font-size="96" text-anchor="middle" fill="${INK}">${(r(3) * 40).toFixed(2)}</text>
				<circle cx="600" cy="520" r="90" fill="#333"/><line x1="600" y1="520" x2="${600 + 70 * Math.cos(r(4) * 6)}" y2="${520 + 70 * Math.sin(r(4) * 6)}" stroke="#eee" stroke-width="10"/>`;
	}
}

/** An SVG sketch for a demo step: the motif on squared paper, with a caption band unless caption is ''. 1200 × 800. */
export function illustrationSvg(motif: Motif, caption: string, seed = 1): string {
	const w = 1200;
	const h = 800;
	const esc = escapeUTF8(caption);
	return `<svg xmlns="http://www.w3.org/2000/svg" width="${w}" height="${h}" viewBox="0 0 ${w} ${h}">
		<rect width="${w}" height="${h}" fill="${PAPER}"/>${grid(w, h)}${body(motif, seed)}
		${esc ? `<rect x="0" y="${h - 70}" width="${w}" height="70" fill="${INK}" opacity="0.85"/><text x="30" y="${h - 26}" font-family="sans-serif" font-size="30" fill="${PAPER}">${esc}</text>` : ''}
	</svg>`;
}
