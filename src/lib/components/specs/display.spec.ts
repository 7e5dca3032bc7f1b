import { describe, expect, it } from 'vitest';
import { hasPlots } from './display';

// hasPlots decides whether the build page loads the line-plot component; SpecBlockView draws plots under
// the same test, so a page that skips the component must have nothing to draw.
describe('hasPlots', () => {
	it('is true only for a measurements block with response or THD points', () => {
		const response = { kind: 'measurements', data: { points: { response: [{ freqHz: 1000, db: 0 }] } } };
		const thd = { kind: 'measurements', data: { points: { thd: [{ powerW: 1, thdPct: 0.01 }] } } };
		expect(hasPlots([response])).toBe(true);
		expect(hasPlots([thd])).toBe(true);
		expect(hasPlots([{ kind: 'amplifier', data: { channels: 2 } }, thd])).toBe(true);
	});
	it('is false without points to draw', () => {
		expect(hasPlots([])).toBe(false);
		expect(hasPlots([{ kind: 'measurements', data: { dcOffsetMv: [6, -9] } }])).toBe(false);
		expect(hasPlots([{ kind: 'measurements', data: { points: { response: [], thd: [] } } }])).toBe(false);
		expect(hasPlots([{ kind: 'measurements', data: null }])).toBe(false);
		// Points on another kind are not drawn by the view.
		expect(hasPlots([{ kind: 'supply', data: { points: { thd: [{ powerW: 1, thdPct: 1 }] } } }])).toBe(false);
	});
});
