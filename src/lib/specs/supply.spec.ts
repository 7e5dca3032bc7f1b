import { describe, expect, it } from 'vitest';
import { deriveSupply, supplySpec, type SupplySpec } from './supply';
import { supplyBlock } from './fixtures';

// Expected values: REFERENCE.md §4.1–4.8 and §12 case 7 (25-0-25 V, bridge for ± rails, 0.8 V diodes, 7 % regulation,
// +10 % mains, 3 A, 10 000 µF, 50 Hz: 34.56 V, 40.81 V worst case, 3.00 Vpp), worked again by hand in each test.
const base = (over: Record<string, unknown> = {}): SupplySpec => supplySpec.parse(supplyBlock(over));
const ids = (d: SupplySpec) => deriveSupply(d).checks.map((c) => `${c.id}:${c.level}`);
const crest = 25 * Math.SQRT2; // 35.355 V

describe('supply block — derived (API.md revision 2)', () => {
	it('peakDcV 34.56 V and averageDcV 33.06 V as the bench tool; off load 37.03 V; +10 % mains 40.81 V; ±81.62 V rail to rail', () => {
		const { derived, checks } = deriveSupply(base());
		expect(Math.abs(derived.peakDcV - 34.56)).toBeLessThan(0.01); // 35.355 − 0.8
		expect(derived.rippleVpp).toBeCloseTo(3.0, 9); // 3 A / (2 · 50 Hz · 0.01 F)
		expect(Math.abs(derived.averageDcV - 33.06)).toBeLessThan(0.01); // 34.555 − 1.5
		expect(Math.abs(derived.offLoadPeakDcV - 37.03)).toBeLessThan(0.01); // 35.355 · 1.07 − 0.8
		expect(Math.abs(derived.highMainsPeakDcV - 40.81)).toBeLessThan(0.01); // 35.355 · 1.07 · 1.1 − 0.8
		expect(Math.abs(derived.lowMainsAverageDcV - 29.52)).toBeLessThan(0.01); // 35.355 · 0.9 − 0.8 − 1.5
		expect(Math.abs(derived.highMainsTotalDcV - 81.62)).toBeLessThan(0.02);
		expect(derived.primaryCurrentA).toBeCloseTo(300 / 230, 12);
		expect(checks).toEqual([]);
	});
	it('averageDcV is the bench tool’s loaded rail whatever the regulation (one meaning)', () => {
		expect(deriveSupply(base({ regulationPct: 20 })).derived.averageDcV).toBeCloseTo(deriveSupply(base({ regulationPct: 0 })).derived.averageDcV, 12);
	});
	it('no regulation given: 10 % assumed with the note supply.regulation-assumed (41.98 V at +10 % mains)', () => {
		const r = deriveSupply(base({ regulationPct: undefined }));
		expect(r.checks.map((c) => `${c.id}:${c.level}`)).toContain('supply.regulation-assumed:note');
		expect(Math.abs(r.derived.highMainsPeakDcV - 41.98)).toBeLessThan(0.01); // 35.355 · 1.1 · 1.1 − 0.8
		expect(ids(base({ regulationPct: 0 }))).not.toContain('supply.regulation-assumed:note');
	});
	it('one rail from a bridge: two drops, total = the rail; half wave ripples at mains frequency', () => {
		const b = deriveSupply(base({ rectifier: 'bridge' })).derived;
		expect(b.peakDcV).toBeCloseTo(crest - 1.6, 9);
		expect(b.highMainsTotalDcV).toBeCloseTo(b.highMainsPeakDcV, 12);
		expect(deriveSupply(base({ rectifier: 'half-wave' })).derived.rippleVpp).toBeCloseTo(6, 9); // 3 A / (50 Hz · 0.01 F)
	});
	it('bleeder time to 5 V and stored energy of both rails at the high-mains rail [REF §4.8: 4.7 kΩ, 10 mF, 50 V → 5 V = 108.2 s]', () => {
		const at50 = deriveSupply(base({ secondaryVac: (50 + 0.8) / Math.SQRT2, regulationPct: 0, mainsHighPct: 0 })).derived;
		expect(Math.abs(at50.bleederTimeS! - 108.2)).toBeLessThan(0.1);
		expect(Math.abs(at50.bleederPowerW! - 0.532)).toBeLessThan(0.001);
		expect(at50.storedEnergyJ).toBeCloseTo(2 * 12.5, 6); // two rails × ½ · 0.01 F · (50 V)²
	});
});

describe('supply block — checks at their thresholds', () => {
	it('supply.cap-rating against the 40.81 V high-mains rail: danger below it, caution below 1.2 × = 48.97 V [REF §4.6]', () => {
		expect(ids(base({ capRatingV: 40.8 }))).toContain('supply.cap-rating:danger');
		expect(ids(base({ capRatingV: 40.82 }))).toContain('supply.cap-rating:caution');
		expect(ids(base({ capRatingV: 48.96 }))).toContain('supply.cap-rating:caution');
		expect(ids(base({ capRatingV: 48.98 })).filter((i) => i.startsWith('supply.cap'))).toEqual([]);
		expect(ids(base({ capRatingV: 35 }))).toContain('supply.cap-rating:danger'); // REF §4.6: 35 V caps are over-voltage
		expect(ids(base({ capRatingV: 50 })).filter((i) => i.startsWith('supply.cap'))).toEqual([]); // REF §4.6: 1.23 ×
	});
	it('supply.no-fuse: danger for a mains-powered supply with fuse null, with a defer-to-codes caution', () => {
		const c = deriveSupply(base({ fuse: null })).checks.find((x) => x.id === 'supply.no-fuse');
		expect(c?.level).toBe('danger');
		expect(c?.caution).toMatch(/licensed practice/);
		expect(ids(base({ fuse: null, mainsPowered: false }))).not.toContain('supply.no-fuse:danger');
	});
	it('supply.fuse-size: caution above 3 × the 1.304 A primary current (3.913 A) and below it [REF §4.7]', () => {
		const fuse = (ratingA: number) => ids(base({ fuse: { ratingA, type: 'slow' } }));
		expect(fuse(3.9)).not.toContain('supply.fuse-size:caution');
		expect(fuse(3.92)).toContain('supply.fuse-size:caution');
		expect(fuse(5)).toContain('supply.fuse-size:caution'); // the issue's 5 A fuse on a small transformer
		expect(fuse(1.31)).not.toContain('supply.fuse-size:caution');
		expect(fuse(1.3)).toContain('supply.fuse-size:caution');
		// REF §4.7 worked example: 160 VA at 230 V → 0.70 A, T1.6–T2 A is in range; a 5 A fuse on 50 VA is not (issue 10)
		expect(ids(base({ transformerVA: 160, fuse: { ratingA: 2, type: 'slow' } }))).not.toContain('supply.fuse-size:caution');
		expect(ids(base({ transformerVA: 50, fuse: { ratingA: 5, type: 'slow' } }))).toContain('supply.fuse-size:caution');
	});
	it('supply.fuse-type: note for a fast fuse from 100 VA, silent at 99 VA', () => {
		expect(ids(base({ transformerVA: 100, fuse: { ratingA: 1, type: 'fast' } }))).toContain('supply.fuse-type:note');
		expect(ids(base({ transformerVA: 99, fuse: { ratingA: 1, type: 'fast' } }))).not.toContain('supply.fuse-type:note');
	});
	it('supply.no-earth: danger only for metal, no protective earth, not double insulated', () => {
		expect(ids(base({ protectiveEarth: false }))).toContain('supply.no-earth:danger');
		expect(ids(base({ chassis: 'plastic', protectiveEarth: false }))).not.toContain('supply.no-earth:danger');
		const di = ids(base({ protectiveEarth: false, doubleInsulated: true }));
		expect(di).not.toContain('supply.no-earth:danger');
		expect(di).toContain('supply.double-insulated-metal:note');
	});
	it('supply.no-enclosure: danger for a mains supply with no chassis, nothing when not mains powered', () => {
		expect(ids(base({ chassis: 'none' }))).toContain('supply.no-enclosure:danger');
		expect(ids(base({ chassis: 'none', mainsPowered: false }))).not.toContain('supply.no-enclosure:danger');
	});
	it('supply.insulation: caution for plastic or wood with neither earth nor double insulation', () => {
		expect(ids(base({ chassis: 'plastic', protectiveEarth: false }))).toContain('supply.insulation:caution');
		expect(ids(base({ chassis: 'wood', protectiveEarth: false }))).toContain('supply.insulation:caution');
		expect(ids(base({ chassis: 'wood', protectiveEarth: true }))).not.toContain('supply.insulation:caution');
		expect(ids(base({ chassis: 'plastic', protectiveEarth: false, doubleInsulated: true }))).not.toContain('supply.insulation:caution');
		expect(ids(base({ chassis: 'plastic', protectiveEarth: false, mainsPowered: false }))).not.toContain('supply.insulation:caution');
	});
	it('supply.no-bleeder at the IEC 62368-1 ES1/ES2 DC limits (60 V, 120 V) of the rail-to-rail voltage', () => {
		// One rail from a bridge with no drops, regulation or mains allowance: total = √2 · Vac (hand).
		const bare = (vac: number, bleeder: unknown = null) =>
			ids(base({ rectifier: 'bridge', diodeDropV: 0, regulationPct: 0, mainsHighPct: 0, secondaryVac: vac, bleeder, capRatingV: 250 }));
		expect(bare(42.42)).toContain('supply.no-bleeder:note'); // 59.99 V
		expect(bare(42.44)).toContain('supply.no-bleeder:caution'); // 60.02 V
		expect(bare(84.84)).toContain('supply.no-bleeder:caution'); // 119.98 V
		expect(bare(84.86)).toContain('supply.no-bleeder:danger'); // 120.01 V
		expect(bare(84.86, false)).toContain('supply.no-bleeder:danger');
		expect(bare(84.86, true).filter((i) => i.startsWith('supply.no-bleeder'))).toEqual([]);
		// ±40 V class supply of the issue: 81.6 V rail to rail with no bleeder is a caution, not a note
		expect(ids(base({ bleeder: null }))).toContain('supply.no-bleeder:caution');
	});
	it('supply.soft-start: note above 300 VA without a soft-start (amplifier-project supply article, REFERENCE.md §4.7)', () => {
		expect(ids(base({ transformerVA: 300 }))).not.toContain('supply.soft-start:note');
		expect(ids(base({ transformerVA: 301, fuse: { ratingA: 3.15, type: 'slow' } }))).toContain('supply.soft-start:note');
		expect(ids(base({ transformerVA: 301, softStart: true }))).not.toContain('supply.soft-start:note');
	});
	it('supply.transformer-small: caution below 1.0 × the output it feeds, note below 1.5 × (common practice)', () => {
		expect(ids(base({ amplifierDemandW: 200, transformerVA: 300 }))).not.toContain('supply.transformer-small:note');
		expect(ids(base({ amplifierDemandW: 200, transformerVA: 299 }))).toContain('supply.transformer-small:note');
		expect(ids(base({ amplifierDemandW: 200, transformerVA: 200 }))).toContain('supply.transformer-small:note');
		expect(ids(base({ amplifierDemandW: 200, transformerVA: 199, fuse: { ratingA: 2, type: 'slow' } }))).toContain('supply.transformer-small:caution');
	});
});

describe('supply block — under load (capacitor-input rectifier currents)', () => {
	// Transformer makers' rectifier tables: full-wave bridge, capacitor input → secondary AC current ≈ 1.8 × DC load
	// current (from memory). Fixture: 300 VA over 25-0-25 V → 300 / (2 · 25) = 6 A per half (hand).
	it('3 A per rail: 5.4 A RMS per half-winding against 6 A from the VA, ripple current 3·√(1.8² − 1) = 4.49 A', () => {
		const { derived, checks } = deriveSupply(base());
		expect(derived.secondaryRmsA).toBeCloseTo(5.4, 9);
		expect(derived.windingRatedA).toBeCloseTo(6, 9);
		expect(Math.abs(derived.rippleCurrentA - 4.49)).toBeLessThan(0.005);
		expect(checks).toEqual([]);
	});
	it('supply.winding-current: caution above the rating (6 A ↔ 3.333 A DC per rail), silent at 3.333 A', () => {
		// 6 A / 1.8 = 3.3333 A DC per rail is the threshold (hand).
		expect(ids(base({ loadCurrentA: 3.333 }))).not.toContain('supply.winding-current:caution');
		expect(ids(base({ loadCurrentA: 3.334 }))).toContain('supply.winding-current:caution');
		// A stated winding rating replaces the VA estimate: 4 A → threshold 2.222 A.
		expect(ids(base({ secondaryRatedA: 4, loadCurrentA: 2.222 }))).not.toContain('supply.winding-current:caution');
		const c = deriveSupply(base({ secondaryRatedA: 4, loadCurrentA: 2.223 })).checks.find((x) => x.id === 'supply.winding-current');
		expect(c?.level).toBe('caution');
		expect(c?.caution).toMatch(/licensed practice/);
		// A single winding into a bridge: 160 VA / 25 V = 6.4 A → threshold 3.556 A.
		expect(ids(base({ rectifier: 'bridge', transformerVA: 160, fuse: { ratingA: 1.6, type: 'slow' }, loadCurrentA: 3.555 }))).not.toContain('supply.winding-current:caution');
		expect(ids(base({ rectifier: 'bridge', transformerVA: 160, fuse: { ratingA: 1.6, type: 'slow' }, loadCurrentA: 3.556 }))).toContain('supply.winding-current:caution');
	});
	it('supply.ripple-current: caution above the reservoir’s stated ripple rating (4.49 A at 3 A), nothing when not stated', () => {
		const rms = 3 * Math.sqrt(1.8 * 1.8 - 1); // 4.4900 A
		expect(ids(base({ capRippleRatingA: rms + 0.001 }))).not.toContain('supply.ripple-current:caution');
		expect(ids(base({ capRippleRatingA: rms - 0.001 }))).toContain('supply.ripple-current:caution');
		expect(ids(base({ capRippleRatingA: null }))).not.toContain('supply.ripple-current:caution');
	});
});

describe('supply block — schema', () => {
	it('defaults: diode 0.7 V, mains ±10 %, mains powered; regulation stays absent (assumed at derive time)', () => {
		const { diodeDropV: _d, regulationPct: _r, ...rest } = supplyBlock();
		const parsed = supplySpec.parse(rest);
		expect(parsed).toMatchObject({ diodeDropV: 0.7, mainsHighPct: 10, mainsLowPct: 10, mainsPowered: true });
		expect(parsed.regulationPct).toBeUndefined();
	});
	it('fuse must be given (null for none); wrong types are shape errors', () => {
		const { fuse: _f, ...noFuse } = supplyBlock();
		expect(supplySpec.safeParse(noFuse).error!.issues[0]).toMatchObject({ path: ['fuse'], code: 'invalid_type' });
		expect(supplySpec.safeParse(supplyBlock({ protectiveEarth: 'yes' })).error!.issues[0].path).toEqual(['protectiveEarth']);
	});
	it('out-of-range mains frequency and a reservoir too small for the load are range errors', () => {
		expect(supplySpec.safeParse(supplyBlock({ mainsHz: 400 })).error!.issues[0]).toMatchObject({ code: 'too_big', path: ['mainsHz'] });
		expect(supplySpec.safeParse(supplyBlock({ reservoirF: 1e-5, loadCurrentA: 50 })).error!.issues[0]).toMatchObject({ code: 'custom', path: ['reservoirF'] });
	});
});
