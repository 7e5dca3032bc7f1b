// Integration (real PostgreSQL): the review desk at scale — keyset pages with a tiebreaker, filters and
// orders kept by the review_request triggers, the indexes EXPLAIN shows for each desk query, claims (two
// reviewers at once: one wins), the maker's note, and the reviewer digest (ten requests, one mail).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, inArray, sql } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { stopMail } from '../mail';
import { useTestUsers } from '../testing/builds';
import { insertBuilds, insertReview } from '../testing/discover';
import { createPublishedBuild, queuedMailTo } from '../testing/reviews';
import {
	claimHours,
	claimRequest,
	DESK_QUERIES,
	deskPageSql,
	deskQuerySchema,
	getDeskEntry,
	listDesk,
	parseDeskQuery,
	releaseClaim,
	requestReview,
	sendReviewDigest,
	setFollowedCategories,
	submitReview,
	type DeskQuery
} from './index';

const { maker, maker2, reviewer, reviewer2, moderator, explainOwner, follower, bystander, asker } = useTestUsers({
	maker: ['maker', 'Desk maker'],
	maker2: ['maker', 'Desk maker two'],
	reviewer: ['reviewer', 'Desk reviewer'],
	reviewer2: ['reviewer', 'Desk reviewer two'],
	moderator: ['moderator', 'Desk moderator'],
	explainOwner: ['maker', 'Explain owner'],
	follower: ['reviewer', 'Digest follower'],
	bystander: ['reviewer', 'Digest bystander'],
	asker: ['maker', 'Digest asker']
});

afterAll(() => stopMail());

const q = (over: Partial<DeskQuery> = {}): DeskQuery => ({ ...deskQuerySchema.parse({}), ...over });

/** Every desk row for `query`, walking pages of `size` by cursor; fails on a repeated row. */
async function walk(query: DeskQuery, size: number, now?: Date) {
	const seen: string[] = [];
	let cursor: string | null = null;
	for (let i = 0; i < 500; i++) {
		const page = await listDesk(query, cursor, size, now);
		expect(page.items.length).toBeLessThanOrEqual(size);
		seen.push(...page.items.map((w) => w.id));
		if (!page.next) break;
		cursor = page.next;
	}
	expect(new Set(seen).size).toBe(seen.length);
	return seen;
}

/** Give a build `n` DANGER and `c` CAUTION checks through a spec block row (the trigger recounts). */
async function giveChecks(buildId: string, n: number, c = 0) {
	const checks = [
		...Array.from({ length: n }, (_, i) => ({ id: `d${i}`, level: 'danger', message: 'test danger', values: {} })),
		...Array.from({ length: c }, (_, i) => ({ id: `c${i}`, level: 'caution', message: 'test caution', values: {} }))
	];
	await db.insert(schema.specBlock).values({ buildId, kind: 'supply', data: {}, derived: {}, checks: checks as schema.StoredCheck[] });
}

describe('desk pages, filters and orders', () => {
	const base = Date.UTC(2001, 0, 1, 12, 0, 0);
	let ids: string[] = [];
	let rows: { id: string; at: Date; mains: boolean; danger: number; category: string }[] = [];

	beforeAll(async () => {
		// Eleven waiting builds; three share one request time, so only the id orders them.
		const at = [0, 1, 2, 2, 2, 3, 4, 5, 6, 7, 8].map((m) => new Date(base + m * 60_000));
		const danger = [0, 2, 1, 2, 0, 3, 1, 0, 2, 2, 0];
		const built = await insertBuilds(
			maker.id,
			at.map((t, i) => ({ reviewRequestedAt: t, mainsPowered: i % 2 === 0, category: i % 3 === 0 ? 'preamp' : 'power-amp' }))
		);
		ids = built.map((b) => b.id);
		for (let i = 0; i < ids.length; i++) if (danger[i]) await giveChecks(ids[i], danger[i], 1);
		rows = built.map((b, i) => ({ id: b.id, at: at[i], mains: i % 2 === 0, danger: danger[i], category: i % 3 === 0 ? 'preamp' : 'power-amp' }));
	});

	const mine = (seen: string[]) => seen.filter((id) => ids.includes(id));
	const byOldest = (a: (typeof rows)[0], b: (typeof rows)[0]) => a.at.getTime() - b.at.getTime() || (a.id < b.id ? -1 : 1);

	it('the triggers copy each request with its mains flag, category and DANGER/CAUTION counts', async () => {
		const rr = await db.select().from(schema.reviewRequest).where(inArray(schema.reviewRequest.buildId, ids));
		expect(rr).toHaveLength(11);
		for (const r of rows) {
			const got = rr.find((x) => x.buildId === r.id)!;
			expect(got).toMatchObject({ mainsPowered: r.mains, category: r.category, dangerChecks: r.danger, cautionChecks: r.danger ? 1 : 0, rereview: false });
			expect(got.requestedAt.getTime()).toBe(r.at.getTime());
		}
	});

	it('oldest first: pages of 4 by cursor, each build once, ties broken by id', async () => {
		const seen = mine(await walk(q(), 4));
		// Expected order written out independently: request time, then id (uuid text order = PostgreSQL uuid order).
		expect(seen).toEqual([...rows].sort(byOldest).map((r) => r.id));
	});

	it('most DANGER first: count down, then oldest, then id — across pages of 3', async () => {
		const seen = mine(await walk(q({ sort: 'danger' }), 3));
		const expected = [...rows].sort((a, b) => b.danger - a.danger || byOldest(a, b)).map((r) => r.id);
		expect(seen).toEqual(expected);
	});

	it('filters: mains powered with DANGER checks, category, re-review, waiting at least a week', async () => {
		const mainsDanger = mine(await walk(q({ mains: true, danger: true, sort: 'danger' }), 2));
		expect(mainsDanger).toEqual(
			rows
				.filter((r) => r.mains && r.danger > 0)
				.sort((a, b) => b.danger - a.danger || byOldest(a, b))
				.map((r) => r.id)
		);
		expect(mainsDanger.length).toBeGreaterThan(1);
		const preamp = mine(await walk(q({ category: 'preamp' }), 5));
		expect(preamp).toEqual(rows.filter((r) => r.category === 'preamp').sort(byOldest).map((r) => r.id));

		// All eleven were asked in 2001: all wait "at least 30 days"; none has been waiting a day if "now" is 2001-01-01 12:30.
		expect(mine(await walk(q({ waiting: '30' }), 25))).toHaveLength(11);
		expect(mine(await walk(q({ waiting: '1' }), 25, new Date(base + 30 * 60_000)))).toHaveLength(0);

		expect(mine(await walk(q({ kind: 'again' }), 25))).toEqual([]);
		expect(mine(await walk(q({ kind: 'first' }), 25))).toHaveLength(11);
	});

	it('the desk row follows the build: mains, archived, review cleared, checks changed', async () => {
		await db.update(schema.build).set({ mainsPowered: true }).where(eq(schema.build.id, ids[1]));
		expect((await db.select().from(schema.reviewRequest).where(eq(schema.reviewRequest.buildId, ids[1])))[0].mainsPowered).toBe(true);
		await db.update(schema.specBlock).set({ checks: [] }).where(eq(schema.specBlock.buildId, ids[1]));
		expect((await db.select().from(schema.reviewRequest).where(eq(schema.reviewRequest.buildId, ids[1])))[0].dangerChecks).toBe(0);

		await db.update(schema.build).set({ status: 'archived' }).where(eq(schema.build.id, ids[2]));
		expect(mine(await walk(q(), 25))).not.toContain(ids[2]);
		await db.update(schema.build).set({ reviewRequestedAt: null }).where(eq(schema.build.id, ids[3]));
		expect(await getDeskEntry(ids[3])).toBeNull();
		expect(mine(await walk(q(), 25))).toHaveLength(9);
	});

	it('a request after a sign-off or send-back is a re-review', async () => {
		const [b] = await insertBuilds(maker.id, [{}]);
		await insertReview(b.id, reviewer.id, 'rework', 1);
		await db.update(schema.build).set({ reviewRequestedAt: new Date(base) }).where(eq(schema.build.id, b.id));
		expect((await getDeskEntry(b.id))?.rereview).toBe(true);
		expect((await walk(q({ kind: 'again' }), 25)).includes(b.id)).toBe(true);
		expect((await walk(q({ kind: 'first' }), 25)).includes(b.id)).toBe(false);
	});

	it('a query string with nonsense in it falls back to the defaults; a forged cursor starts at the top', async () => {
		expect(parseDeskQuery(new URLSearchParams('mains=1&category=toaster&sort=loudest&waiting=2&kind=again'))).toEqual(
			q({ mains: true, kind: 'again' })
		);
		const top = await listDesk(q(), null, 3);
		expect((await listDesk(q(), 'not-a-cursor', 3)).items.map((w) => w.id)).toEqual(top.items.map((w) => w.id));
		const forged = Buffer.from(JSON.stringify({ t: 'x', id: "'; drop table build; --" })).toString('base64url');
		expect((await listDesk(q(), forged, 3)).items.map((w) => w.id)).toEqual(top.items.map((w) => w.id));
	});
});

describe('each desk query uses its index (EXPLAIN)', () => {
	it('at 6000 waiting requests the planner reads the named index for every desk query', async () => {
		// Requests dated 2100, after every other test's (test files run one at a time); removed at the end.
		const owner = explainOwner;
		// A bulk load on a shared, loaded machine: no statement time limit for these two statements.
		await db.transaction(async (tx) => {
			await tx.execute(sql`set local statement_timeout = 0`);
			await tx.execute(sql`
			insert into build (slug, owner_id, title, category, topology, mains_powered, status, review_requested_at)
			select 'explain-' || ${owner.id} || '-' || g, ${owner.id}, 'Explain ' || g,
				(array['power-amp','preamp','headphone-amp','dac','power-supply','crossover','test-gear','other'])[1 + g % 8],
				'class-ab-chip', g % 3 = 0, 'published', timestamp '2100-01-01' + g * interval '1 minute'
			from generate_series(1, 6000) g`);
			await tx.execute(sql`update review_request rr set danger_checks = (hashtext(rr.build_id::text) & 7) % 4
			from build b where b.id = rr.build_id and b.owner_id = ${owner.id}`);
		});
		await db.execute(sql`analyze review_request`);
		await db.execute(sql`analyze build`);
		try {
			for (const d of DESK_QUERIES) {
				const { sql: text, params } = deskPageSql(d.query);
				const plan = await db.$client.unsafe(`explain (format json) ${text}`, params as never[]);
				const json = JSON.stringify(plan);
				expect(json, `${d.name} → ${json.slice(0, 600)}`).toContain(`"Index Name":"${d.index}"`);
			}
		} finally {
			await db.transaction(async (tx) => {
				await tx.execute(sql`set local statement_timeout = 0`);
				await tx.delete(schema.build).where(eq(schema.build.ownerId, owner.id));
			});
		}
	}, 240_000);
});

describe('claims: "I\'m reviewing this"', () => {
	it('of two reviewers claiming at once, exactly one wins; five times over', async () => {
		for (let i = 0; i < 5; i++) {
			const [b] = await insertBuilds(maker2.id, [{ reviewRequestedAt: new Date() }]);
			const results = await Promise.allSettled([claimRequest(reviewer, b.id), claimRequest(reviewer2, b.id)]);
			const won = results.filter((r) => r.status === 'fulfilled');
			const lost = results.filter((r) => r.status === 'rejected') as PromiseRejectedResult[];
			expect(won).toHaveLength(1);
			expect(lost).toHaveLength(1);
			expect(lost[0].reason).toMatchObject({ status: 409 });
			const holder = results[0].status === 'fulfilled' ? reviewer : reviewer2;
			expect((await getDeskEntry(b.id))?.claim?.byId).toBe(holder.id);
		}
	});

	it('who may claim and release; a claim lapses after REVIEW_CLAIM_HOURS; a sign-off or send-back waits for the holder', async () => {
		const b = await createPublishedBuild(maker2);
		await requestReview(maker2, b.id, undefined, 'Please look at the earth bond\u0000 in step 1.');
		expect((await getDeskEntry(b.id))?.note).toBe('Please look at the earth bond in step 1.');

		await expect(claimRequest(maker2, b.id)).rejects.toMatchObject({ status: 403 });
		// Another maker's draft does not exist for a reviewer: 404, not a tell-tale 409.
		const [draft] = await insertBuilds(maker.id, [{ status: 'draft' }]);
		await expect(claimRequest(reviewer, draft.id)).rejects.toMatchObject({ status: 404 });
		await expect(claimRequest(maker, b.id)).rejects.toMatchObject({ status: 403 });
		expect(await claimRequest(reviewer, b.id)).toBe('claimed');
		expect(await claimRequest(reviewer, b.id)).toBe('renewed');
		await expect(claimRequest(reviewer2, b.id)).rejects.toMatchObject({ status: 409 });
		const page = (await listDesk(q(), null, 500)).items.find((w) => w.id === b.id)!;
		expect(page.claim?.byId).toBe(reviewer.id);
		expect(page.note).toContain('earth bond');
		expect(page.claim!.until.getTime() - page.claim!.at.getTime()).toBe(claimHours() * 3_600_000);

		// Another reviewer cannot give the verdict while the claim holds, nor release it; a moderator can.
		await expect(submitReview(reviewer2, b.id, { verdict: 'rework', summary: 'Checked the earth bond, it is loose.' }, { notify: false })).rejects.toMatchObject({
			status: 409
		});
		await expect(releaseClaim(reviewer2, b.id)).rejects.toMatchObject({ status: 403 });
		expect(await releaseClaim(moderator, b.id)).toBe(true);
		expect((await getDeskEntry(b.id))?.claim).toBeNull();

		// Claimed again; just past the claim period it has lapsed and another reviewer may take it.
		await claimRequest(reviewer, b.id);
		const later = new Date(Date.now() + claimHours() * 3_600_000 + 60_000);
		expect((await getDeskEntry(b.id, later))?.claim).toBeNull();
		expect(await claimRequest(reviewer2, b.id, later)).toBe('claimed');
		expect((await getDeskEntry(b.id, later))?.claim?.byId).toBe(reviewer2.id);

		// The holder's verdict ends the request, the claim with it.
		await submitReview(reviewer2, b.id, { verdict: 'rework', summary: 'Earth bond needs a star washer.', checklist: [] }, { notify: false });
		expect(await getDeskEntry(b.id)).toBeNull();
		await expect(claimRequest(reviewer, b.id)).rejects.toMatchObject({ status: 409 });
	});
});

describe('reviewer digest', () => {
	it('ten requests in a followed category make one scheduled job and one mail listing all ten', async () => {
		await setFollowedCategories(follower, ['headphone-amp', 'nonsense']);
		await setFollowedCategories(bystander, ['dac']);
		const [{ email }] = await db.select({ email: schema.user.email }).from(schema.user).where(eq(schema.user.id, follower.id));
		const t0 = new Date(Date.now() - 1000);

		const built = await insertBuilds(
			asker.id,
			Array.from({ length: 10 }, (_, i) => ({ title: `Digest headphone amp ${i} ${asker.handle}`, category: 'headphone-amp' }))
		);
		for (const b of built) expect(await requestReview(asker, b.id)).toBe('queued');

		const jobs = await db.execute<{ n: number }>(
			sql`select count(*)::int as n from pgboss.job where name = 'review-digest' and singleton_key in (${follower.id}, ${bystander.id}) and created_on >= ${t0.toISOString()}::timestamptz`
		);
		expect([...jobs][0].n).toBe(1);

		expect(await sendReviewDigest(follower.id)).not.toBeNull();
		const mail = await db.execute<{ subject: string; text: string }>(
			sql`select data->>'subject' as subject, data->>'text' as text from pgboss.job where name = 'mail' and data->>'to' = ${email} and created_on >= ${t0.toISOString()}::timestamptz`
		);
		const got = [...mail];
		expect(got).toHaveLength(1);
		expect(got[0].subject).toMatch(/^\d+ new builds to review$/);
		for (const b of built) expect(got[0].text).toContain(`/builds/${b.slug}/review`);

		// Nothing new since: no second mail. The bystander follows another category: nothing.
		expect(await sendReviewDigest(follower.id)).toBeNull();
		expect(await sendReviewDigest(bystander.id)).toBeNull();
		expect(await queuedMailTo(email, t0)).toHaveLength(1);
	});
});
