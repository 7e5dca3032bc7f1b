import { describe, expect, it } from 'vitest';
import {
	dbV,
	dbW,
	dbm,
	dbu,
	idleCurrentA,
	pctToDb,
	powerRatioDb,
	responseCornersHz,
	sinePowerW,
	snrDb,
	thdPct,
	vFromDbV,
	vFromDbu,
	voltageRatioDb,
	vrmsForPowerW,
	wFromDbW,
	wFromDbm
} from './measure';

describe('levels (dB references: 1 V, √0.6 V, 1 W, 1 mW — decibel glossaries cited in REFERENCE.md §1.4)', () => {
	// mathjs has no dB unit (REFERENCE.md §10), so these are checked against the published figures.
	it('22.63 V rms → 27.09 dBV, 29.31 dBu; 64 W → 18.06 dBW (±0.01 dB, REFERENCE.md §12 case 1)', () => {
		expect(Math.abs(dbV(22.63) - 27.09)).toBeLessThan(0.01);
		expect(Math.abs(dbu(22.63) - 29.31)).toBeLessThan(0.01);
		expect(Math.abs(dbW(64) - 18.06)).toBeLessThan(0.01);
	});
	it('dBu = dBV + 2.2185; +4 dBu = 1.228 V; −10 dBV = 0.3162 V; 1 W = 30 dBm', () => {
		expect(dbu(1) - dbV(1)).toBeCloseTo(2.2185, 4);
		expect(vFromDbu(4)).toBeCloseTo(1.228, 3);
		expect(vFromDbV(-10)).toBeCloseTo(0.3162, 4);
		expect(dbm(1)).toBeCloseTo(30, 12);
		expect(wFromDbm(30)).toBeCloseTo(1, 12);
	});
	it('doubling power = +3.010 dB; doubling voltage = +6.021 dB', () => {
		expect(powerRatioDb(2, 1)).toBeCloseTo(3.0103, 4);
		expect(voltageRatioDb(2, 1)).toBeCloseTo(6.0206, 4);
	});
	it('property: dB conversions invert each other', () => {
		for (let i = 0; i < 300; i++) {
			const v = 10 ** (Math.random() * 8 - 6);
			expect(vFromDbV(dbV(v)) / v).toBeCloseTo(1, 12);
			expect(vFromDbu(dbu(v)) / v).toBeCloseTo(1, 12);
			expect(wFromDbW(dbW(v)) / v).toBeCloseTo(1, 12);
		}
	});
	it('sine power and voltage: 22.63 V rms into 8 Ω ≈ 64 W; 100 W into 8 Ω → 28.28 V', () => {
		expect(sinePowerW(22.63, 8)).toBeCloseTo(64.01, 2);
		expect(vrmsForPowerW(100, 8)).toBeCloseTo(28.28, 2);
	});
});

describe('measurement figures (REFERENCE.md §9, §12 case 12; standard definitions)', () => {
	it('THD of 1 mV + 0.5 mV on 1 V → 0.1118 % = −59.03 dB', () => {
		const r = thdPct([1e-3, 0.5e-3], 1);
		expect(Math.abs(r.thdPct - 0.1118)).toBeLessThan(0.0001);
		expect(Math.abs(r.thdDb - -59.03)).toBeLessThan(0.01);
		expect(pctToDb(0.1)).toBeCloseTo(-60, 12);
	});
	it('SNR of 100 µV noise: 109.03 dB re 100 W/8 Ω, 89.03 dB re 1 W/8 Ω', () => {
		expect(Math.abs(snrDb(vrmsForPowerW(100, 8), 100e-6) - 109.03)).toBeLessThan(0.01);
		expect(Math.abs(snrDb(vrmsForPowerW(1, 8), 100e-6) - 89.03)).toBeLessThan(0.01);
	});
	it('idle current: 11 mV across 0.22 Ω → 50.0 mA', () => {
		expect(idleCurrentA(0.011, 0.22)).toBeCloseTo(0.05, 12);
	});
	it('−3 dB points relative to 1 kHz, interpolated in log frequency', () => {
		const r = responseCornersHz([
			{ freqHz: 10, db: -6 },
			{ freqHz: 20, db: -3 },
			{ freqHz: 1000, db: 0 },
			{ freqHz: 20000, db: -1 },
			{ freqHz: 80000, db: -5 }
		]);
		expect(r.refDb).toBe(0);
		expect(r.lowHz).toBeCloseTo(20, 9);
		expect(r.highHz).toBeCloseTo(40000, 6); // halfway between −1 and −5 dB in log f: √(20k·80k)
		expect(responseCornersHz([{ freqHz: 100, db: 0 }, { freqHz: 1000, db: 0 }]).lowHz).toBeNull();
	});
	it('throws RangeError for impossible input', () => {
		expect(() => thdPct([], 1)).toThrow(RangeError);
		expect(() => thdPct([1e-3], 0)).toThrow(RangeError);
		expect(() => snrDb(1, 0)).toThrow(RangeError);
		expect(() => dbV(-1)).toThrow(RangeError);
	});
});
