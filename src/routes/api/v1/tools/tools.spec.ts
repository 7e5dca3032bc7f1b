import { describe, expect, it } from 'vitest';
import { evaluate } from 'mathjs';
import * as amplifier from './amplifier/+server';
import * as heatsink from './heatsink/+server';
import * as supply from './supply/+server';
import * as gain from './gain/+server';
import * as corner from './corner/+server';
import * as network from './network/+server';
import * as decode from './decode/+server';
import * as bands from './resistor-bands/+server';
import * as eseries from './eseries/+server';

type Handler = (event: never) => Response | Promise<Response>;
const BASE = 'http://localhost/api/v1/tools';

/** Call a handler with a minimal event { request, url }. */
async function call(handler: Handler, path: string, init: RequestInit = {}): Promise<{ status: number; body: any; headers: Headers }> {
	const url = new URL(`${BASE}/${path}`);
	const request = new Request(url, init);
	const res = await handler({ request, url } as never);
	return { status: res.status, body: await res.json(), headers: res.headers };
}
const post = (handler: Handler, path: string, body: unknown) =>
	call(handler, path, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: typeof body === 'string' ? body : JSON.stringify(body)
	});

/** Every error answers the one envelope of API.md. */
function expectEnvelope(body: any, code = 'invalid') {
	expect(Object.keys(body)).toEqual(['error']);
	expect(body.error.code).toBe(code);
	expect(typeof body.error.message).toBe('string');
	expect(Array.isArray(body.error.issues)).toBe(true);
	for (const i of body.error.issues) {
		expect(typeof i.path).toBe('string');
		expect(typeof i.message).toBe('string');
	}
}
const paths = (body: any) => body.error.issues.map((i: { path: string }) => i.path);

describe('POST /tools/amplifier', () => {
	const good = { supply: 'split', railV: 35, loadOhm: 8, dropoutV: 3 };
	it('200 with the worked example (REFERENCE.md §12 case 1)', async () => {
		const r = await post(amplifier.POST, 'amplifier', good);
		expect(r.status).toBe(200);
		expect(r.body.maxPowerW).toBeCloseTo(64, 9);
		expect(r.body.peakCurrentA).toBeCloseTo(4, 9);
		expect(r.body.worstDissipationW).toBeCloseTo(31.03, 2);
		expect(r.body).not.toHaveProperty('efficiency');
	});
	it('dropoutV defaults to 0: ±35 V into 8 Ω = 76.5625 W (mathjs oracle, REFERENCE.md §10); unknown fields ignored', async () => {
		const r = await post(amplifier.POST, 'amplifier', { supply: 'split', railV: 35, loadOhm: 8, colour: 'copper' });
		expect(r.status).toBe(200);
		expect(r.body.maxPowerW).toBeCloseTo(evaluate('(35 V)^2 / (2 * 8 ohm)').toNumber('W'), 9);
	});
	it('with outputW: supplyPowerW, dissipationW, efficiency (REFERENCE.md §12 case 3)', async () => {
		const r = await post(amplifier.POST, 'amplifier', { ...good, outputW: 64 });
		expect(r.body.supplyPowerW).toBeCloseTo(89.13, 2);
		expect(r.body.dissipationW).toBeCloseTo(25.13, 2);
		expect(r.body.efficiency).toBeCloseTo(0.718, 3);
	});
	it('422 at outputW when it is above maxPowerW', async () => {
		const r = await post(amplifier.POST, 'amplifier', { ...good, outputW: 80 });
		expect(r.status).toBe(422);
		expectEnvelope(r.body);
		expect(paths(r.body)).toEqual(['outputW']);
		expect(r.body.error.message).toMatch(/outputW/);
	});
	it('422 at dropoutV when the dropout eats the rail; 422 at loadOhm below 0.5 Ω', async () => {
		const a = await post(amplifier.POST, 'amplifier', { ...good, railV: 3 });
		expect(a.status).toBe(422);
		expect(paths(a.body)).toEqual(['dropoutV']);
		const b = await post(amplifier.POST, 'amplifier', { ...good, loadOhm: 0.2 });
		expect(b.status).toBe(422);
		expect(b.body.error.issues[0]).toEqual({ path: 'loadOhm', message: 'must be at least 0.5 Ω' });
	});
	it('400 for malformed JSON, a missing field, a wrong type, a bad enum', async () => {
		const bad = await post(amplifier.POST, 'amplifier', '{"supply": "split",');
		expect(bad.status).toBe(400);
		expectEnvelope(bad.body);
		const missing = await post(amplifier.POST, 'amplifier', { supply: 'split', railV: 35 });
		expect(missing.status).toBe(400);
		expect(paths(missing.body)).toEqual(['loadOhm']);
		const type = await post(amplifier.POST, 'amplifier', { ...good, railV: '35' });
		expect(type.status).toBe(400);
		expect(paths(type.body)).toEqual(['railV']);
		const en = await post(amplifier.POST, 'amplifier', { ...good, supply: 'bridged' });
		expect(en.status).toBe(400);
		expect(paths(en.body)).toEqual(['supply']);
		const arr = await post(amplifier.POST, 'amplifier', [1, 2]);
		expect(arr.status).toBe(400);
	});
	it('405 method_not_allowed for GET, with Allow: POST', async () => {
		const r = await call(amplifier.fallback as Handler, 'amplifier', { method: 'GET' });
		expect(r.status).toBe(405);
		expectEnvelope(r.body, 'method_not_allowed');
		expect(r.headers.get('allow')).toBe('POST');
	});
});

describe('POST /tools/heatsink', () => {
	const good = { powerW: 39.72, ambientC: 25, junctionMaxC: 150, rthJcKPerW: 1, rthCsKPerW: 0.2 };
	it('200: required Rθsa 1.947 K/W (REFERENCE.md §12 case 4), feasible; junctionC with rthSaKPerW', async () => {
		const r = await post(heatsink.POST, 'heatsink', good);
		expect(r.status).toBe(200);
		expect(Math.abs(r.body.requiredRthSaKPerW - 1.947)).toBeLessThan(0.005);
		expect(r.body.feasible).toBe(true);
		expect(r.body.junctionC).toBeCloseTo(150, 6); // at the required heatsink the junction sits at the limit
		const j = await post(heatsink.POST, 'heatsink', { ...good, powerW: 31.03, ambientC: 40, rthCsKPerW: 0.4, rthSaKPerW: 1.5 });
		expect(j.body.junctionC).toBeCloseTo(130, 1);
	});
	it('marginC defaults to 0 and lowers the target when given (1.339 K/W at 25 °C margin, §12 case 5)', async () => {
		const r = await post(heatsink.POST, 'heatsink', { powerW: 31.03, ambientC: 40, junctionMaxC: 150, rthJcKPerW: 1, rthCsKPerW: 0.4, marginC: 25 });
		expect(Math.abs(r.body.requiredRthSaKPerW - 1.339)).toBeLessThan(0.005);
	});
	it('400 for a missing field, 422 for zero power', async () => {
		const { powerW: _p, ...noPower } = good;
		expect((await post(heatsink.POST, 'heatsink', noPower)).status).toBe(400);
		const z = await post(heatsink.POST, 'heatsink', { ...good, powerW: 0 });
		expect(z.status).toBe(422);
		expect(paths(z.body)).toEqual(['powerW']);
	});
	it('feasible false (not a negative heatsink to fit) when 100 W at 50 °C over 1.4 K/W already passes 150 °C; devices share the sink', async () => {
		const r = await post(heatsink.POST, 'heatsink', { powerW: 100, ambientC: 50, junctionMaxC: 150, rthJcKPerW: 1, rthCsKPerW: 0.4 });
		expect(r.status).toBe(200);
		expect(r.body.feasible).toBe(false);
		expect(r.body.junctionC).toBeCloseTo(190, 9); // 50 + 100 · 1.4, on an ideal sink
		const two = await post(heatsink.POST, 'heatsink', { ...good, powerW: 20, devices: 2, ambientC: 40, rthCsKPerW: 0.5, rthSaKPerW: 1 });
		expect(two.body.sinkC).toBeCloseTo(80, 9); // 40 + 2 · 20 · 1
		expect(two.body.junctionC).toBeCloseTo(110, 9); // 80 + 20 · 1.5
		expect((await post(heatsink.POST, 'heatsink', { ...good, devices: 0 })).status).toBe(422);
	});
});

describe('POST /tools/supply', () => {
	const good = { secondaryVac: 25, rectifier: 'bridge-split', diodeDropV: 0.8, mainsHz: 50, loadCurrentA: 3, capacitanceF: 0.01 };
	it('200: 34.56 V, 3.00 Vpp (REFERENCE.md §12 case 7)', async () => {
		const r = await post(supply.POST, 'supply', good);
		expect(r.status).toBe(200);
		expect(r.body.peakDcV).toBeCloseTo(34.56, 2);
		expect(r.body.rippleVpp).toBeCloseTo(3, 9);
		expect(r.body.averageDcV).toBeCloseTo(33.06, 2);
	});
	it('worst case with regulation 7 %: 40.81 V at +10 % mains (REFERENCE.md §4.2), 81.62 V rail to rail; 10 % regulation assumed when absent', async () => {
		const r = await post(supply.POST, 'supply', { ...good, regulationPct: 7 });
		expect(Math.abs(r.body.highMainsPeakDcV - 40.81)).toBeLessThan(0.01);
		expect(Math.abs(r.body.highMainsTotalDcV - 81.62)).toBeLessThan(0.02);
		expect(Math.abs(r.body.lowMainsAverageDcV - 29.52)).toBeLessThan(0.01); // 35.355 · 0.9 − 0.8 − 1.5
		const d = await post(supply.POST, 'supply', good);
		expect(d.body.regulationPct).toBe(10);
		expect(Math.abs(d.body.highMainsPeakDcV - 41.98)).toBeLessThan(0.01); // 35.355 · 1.21 − 0.8
	});
	it('rectifier currents at 3 A (the supply block’s numbers): 5.4 A RMS per half-winding (makers’ 1.8 × DC), ripple current 4.49 A', async () => {
		const r = await post(supply.POST, 'supply', good);
		expect(r.body.secondaryRmsA).toBeCloseTo(5.4, 9);
		expect(Math.abs(r.body.rippleCurrentA - 3 * Math.sqrt(1.8 ** 2 - 1))).toBeLessThan(1e-9);
		expect(r.body.peakDiodeCurrentA).toBeGreaterThan(r.body.secondaryRmsA);
		expect(r.body.conductionDeg).toBeGreaterThan(0);
	});
	it('diodeDropV defaults to 0.7 V', async () => {
		const { diodeDropV: _d, ...rest } = good;
		const r = await post(supply.POST, 'supply', rest);
		expect(r.body.peakDcV).toBeCloseTo(25 * Math.SQRT2 - 0.7, 9);
	});
	it('422 at capacitanceF when the ripple would swallow the rail; 400 for a bad rectifier', async () => {
		const r = await post(supply.POST, 'supply', { ...good, capacitanceF: 1e-5, loadCurrentA: 50 });
		expect(r.status).toBe(422);
		expect(paths(r.body)).toEqual(['capacitanceF']);
		const e = await post(supply.POST, 'supply', { ...good, rectifier: 'full-wave' });
		expect(e.status).toBe(400);
		expect(paths(e.body)).toEqual(['rectifier']);
	});
});

describe('POST /tools/gain, /tools/corner, /tools/network', () => {
	it('gain 22 k / 680 Ω → 33.35 = 30.46 dB (REFERENCE.md §12 case 8); 422 for riOhm 0', async () => {
		const r = await post(gain.POST, 'gain', { rfOhm: 22e3, riOhm: 680 });
		expect(r.status).toBe(200);
		expect(r.body.gain).toBeCloseTo(33.35, 2);
		expect(r.body.gainDb).toBeCloseTo(30.46, 2);
		const z = await post(gain.POST, 'gain', { rfOhm: 22e3, riOhm: 0 });
		expect(z.status).toBe(422);
		expect(paths(z.body)).toEqual(['riOhm']);
	});
	it('corner 22 kΩ · 1 µF → 7.234 Hz (mathjs oracle)', async () => {
		const r = await post(corner.POST, 'corner', { rOhm: 22e3, cF: 1e-6 });
		expect(r.body.cornerHz).toBeCloseTo(evaluate('1 / (2 * pi * 22 kohm * 1 uF)').toNumber('Hz'), 9);
	});
	it('network 1 µF series 1 µF → 0.5 µF; 10 k ‖ 10 k → 5 k (REFERENCE.md §12 case 10)', async () => {
		const c = await post(network.POST, 'network', { part: 'capacitor', arrangement: 'series', values: [1e-6, 1e-6] });
		expect(c.body.value).toBeCloseTo(0.5e-6, 18);
		const r = await post(network.POST, 'network', { part: 'resistor', arrangement: 'parallel', values: [10e3, 10e3] });
		expect(r.body.value).toBeCloseTo(5000, 9);
	});
	it('network errors: one value → 422 at values; a string → 400 at values.1; a negative → 422 at values.1', async () => {
		const one = await post(network.POST, 'network', { part: 'resistor', arrangement: 'series', values: [1] });
		expect(one.status).toBe(422);
		expect(paths(one.body)).toEqual(['values']);
		const str = await post(network.POST, 'network', { part: 'resistor', arrangement: 'series', values: [1, '2k'] });
		expect(str.status).toBe(400);
		expect(paths(str.body)).toEqual(['values.1']);
		const neg = await post(network.POST, 'network', { part: 'resistor', arrangement: 'series', values: [1, -2] });
		expect(neg.status).toBe(422);
		expect(paths(neg.body)).toEqual(['values.1']);
	});
});

describe('GET /tools/decode', () => {
	it('104 → 100 nF; B103 → taper B with a note; 473J tolerance', async () => {
		const r = await call(decode.GET, 'decode?code=104');
		expect(r.status).toBe(200);
		expect(r.body).toEqual({ kind: 'capacitance', value: 1e-7, unit: 'F', display: '100 nF' });
		const p = await call(decode.GET, 'decode?code=B103&as=potentiometer');
		expect(p.body).toMatchObject({ value: 10e3, taper: 'B', display: '10 kΩ' });
		expect(p.body.taperNote).toMatch(/linear/);
		expect((await call(decode.GET, 'decode?code=473J')).body.tolerancePct).toBe(5);
		expect((await call(decode.GET, `decode?code=${encodeURIComponent('4k7')}&as=resistor`)).body.display).toBe('4.7 kΩ');
	});
	it('400 for a missing code or a bad `as`; 422 at code for an undecodable one', async () => {
		const m = await call(decode.GET, 'decode');
		expect(m.status).toBe(400);
		expect(paths(m.body)).toEqual(['code']);
		const a = await call(decode.GET, 'decode?code=104&as=transistor');
		expect(a.status).toBe(400);
		expect(paths(a.body)).toEqual(['as']);
		const u = await call(decode.GET, 'decode?code=zz9');
		expect(u.status).toBe(422);
		expectEnvelope(u.body);
		expect(paths(u.body)).toEqual(['code']);
	});
	it('405 for POST', async () => {
		expect((await call(decode.fallback as Handler, 'decode', { method: 'POST' })).status).toBe(405);
	});
});

describe('GET /tools/resistor-bands', () => {
	it('valueOhm=4700 → yellow violet red gold (defaults 4 bands, 5 %)', async () => {
		const r = await call(bands.GET, 'resistor-bands?valueOhm=4700');
		expect(r.status).toBe(200);
		expect(r.body).toEqual({ bands: ['yellow', 'violet', 'red', 'gold'], valueOhm: 4700, tolerancePct: 5 });
		const five = await call(bands.GET, 'resistor-bands?valueOhm=10000&bands=5');
		expect(five.body.bands).toEqual(['brown', 'black', 'black', 'red', 'brown']);
		expect(five.body.tolerancePct).toBe(1);
	});
	it('colors=brown,black,orange,gold → 10 kΩ ±5 % (API.md example)', async () => {
		const r = await call(bands.GET, 'resistor-bands?colors=brown,black,orange,gold');
		expect(r.status).toBe(200);
		expect(r.body).toMatchObject({ valueOhm: 10000, tolerancePct: 5, display: '10 kΩ' });
	});
	it('422 at valueOhm for a value 4 bands cannot show, at tolerancePct for one with no colour', async () => {
		const v = await call(bands.GET, 'resistor-bands?valueOhm=4750');
		expect(v.status).toBe(422);
		expect(paths(v.body)).toEqual(['valueOhm']);
		const t = await call(bands.GET, 'resistor-bands?valueOhm=4700&tolerancePct=3');
		expect(t.status).toBe(422);
		expect(paths(t.body)).toEqual(['tolerancePct']);
	});
	it('colour errors: unknown name → 400 at colors.1; gold as first digit → 422 at colors.0', async () => {
		const n = await call(bands.GET, 'resistor-bands?colors=brown,mauve,orange,gold');
		expect(n.status).toBe(400);
		expect(paths(n.body)).toEqual(['colors.1']);
		const g = await call(bands.GET, 'resistor-bands?colors=gold,black,orange,gold');
		expect(g.status).toBe(422);
		expect(paths(g.body)).toEqual(['colors.0']);
	});
	it('400 for neither or both inputs, bands=6, valueOhm=abc', async () => {
		for (const q of ['', '?valueOhm=1000&colors=red,red,red', '?valueOhm=1000&bands=6', '?valueOhm=abc']) {
			const r = await call(bands.GET, `resistor-bands${q}`);
			expect(r.status, q).toBe(400);
			expectEnvelope(r.body);
		}
	});
});

describe('GET /tools/eseries', () => {
	it('5000 → 4700 (E12 default), 4990 (E96) (REFERENCE.md §6.5)', async () => {
		const r = await call(eseries.GET, 'eseries?value=5000');
		expect(r.status).toBe(200);
		expect(r.body).toEqual({ nearest: 4700, below: 4700, above: 5600, errorPct: -6 });
		expect((await call(eseries.GET, 'eseries?value=5000&series=E96')).body.nearest).toBe(4990);
	});
	it('422 for value 0, 400 for a missing value or unknown series', async () => {
		const z = await call(eseries.GET, 'eseries?value=0');
		expect(z.status).toBe(422);
		expect(paths(z.body)).toEqual(['value']);
		expect((await call(eseries.GET, 'eseries')).status).toBe(400);
		const s = await call(eseries.GET, 'eseries?value=10&series=E7');
		expect(s.status).toBe(400);
		expect(paths(s.body)).toEqual(['series']);
	});
});

describe('never a 500', () => {
	it('random bodies to every POST tool answer 200, 400 or 422 with the envelope on errors (property)', async () => {
		const handlers: Array<[Handler, string]> = [
			[amplifier.POST, 'amplifier'],
			[heatsink.POST, 'heatsink'],
			[supply.POST, 'supply'],
			[gain.POST, 'gain'],
			[corner.POST, 'corner'],
			[network.POST, 'network']
		];
		const pick = <T>(xs: T[]): T => xs[Math.floor(Math.random() * xs.length)];
		const values = [0, -1, 1e-30, 1e30, 35, 8, 0.5, 'x', null, true, [], {}, [1, 2], 'split', 'bridge', 'resistor', 'series'];
		const keys = ['supply', 'railV', 'loadOhm', 'dropoutV', 'outputW', 'powerW', 'ambientC', 'junctionMaxC', 'rthJcKPerW', 'rthCsKPerW',
			'secondaryVac', 'rectifier', 'mainsHz', 'loadCurrentA', 'capacitanceF', 'rfOhm', 'riOhm', 'rOhm', 'cF', 'part', 'arrangement', 'values'];
		for (let i = 0; i < 300; i++) {
			const body: Record<string, unknown> = {};
			for (const k of keys) if (Math.random() < 0.6) body[k] = pick(values);
			const [h, path] = pick(handlers);
			const r = await post(h, path, body);
			expect([200, 400, 422]).toContain(r.status);
			if (r.status !== 200) expectEnvelope(r.body);
		}
	});
});
