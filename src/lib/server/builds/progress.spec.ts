// Integration tests (real PostgreSQL): the maker's build status (in progress / working / abandoned) — who may set
// it, what it refuses, that it needs no revision, and that the list query, the API list route and the OpenAPI
// document filter and describe it.
import { describe, it, expect, beforeAll } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { statusOf, uniqueTitle, useTestUsers } from '../testing/builds';
import { addStep, createDraft, listPublishedBuilds, publish, setBuildProgress } from './index';
import { setBuildLocked } from '../moderation';
import { GET as listRoute } from '../../../routes/api/v1/builds/+server';
import { openApiDocument } from '../openapi';

const { maker, other, moderator } = useTestUsers({ maker: ['maker', 'Progress'], other: ['maker', 'Other'], moderator: ['moderator', 'Mod'] });
const built: Record<string, { id: string; slug: string }> = {};

async function publishedBuild(title: string) {
	const b = await createDraft(maker.id, { title, summary: '', category: 'preamp', topology: 'passive', mainsPowered: false, licence: 'CC-BY-4.0' });
	await addStep(maker, b.id, { title: 'Wire the selector', bodyMd: 'Solder the switch.' });
	await publish(maker, b.id);
	return b;
}

beforeAll(async () => {
	for (const p of ['in-progress', 'working', 'abandoned'] as const) built[p] = await publishedBuild(uniqueTitle(`Status ${p}`));
});

const progressOf = async (id: string) => (await db.select({ p: schema.build.progress }).from(schema.build).where(eq(schema.build.id, id)))[0].p;

describe('build status', () => {
	it('starts as in progress (the column default the migration gives every existing build)', async () => {
		expect(await progressOf(built['in-progress'].id)).toBe('in-progress');
	});

	it('is set by the maker at once, without pending changes or a new revision', async () => {
		const b = built.working;
		const [before] = await db.select().from(schema.build).where(eq(schema.build.id, b.id));
		expect(await setBuildProgress(maker, b.id, 'working')).toBe('working');
		await setBuildProgress(maker, built.abandoned.id, 'abandoned');
		const [after] = await db.select().from(schema.build).where(eq(schema.build.id, b.id));
		expect(after.progress).toBe('working');
		expect(after.revision).toBe(before.revision);
		expect(after.pendingChangesAt).toBeNull();
	});

	it('refuses values outside the three, another member (403) and a locked build (403)', async () => {
		const b = built['in-progress'];
		expect(await statusOf(setBuildProgress(maker, b.id, 'finished'))).toBe(422);
		expect(await statusOf(setBuildProgress(maker, b.id, 'working\u0000'))).toBe(422);
		expect(await statusOf(setBuildProgress(maker, b.id, null))).toBe(422);
		expect(await statusOf(setBuildProgress(other, b.id, 'working'))).toBe(403);
		await setBuildLocked(moderator, b.id, true, 'Checking a report');
		expect(await statusOf(setBuildProgress(maker, b.id, 'abandoned'))).toBe(403);
		await setBuildLocked(moderator, b.id, false, '');
		expect(await progressOf(b.id)).toBe('in-progress');
	});

	it('another member’s draft looks absent (404), view before edit', async () => {
		const d = await createDraft(maker.id, { title: uniqueTitle('Status draft'), summary: '', category: 'dac', topology: 'other', mainsPowered: false, licence: 'CC0-1.0' });
		expect(await statusOf(setBuildProgress(other, d.id, 'working'))).toBe(404);
		expect(await setBuildProgress(maker, d.id, 'abandoned')).toBe('abandoned');
	});

	it('filters the list query: only builds with that status', async () => {
		const { rows } = await listPublishedBuilds({ limit: 100, filters: { maker: maker.handle, progress: 'working' } });
		expect(rows.map((r) => r.slug)).toEqual([built.working.slug]);
		const { rows: all } = await listPublishedBuilds({ limit: 100, filters: { maker: maker.handle } });
		expect(all.map((r) => r.progress).sort()).toEqual(['abandoned', 'in-progress', 'working']);
	});
});

describe('GET /api/v1/builds?status=', () => {
	const call = async (qs: string) => {
		const url = new URL(`http://localhost/api/v1/builds?${qs}`);
		const res = await listRoute({ url, request: new Request(url) } as never);
		return { status: res.status, body: await res.json() };
	};

	it('filters by the build status and says it on every item', async () => {
		const r = await call(`maker=${maker.handle}&status=abandoned`);
		expect(r.status).toBe(200);
		expect(r.body.items.map((i: { slug: string }) => i.slug)).toEqual([built.abandoned.slug]);
		expect(r.body.items[0]).toMatchObject({ progress: 'abandoned', progressLabel: 'Abandoned', status: 'published' });
	});

	it('answers 400 with the envelope and the path for an unknown status', async () => {
		const r = await call('status=finished');
		expect(r.status).toBe(400);
		expect(r.body.error.code).toBe('invalid');
		expect(r.body.error.issues).toEqual([expect.objectContaining({ path: 'status' })]);
		expect(r.body.error.issues[0].message).toContain('in-progress, working, abandoned');
	});

	it('is documented in the OpenAPI document: the query parameter and the item field', () => {
		const doc = openApiDocument() as any;
		const op = doc.paths['/api/v1/builds'].get;
		const param = op.parameters.find((p: { name: string }) => p.name === 'status');
		expect(param.schema.enum).toEqual(['in-progress', 'working', 'abandoned']);
		expect(param.description).toMatch(/build status/);
	});
});
