import { describe, expect, it } from 'vitest';
import { deriveSupply, supplySpec, type SupplySpec } from './supply';

/** 25-0-25 V into a bridge for ± rails, 10 000 µF, 3 A (REFERENCE.md §12 case 7). */
const base = (over: Record<string, unknown> = {}): SupplySpec =>
	supplySpec.parse({
		mainsVac: 230,
		mainsHz: 50,
		transformerVA: 300,
		secondaryVac: 25,
		rectifier: 'bridge-split',
		diodeDropV: 0.8,
		reservoirF: 0.01,
		capRatingV: 50,
		loadCurrentA: 3,
		fuse: { ratingA: 3.15, type: 'slow' },
		chassis: 'metal',
		protectiveEarth: true,
		doubleInsulated: false,
		bleeder: { ohm: 4700 },
		...over
	});
const ids = (d: SupplySpec) => deriveSupply(d).checks.map((c) => `${c.id}:${c.level}`);

describe('supply block — derived', () => {
	it('peakDcV 34.56 V, rippleVpp 3.00 V, high-mains rail 38.09 V (regulation 0), bench-tool names', () => {
		const { derived, checks } = deriveSupply(base());
		expect(derived.peakDcV).toBeCloseTo(34.56, 2);
		expect(derived.rippleVpp).toBeCloseTo(3, 9);
		expect(derived.averageDcV).toBeCloseTo(33.06, 2);
		expect(derived.highMainsPeakDcV).toBeCloseTo(25 * 1.1 * Math.SQRT2 - 0.8, 9);
		expect(derived.railCount).toBe(2);
		expect(derived.primaryCurrentA).toBeCloseTo(300 / 230, 9);
		expect(checks).toEqual([]);
	});
	it('with 7 % regulation the worst-case rail is 40.81 V and 50 V caps give 1.225× (REFERENCE.md §4.2, §4.6)', () => {
		const { derived, checks } = deriveSupply(base({ regulationPct: 7 }));
		expect(derived.highMainsPeakDcV).toBeCloseTo(40.81, 2);
		expect(derived.highMainsCapMarginRatio).toBeCloseTo(1.225, 3);
		expect(checks.map((c) => c.id)).not.toContain('supply.cap-rating');
	});
	it('bleeder time to 5 V and stored energy of both rails at the high-mains rail', () => {
		const { derived } = deriveSupply(base());
		const v = derived.highMainsPeakDcV;
		expect(derived.bleederTimeS!).toBeCloseTo(4700 * 0.01 * Math.log(v / 5), 9);
		expect(derived.bleederPowerW!).toBeCloseTo((v * v) / 4700, 9);
		expect(derived.storedEnergyJ).toBeCloseTo(2 * 0.5 * 0.01 * v * v, 9);
	});
});

describe('supply block — checks (API.md thresholds)', () => {
	it('supply.no-fuse: danger for a mains-powered supply with fuse null, with a defer-to-codes caution', () => {
		const c = deriveSupply(base({ fuse: null })).checks.find((x) => x.id === 'supply.no-fuse');
		expect(c?.level).toBe('danger');
		expect(c?.caution).toMatch(/licensed practice/);
		expect(ids(base({ fuse: null, mainsPowered: false }))).not.toContain('supply.no-fuse:danger');
		expect(ids(base({ fuse: { ratingA: 2, type: 'fast' } }))).toContain('supply.fuse-type:note');
	});
	it('supply.no-earth: danger only for metal, no protective earth, not double insulated', () => {
		expect(ids(base({ protectiveEarth: false }))).toContain('supply.no-earth:danger');
		expect(ids(base({ protectiveEarth: true }))).not.toContain('supply.no-earth:danger');
		expect(ids(base({ chassis: 'plastic', protectiveEarth: false }))).not.toContain('supply.no-earth:danger');
		const di = ids(base({ protectiveEarth: false, doubleInsulated: true }));
		expect(di).not.toContain('supply.no-earth:danger');
		expect(di).toContain('supply.double-insulated-metal:note');
	});
	it('supply.cap-rating: danger below the unloaded rail (34.56 V), caution below 1.2 × the +10 % mains rail', () => {
		const peak = deriveSupply(base()).derived.peakDcV;
		const high = deriveSupply(base()).derived.highMainsPeakDcV;
		expect(ids(base({ capRatingV: peak - 0.01 }))).toContain('supply.cap-rating:danger');
		expect(ids(base({ capRatingV: peak }))).toContain('supply.cap-rating:caution');
		expect(ids(base({ capRatingV: 1.2 * high - 0.01 }))).toContain('supply.cap-rating:caution');
		expect(ids(base({ capRatingV: 1.2 * high }))).not.toContain('supply.cap-rating:caution');
		expect(ids(base({ capRatingV: 35 }))).toEqual(['supply.cap-rating:caution']); // 35 V caps: REFERENCE.md §4.6 flag
	});
	it('supply.transformer-small: caution below 1.0 × the output it feeds, note below 1.5 × (common practice)', () => {
		expect(ids(base({ amplifierDemandW: 200, transformerVA: 300 }))).not.toContain('supply.transformer-small:note');
		expect(ids(base({ amplifierDemandW: 200, transformerVA: 299 }))).toContain('supply.transformer-small:note');
		expect(ids(base({ amplifierDemandW: 200, transformerVA: 200 }))).toContain('supply.transformer-small:note');
		expect(ids(base({ amplifierDemandW: 200, transformerVA: 199 }))).toContain('supply.transformer-small:caution');
		expect(ids(base({ transformerVA: 20 }))).not.toContain('supply.transformer-small:caution'); // no demand given
		expect(deriveSupply(base({ amplifierDemandW: 100 })).derived.vaHeadroomRatio).toBe(2);
	});
	it('supply.no-bleeder: note when there is none', () => {
		expect(ids(base({ bleeder: null }))).toContain('supply.no-bleeder:note');
		expect(ids(base({ bleeder: false }))).toContain('supply.no-bleeder:note');
		expect(ids(base({ bleeder: true }))).not.toContain('supply.no-bleeder:note');
	});
});

describe('supply block — schema', () => {
	it('defaults diodeDropV 0.7, regulation 0, mains +10 %, mains powered', () => {
		const { diodeDropV: _d, ...rest } = base();
		expect(supplySpec.parse(rest)).toMatchObject({ diodeDropV: 0.7, regulationPct: 0, mainsHighPct: 10, mainsPowered: true });
	});
	it('fuse must be given (null for none); wrong types are shape errors', () => {
		const { fuse: _f, ...noFuse } = base();
		expect(supplySpec.safeParse(noFuse).error!.issues[0]).toMatchObject({ path: ['fuse'], code: 'invalid_type' });
		expect(supplySpec.safeParse({ ...base(), protectiveEarth: 'yes' }).error!.issues[0].path).toEqual(['protectiveEarth']);
	});
	it('out-of-range mains frequency and a reservoir too small for the load are range errors', () => {
		expect(supplySpec.safeParse({ ...base(), mainsHz: 400 }).error!.issues[0]).toMatchObject({ code: 'too_big', path: ['mainsHz'] });
		expect(supplySpec.safeParse({ ...base(), reservoirF: 1e-5, loadCurrentA: 50 }).error!.issues[0]).toMatchObject({
			code: 'custom',
			path: ['reservoirF']
		});
	});
});
