import { describe, expect, it } from 'vitest';
import * as engineering from './index';

describe('engineering public surface', () => {
	it('exports the names other modules code against', () => {
		const fns = [
			'parseValue', 'decodeMarking', 'formatValue', 'eSeriesMantissas', 'nearestESeries', 'bandsFromValue', 'valueFromBands',
			'networkValue', 'seriesValue', 'parallelValue', 'amplifierOutput', 'worstCaseDissipationW', 'nonInvertingGain',
			'rcCornerHz', 'cascadeHighPassHz', 'zobel', 'heatsink', 'junctionTempC', 'supplyRails', 'reservoirForRippleF',
			'capMarginRatio', 'supplyWorstCase', 'stageWorstCase', 'parseQuantity', 'transformerVaNeeded', 'bleederTimeS', 'bleederPowerW', 'storedEnergyJ',
			'primaryCurrentA', 'parallelLoadOhm', 'dampingFactor', 'dbV', 'dbu', 'dbW', 'vFromDbV', 'vFromDbu', 'thdPct', 'snrDb'
		] as const;
		for (const name of fns) expect(typeof (engineering as Record<string, unknown>)[name], name).toBe('function');
		expect(engineering.E_SERIES).toContain('E192');
		expect(Object.keys(engineering.CASE_TO_SINK_KPERW)).toContain('mica-grease');
		expect(new engineering.InputRangeError('x', 'y')).toBeInstanceOf(RangeError);
	});
	it('the same computation through the index gives the same answer (64 W worked example)', () => {
		expect(engineering.amplifierOutput({ supply: 'split', railV: 35, loadOhm: 8, dropoutV: 3 }).maxPowerW).toBe(64);
	});
});
