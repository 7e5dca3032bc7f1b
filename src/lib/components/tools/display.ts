/**
 * Display strings for bench-tool results. SI units (W, V, A, F, Ω, Hz, J, s) use the engineering
 * library's formatValue (3 significant figures, engineering prefix); °C, K/W, dB and ratios are shown
 * as plain numbers. Display only: no engineering result is computed here.
 */
import { formatValue } from '$lib/engineering';

const PREFIXED = new Set(['W', 'V', 'A', 'F', 'ohm', 'Ω', 'H', 'Hz', 'J', 's', 'VA', 'Vpp', 'Vrms']);

/** A number to `digits` significant figures without trailing zeros noise: 130.04 → "130", 0.7182 → "0.718". */
export function sig(value: number, digits = 3): string {
	if (!Number.isFinite(value)) return '—';
	if (value === 0) return '0';
	return Number(value.toPrecision(digits)).toLocaleString('en-GB', { maximumSignificantDigits: digits, useGrouping: Math.abs(value) >= 1e4 });
}

/** A value with its unit: show(64, 'W') → "64 W"; show(4700, 'ohm') → "4.7 kΩ"; show(129.97, '°C') → "130 °C". */
export function show(value: number | undefined, unit: string, digits = 3): string {
	if (value === undefined || !Number.isFinite(value)) return '—';
	if (PREFIXED.has(unit)) {
		if (unit === 'Vpp' || unit === 'Vrms') return `${formatValue(value, 'V')} ${unit === 'Vpp' ? 'p-p' : 'rms'}`;
		return formatValue(value, unit === 'Ω' ? 'ohm' : unit);
	}
	if (unit === '°C') return `${Number(value.toFixed(1)).toLocaleString('en-GB')} °C`;
	return `${sig(value, digits)}${unit ? (unit === '%' ? ' %' : ` ${unit}`) : ''}`;
}

/** A 0–1 fraction as a percentage: pct(0.7182) → "71.8 %". */
export function pct(fraction: number | undefined): string {
	return fraction === undefined ? '—' : `${sig(fraction * 100, 3)} %`;
}

/**
 * A capacitance the way the trade writes reservoirs: show(0.01, 'F') is "10 mF", so values of 1 mF and more
 * also get their µF figure: showCapacitance(0.01) → "10 000 µF (10 mF)"; below 1 mF it is formatValue's.
 */
export function showCapacitance(valueF: number | undefined): string {
	if (valueF === undefined || !Number.isFinite(valueF)) return '—';
	const plain = formatValue(valueF, 'F');
	if (valueF < 1e-3) return plain;
	const uF = Number((valueF * 1e6).toPrecision(3));
	return `${uF.toLocaleString('en-GB').replace(/,/g, '\u202f')} µF (${plain})`;
}

/** A signed percentage with a real minus sign: signedPct(-6) → "−6 %", signedPct(2.2) → "+2.2 %". */
export function signedPct(value: number, digits = 3): string {
	if (!Number.isFinite(value)) return '—';
	if (value === 0) return '0 %';
	return `${value > 0 ? '+' : '\u2212'}${sig(Math.abs(value), digits)} %`;
}
