/**
 * Scale and tick helpers for the bench tools' SVG plots. Pure functions, so the same axes come out on
 * the server and in the browser. Nice domains and linear ticks are d3-array's (the algorithm d3-scale's
 * linear scale uses); the maps themselves are the straight lines d3-scale draws (linear, or linear in
 * log10 on a log axis). d3-scale itself is not shipped: its scales bring d3-interpolate, d3-color and
 * d3-format (about 8 KB gzip) for colour interpolation and tick formats these plots never use;
 * scales.spec.ts checks these maps against d3-scale.
 */
import { nice, ticks } from 'd3-array';

export type PlotPoint = { x: number; y: number };
export type Tick = { value: number; label: string };
export type AxisScale = ((v: number) => number) & { domain(): number[]; ticks?(count: number): number[] };

const SI_PREFIXES: [number, string][] = [
	[1e12, 'T'],
	[1e9, 'G'],
	[1e6, 'M'],
	[1e3, 'k'],
	[1, ''],
	[1e-3, 'm'],
	[1e-6, 'µ'],
	[1e-9, 'n'],
	[1e-12, 'p']
];

/** Keeps the points a scale can draw: finite, and positive on a log axis. */
export function drawable(points: PlotPoint[], xLog = false, yLog = false): PlotPoint[] {
	return points.filter(
		(p) => Number.isFinite(p.x) && Number.isFinite(p.y) && (!xLog || p.x > 0) && (!yLog || p.y > 0)
	);
}

/**
 * The [min, max] a plot axis should cover. Empty input gives [0, 1] (or [1, 10] on a log axis);
 * a single value is widened so the axis never collapses. Linear domains are padded by `padFraction`
 * of the span on each side, never below 0 when all values are ≥ 0. [2, 8] → [2, 8] with no padding.
 */
export function axisDomain(values: number[], log = false, padFraction = 0): [number, number] {
	const usable = values.filter((v) => Number.isFinite(v) && (!log || v > 0));
	if (usable.length === 0) return log ? [1, 10] : [0, 1];
	let lo = Math.min(...usable);
	let hi = Math.max(...usable);
	if (log) {
		if (lo === hi) return [lo / Math.SQRT2 / Math.SQRT2, hi * 2];
		return [lo, hi];
	}
	if (lo === hi) {
		const widen = lo === 0 ? 1 : Math.abs(lo) * 0.1;
		return [lo - widen, hi + widen];
	}
	const pad = (hi - lo) * padFraction;
	// Padding never pushes an all-positive axis below zero (a power or a temperature axis starts at 0, not −50).
	lo = lo >= 0 && lo - pad < 0 ? 0 : lo - pad;
	hi += pad;
	return [lo, hi];
}

/** A scale (linear or log) from a domain to a pixel range; linear domains are rounded out to nice ticks (d3-array's nice). */
export function makeScale(domain: [number, number], range: [number, number], log = false): AxisScale {
	const [r0, r1] = range;
	// As d3-interpolate's interpolateNumber: the same floating-point steps as d3-scale.
	const between = (t: number) => r0 * (1 - t) + r1 * t;
	// A zero-width domain maps to the middle of the range, as in d3-scale.
	const part = (v: number, a: number, b: number) => (b === a ? 0.5 : (v - a) / (b - a));
	if (log) {
		const [l0, l1] = [Math.log(domain[0]), Math.log(domain[1])];
		return Object.assign((v: number) => between(part(Math.log(v), l0, l1)), { domain: () => [...domain] });
	}
	const [d0, d1] = nice(domain[0], domain[1], 6);
	return Object.assign((v: number) => between(part(v, d0, d1)), {
		domain: () => [d0, d1],
		ticks: (count: number) => ticks(d0, d1, count)
	});
}

/**
 * A compact label for an axis value with SI prefixes for very large or very small numbers:
 * 4700 → "4700", 47000 → "47k", 0.0047 → "4.7m", 2.5 → "2.5", 0 → "0".
 */
export function formatTick(value: number): string {
	if (value === 0) return '0';
	const abs = Math.abs(value);
	if (abs >= 0.01 && abs < 1e4) return trim(value);
	for (const [factor, prefix] of SI_PREFIXES) {
		if (abs >= factor * 0.9995) return `${trim(value / factor)}${prefix}`;
	}
	return value.toExponential(1);
}

function trim(v: number): string {
	return String(Number(v.toPrecision(3)));
}

/**
 * Tick marks for an axis. Linear: d3's nice ticks (about `count` of them).
 * Log: the decades (1, 10, 100 …); when the domain spans less than two decades, also the 2 and 5 of each decade.
 */
export function axisTicks(scale: AxisScale, log: boolean, count = 6): Tick[] {
	const [a, b] = scale.domain();
	const lo = Math.min(a, b);
	const hi = Math.max(a, b);
	let values: number[];
	if (log) {
		const first = Math.floor(Math.log10(lo));
		const last = Math.ceil(Math.log10(hi));
		const mantissas = last - first <= 2 ? [1, 2, 5] : [1];
		values = [];
		for (let e = first; e <= last; e++) {
			for (const m of mantissas) {
				const v = Number((m * 10 ** e).toPrecision(12));
				if (v >= lo * (1 - 1e-9) && v <= hi * (1 + 1e-9)) values.push(v);
			}
		}
	} else {
		values = scale.ticks?.(count) ?? [];
	}
	return values.map((value) => ({ value, label: formatTick(value) }));
}
