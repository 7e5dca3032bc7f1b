// Integration (real PostgreSQL): "I built this too" in the JSON API — GET /api/v1/builds/{slug}/built-it lists the
// records with their checked blocks and figures; POST records (201) or replaces (200) one with the API envelope's
// errors (API.md: 401 unauthenticated, 400 malformed/shape, 422 with issue paths from the body root, 404, 409);
// DELETE takes it off. The route handlers are called as SvelteKit calls them.
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { createTestUser, removeTestUsers } from './testing/builds';
import { testBuild } from './testing/parts';
import { DELETE, GET, POST } from '../../routes/api/v1/builds/[slug]/built-it/+server';
import { OPERATIONS, openApiDocument } from './openapi';

type TestUser = Awaited<ReturnType<typeof createTestUser>>;
let maker: TestUser, builder: TestUser;
beforeAll(async () => {
	maker = await createTestUser('maker', 'API original maker');
	builder = await createTestUser('maker', 'API builder');
});
afterAll(() => removeTestUsers([maker.id, builder.id]));

type Who = TestUser | null;
const event = (slug: string, who: Who, init?: RequestInit) => {
	const url = new URL(`http://localhost/api/v1/builds/${slug}/built-it`);
	return { params: { slug }, url, locals: { user: who && { ...who, suspendedAt: null } }, request: new Request(url, init) } as never;
};
const call = async (h: typeof GET, slug: string, who: Who, body?: unknown, raw?: string) => {
	const res = await h(event(slug, who, body === undefined && raw === undefined ? undefined : { method: 'POST', body: raw ?? JSON.stringify(body), headers: { 'content-type': 'application/json' } }));
	const text = await res.text();
	return { status: res.status, body: text ? JSON.parse(text) : null };
};

const FIGURES = {
	note: 'Second channel built on a smaller heatsink.',
	currentLimited: true,
	rails: [
		{ expectedV: 28, measuredV: 27.5 },
		{ expectedV: -28, measuredV: -27.7 }
	],
	dcOffsetMv: [4, -6],
	thd: [
		{ powerW: 10, thdPct: 0.03 },
		{ powerW: 40, thdPct: 1 }
	],
	loadOhm: 8
};

describe('GET/POST/DELETE /api/v1/builds/{slug}/built-it', () => {
	it('records figures as checked blocks (201), lists them with figures, replaces them (200) and takes them off (204)', async () => {
		const b = await testBuild(maker.id, { published: true });
		expect(await call(GET, b.slug, null)).toEqual({ status: 200, body: { items: [], count: 0 } });

		const made = await call(POST, b.slug, builder, FIGURES);
		expect(made.status).toBe(201);
		expect(made.body).toMatchObject({
			member: { name: builder.name, handle: builder.handle },
			mine: true,
			note: FIGURES.note,
			// clipPowerW: the power at 1 % THD, read from the points as given (40 W @ 1 %).
			figures: { railsMeasuredV: [27.5, -27.7], maxAbsOffsetMv: 6, clipPowerW: 40, loadOhm: 8 }
		});
		expect(made.body.blocks.map((x: { kind: string }) => x.kind)).toEqual(['bringup', 'measurements']);
		expect(made.body.blocks[0].data).toMatchObject({ currentLimited: true, dcOffsetMv: [4, -6] });

		const list = await call(GET, b.slug, null);
		expect(list.body.count).toBe(1);
		expect(list.body.items[0]).toMatchObject({ id: made.body.id, mine: false, figures: made.body.figures });

		const again = await call(POST, b.slug, builder, { dcOffsetMv: [-120] });
		expect(again.status).toBe(200);
		expect(again.body.id).toBe(made.body.id);
		// |−120 mV| trips the bring-up block's DC-offset check, as in any bring-up block.
		expect(again.body.figures.danger + again.body.figures.caution).toBeGreaterThan(0);

		const del = await DELETE(event(b.slug, builder, { method: 'DELETE' }));
		expect(del.status).toBe(204);
		expect((await call(GET, b.slug, null)).body.count).toBe(0);
	});

	it('answers the API envelope: 401, 400 malformed JSON, 400 shape, 422 with body paths, 404, 409', async () => {
		const b = await testBuild(maker.id, { published: true });
		const draft = await testBuild(maker.id);

		const anon = await call(POST, b.slug, null, FIGURES);
		expect(anon).toMatchObject({ status: 401, body: { error: { code: 'unauthenticated' } } });

		const junk = await call(POST, b.slug, builder, undefined, '{"rails": [');
		expect(junk).toMatchObject({ status: 400, body: { error: { code: 'invalid', issues: [{ path: '' }] } } });

		const shape = await call(POST, b.slug, builder, { rails: [{ expectedV: '28' }] });
		expect(shape.status).toBe(400);
		expect(shape.body.error.issues.map((i: { path: string }) => i.path)).toEqual(expect.arrayContaining(['rails.0.expectedV', 'rails.0.measuredV']));

		// Distortion points without the DC offset: the form's rule, at the API's field name.
		const rule = await call(POST, b.slug, builder, { thd: [{ powerW: 10, thdPct: 0.1 }] });
		expect(rule).toMatchObject({ status: 422, body: { error: { code: 'invalid', issues: [{ path: 'dcOffsetMv' }] } } });

		// An expected rail of 0 V is refused by the bring-up block's own schema; the issue names the body field.
		const zero = await call(POST, b.slug, builder, { rails: [{ expectedV: 0, measuredV: 12 }] });
		expect(zero).toMatchObject({ status: 422, body: { error: { code: 'invalid', issues: [{ path: 'rails', message: 'must not be 0 V' }] } } });
		const huge = await call(POST, b.slug, builder, { dcOffsetMv: [1], thd: [{ powerW: 20000, thdPct: 1 }] });
		expect(huge).toMatchObject({ status: 422, body: { error: { issues: [{ path: 'thd', message: 'must be at most 10000 W' }] } } });

		expect((await call(POST, draft.slug, builder, FIGURES)).body.error.code).toBe('not_found');
		expect((await call(GET, draft.slug, null)).status).toBe(404);
		expect(await call(POST, b.slug, maker, FIGURES)).toMatchObject({ status: 409, body: { error: { code: 'conflict' } } });
		expect((await call(GET, b.slug, null)).body.count).toBe(0); // nothing stored by any refusal
	});

	it('is in the OpenAPI document with its body schema', () => {
		const ops = OPERATIONS.filter((o) => o.path === '/api/v1/builds/{slug}/built-it').map((o) => o.method);
		expect(ops.sort()).toEqual(['delete', 'get', 'post']);
		const doc = openApiDocument() as { paths: Record<string, Record<string, { requestBody?: { content: Record<string, { schema: { properties: Record<string, unknown> } }> } }>> };
		const post = doc.paths['/api/v1/builds/{slug}/built-it'].post;
		expect(Object.keys(post.requestBody!.content['application/json'].schema.properties)).toEqual(
			expect.arrayContaining(['rails', 'dcOffsetMv', 'thd', 'loadOhm', 'currentLimited', 'note', 'basedOn'])
		);
	});
});
