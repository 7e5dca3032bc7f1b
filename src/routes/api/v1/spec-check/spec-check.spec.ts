import { describe, expect, it } from 'vitest';
import { POST, fallback } from './+server';
import * as build from './build/+server';
import { amplifierBlock, supplyBlock, thermalBlock } from '$lib/specs/fixtures';

type Handler = (event: never) => Response | Promise<Response>;
async function call(handler: Handler, init: RequestInit): Promise<{ status: number; body: any }> {
	const url = new URL('http://localhost/api/v1/spec-check');
	const request = new Request(url, init);
	const res = await handler({ request, url } as never);
	return { status: res.status, body: await res.json() };
}
const postTo = (handler: unknown, body: unknown) =>
	call(handler as Handler, { method: 'POST', headers: { 'content-type': 'application/json' }, body: typeof body === 'string' ? body : JSON.stringify(body) });
const post = (body: unknown) =>
	call(POST as Handler, { method: 'POST', headers: { 'content-type': 'application/json' }, body: typeof body === 'string' ? body : JSON.stringify(body) });
const paths = (body: any) => body.error.issues.map((i: { path: string }) => i.path);

const amplifier = amplifierBlock({ device: { maxSupplyV: 84, dropoutV: 3, junctionMaxC: 150, rthJcKPerW: 1, minLoadOhm: 4 }, claimed: { powerW: 80, thdPct: 1 } }) as Record<string, any>;
const supply = supplyBlock({ fuse: null });

describe('POST /api/v1/spec-check', () => {
	it('200 { derived, checks } for an amplifier block: claimed 80 W vs 64 W fires amp.power-beyond-rails', async () => {
		const r = await post({ kind: 'amplifier', data: amplifier });
		expect(r.status).toBe(200);
		expect(Object.keys(r.body).sort()).toEqual(['checks', 'derived']);
		expect(r.body.derived.maxPowerW).toBeCloseTo(64, 9);
		expect(r.body.checks).toEqual([
			expect.objectContaining({ id: 'amp.power-beyond-rails', level: 'caution', message: expect.any(String), values: expect.any(Object) })
		]);
	});
	it('a mains supply without a fuse fires supply.no-fuse (danger) with a defer-to-codes caution; unknown fields ignored', async () => {
		const r = await post({ kind: 'supply', data: { ...supply, paint: 'black' }, extra: true });
		expect(r.status).toBe(200);
		const c = r.body.checks.find((x: { id: string }) => x.id === 'supply.no-fuse');
		expect(c.level).toBe('danger');
		expect(c.caution).toMatch(/licensed practice/);
		expect(r.body.derived.peakDcV).toBeCloseTo(34.56, 2);
	});
	it('422 with data.-prefixed paths for values out of range', async () => {
		const r = await post({ kind: 'amplifier', data: { ...amplifier, device: { ...amplifier.device, minLoadOhm: -1 } } });
		expect(r.status).toBe(422);
		expect(r.body.error.code).toBe('invalid');
		expect(paths(r.body)).toEqual(['data.device.minLoadOhm']);
		const d = await post({ kind: 'amplifier', data: { ...amplifier, railV: 2 } });
		expect(d.status).toBe(422);
		expect(paths(d.body)).toEqual(['data.device.dropoutV']);
	});
	it('400 for a missing nested field (data.device) or a wrong type', async () => {
		const { device: _d, ...noDevice } = amplifier;
		const r = await post({ kind: 'amplifier', data: noDevice });
		expect(r.status).toBe(400);
		expect(paths(r.body)).toEqual(['data.device']);
		const t = await post({ kind: 'thermal', data: { powerW: '31' } });
		expect(t.status).toBe(400);
		expect(paths(t.body)).toContain('data.powerW');
	});
	it('400 for a bad kind, a missing data, malformed JSON', async () => {
		const k = await post({ kind: 'valve', data: {} });
		expect(k.status).toBe(400);
		expect(paths(k.body)).toEqual(['kind']);
		const d = await post({ kind: 'supply' });
		expect(d.status).toBe(400);
		expect(paths(d.body)).toEqual(['data']);
		const j = await post('{"kind":');
		expect(j.status).toBe(400);
		expect(j.body.error.code).toBe('invalid');
	});
	it('every kind answers 200 with valid data', async () => {
		const blocks: Record<string, unknown> = {
			amplifier,
			supply,
			thermal: { powerW: 31.03, ambientC: 40, junctionMaxC: 150, rthJcKPerW: 1, rthCsKPerW: 0.4, rthSaKPerW: 1.5, tabAtRail: true, tabInsulated: false, heatsinkBondedToChassis: true },
			measurements: { dcOffsetMv: [12, -120] },
			bringup: { currentLimited: false }
		};
		const expected: Record<string, string> = {
			amplifier: 'amp.power-beyond-rails',
			supply: 'supply.no-fuse',
			thermal: 'thermal.tab-to-chassis',
			measurements: 'measure.dc-offset',
			bringup: 'bringup.no-current-limit'
		};
		for (const [kind, data] of Object.entries(blocks)) {
			const r = await post({ kind, data });
			expect(r.status, kind).toBe(200);
			expect(r.body.checks.map((c: { id: string }) => c.id)).toContain(expected[kind]);
		}
	});
	it('405 method_not_allowed for GET', async () => {
		const r = await call(fallback as Handler, { method: 'GET' });
		expect(r.status).toBe(405);
		expect(r.body.error.code).toBe('method_not_allowed');
	});
});

describe('POST /api/v1/spec-check/build (API.md revision 2)', () => {
	const blocks = [
		{ kind: 'amplifier', data: amplifierBlock({ device: { maxSupplyV: 80, dropoutV: 3, junctionMaxC: 150, rthJcKPerW: 1, minLoadOhm: 4 } }) },
		{ kind: 'supply', data: supplyBlock() },
		{ kind: 'thermal', data: thermalBlock({ powerW: 31 }) }
	];
	it('200 { blocks, cross } in block order; the amplifier takes the supply’s 40.81 V high-mains rail', async () => {
		const r = await postTo(build.POST, { blocks, parts: [{ designators: 'C5,C6', kind: 'capacitor', value: 0.01, ratingV: 35 }] });
		expect(r.status).toBe(200);
		expect(Object.keys(r.body).sort()).toEqual(['blocks', 'cross']);
		expect(r.body.blocks).toHaveLength(3);
		expect(Object.keys(r.body.blocks[0]).sort()).toEqual(['checks', 'derived']);
		expect(Math.abs(r.body.blocks[1].derived.highMainsPeakDcV - 40.81)).toBeLessThan(0.01);
		expect(r.body.blocks[0].derived.highMainsRailV).toBeCloseTo(r.body.blocks[1].derived.highMainsPeakDcV, 12);
		const cross = r.body.cross.map((c: { id: string; level: string }) => `${c.id}:${c.level}`).sort();
		// 81.6 V rail to rail > 80 V; 35 V caps < 40.8 V; thermal 31 W < 0.95 × 52.7 W
		expect(cross).toEqual(['cross.cap-below-rail:danger', 'cross.rails-beyond-device:danger', 'cross.thermal-power-below-worst:caution']);
	});
	it('422 at blocks.2.data.railV for a value out of range; at blocks.0.data.bridged for a bridged class A block', async () => {
		const bad = [blocks[1], blocks[2], { kind: 'amplifier', data: amplifierBlock({ railV: 250 }) }];
		const r = await postTo(build.POST, { blocks: bad });
		expect(r.status).toBe(422);
		expect(paths(r.body)).toEqual(['blocks.2.data.railV']);
		const a = await postTo(build.POST, { blocks: [{ kind: 'amplifier', data: amplifierBlock({ topology: 'class-a', biasA: 1, bridged: true }) }] });
		expect(a.status).toBe(422);
		expect(paths(a.body)).toEqual(['blocks.0.data.bridged']);
	});
	it('400 for a missing field inside a block, a bad kind, no blocks, malformed JSON; 405 for GET', async () => {
		const { device: _d, ...noDevice } = amplifierBlock();
		const m = await postTo(build.POST, { blocks: [blocks[1], { kind: 'amplifier', data: noDevice }] });
		expect(m.status).toBe(400);
		expect(paths(m.body)).toEqual(['blocks.1.data.device']);
		const k = await postTo(build.POST, { blocks: [{ kind: 'valve', data: {} }] });
		expect(k.status).toBe(400);
		expect(paths(k.body)).toEqual(['blocks.0.kind']);
		expect((await postTo(build.POST, { blocks: [] })).status).toBe(422);
		expect((await postTo(build.POST, '{"blocks":')).status).toBe(400);
		expect((await call(build.fallback as Handler, { method: 'GET' })).status).toBe(405);
	});
});
