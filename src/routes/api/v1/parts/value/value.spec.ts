import { describe, expect, it } from 'vitest';
import { GET } from './+server';

/** Call GET /api/v1/parts/value with a query. */
async function read(query: Record<string, string>) {
	const url = new URL('http://localhost/api/v1/parts/value');
	for (const [k, v] of Object.entries(query)) url.searchParams.set(k, v);
	const res = await GET({ url, request: new Request(url) } as never);
	return { status: res.status, body: await res.json() };
}

describe('GET /api/v1/parts/value', () => {
	it('reads a value as the parts editor does, with its reading', async () => {
		// Two equal capacitors in series: 1 µF·1 µF/(1 µF + 1 µF) = 0.5 µF (textbook series formula).
		const r = await read({ text: '2×1u series', kind: 'capacitor' });
		expect(r.status).toBe(200);
		expect(r.body.value).toBeCloseTo(5e-7, 15);
		expect(r.body).toMatchObject({ unit: 'F', display: '500 nF', parts: 2, arrangement: 'series', reading: 'two 1.00 µF in series = 500 nF' });
		// IEC 60062 three-digit code: 10 × 10⁴ pF on a capacitor, 10 × 10⁴ Ω on a resistor.
		expect((await read({ text: '104', kind: 'capacitor' })).body.value).toBeCloseTo(1e-7, 18);
		expect((await read({ text: '104', kind: 'resistor' })).body.value).toBe(100_000);
		expect((await read({ text: '100n 275VAC', kind: 'capacitor' })).body).toMatchObject({ ratingV: 275, ratingAc: true });
	});

	it('answers 422 for a bare 1u+1u with a sentence naming both forms', async () => {
		const r = await read({ text: '1u+1u', kind: 'capacitor' });
		expect(r.status).toBe(422);
		expect(r.body.error.code).toBe('invalid');
		expect(r.body.error.message).toContain('2×1u series');
		expect(r.body.error.message).toContain('1u||1u');
		expect(r.body.error.issues).toEqual([{ path: 'text', message: r.body.error.message }]);
	});

	it('answers 400 for a missing text or an unknown kind, 422 for a kind without a value', async () => {
		expect((await read({ kind: 'capacitor' })).status).toBe(400);
		expect((await read({ text: '4k7', kind: 'banana' })).status).toBe(400);
		expect((await read({ text: 'TO-220 chip', kind: 'ic' })).status).toBe(422);
	});
});
