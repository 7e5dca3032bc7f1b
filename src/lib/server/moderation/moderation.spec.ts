// Integration (real PostgreSQL): comments (threading, edit window, locks, hiding), reports, moderation
// actions and the audit log they write, and the signed unsubscribe link.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { stopMail } from '../mail';
import { createTestUser, removeTestUsers } from '../testing/builds';
import { createPublishedBuild, queuedMailTo, type TestBuild } from '../testing/reviews';
import { deleteComment, editComment, listComments, postComment, requireCommentableBuild, EDIT_WINDOW_MS } from '../comments';
import { closeReport, fileReport, listAudit, listReports, setBuildLocked, setCommentHidden, setMemberSuspended } from './index';
import { setNotification, unsubscribeToken, verifyUnsubscribeToken } from '../notifications';

type U = Awaited<ReturnType<typeof createTestUser>>;
let owner: U, reader: U, replier: U, moderator: U, admin: U;
let build: TestBuild;
const users: string[] = [];
const ref = () => requireCommentableBuild(build.slug, owner);

beforeAll(async () => {
	owner = await createTestUser('maker', 'Comment owner');
	reader = await createTestUser('maker', 'Comment reader');
	replier = await createTestUser('maker', 'Replier');
	moderator = await createTestUser('moderator', 'Mod');
	admin = await createTestUser('admin', 'Admin');
	users.push(owner.id, reader.id, replier.id, moderator.id, admin.id);
	build = await createPublishedBuild(owner);
});

afterAll(async () => {
	await removeTestUsers(users);
	await stopMail();
});

async function emailOf(id: string) {
	return (await db.select({ email: schema.user.email }).from(schema.user).where(eq(schema.user.id, id)))[0].email;
}

describe('comments', () => {
	it('threads one level, sanitizes, notifies the parent author unless they opted out', async () => {
		const b = await ref();
		const top = await postComment(reader, b, { body: 'How warm does the **heatsink** get? <img src=x onerror=alert(1)>' });
		expect(top.bodyHtml).toContain('<strong>heatsink</strong>');
		expect(top.bodyHtml).not.toMatch(/onerror|<img/);

		const since = new Date(Date.now() - 1000);
		const reply = await postComment(replier, b, { body: 'About 45 °C after an hour.', parentId: top.id });
		expect(reply.parentId).toBe(top.id);
		expect((await queuedMailTo(await emailOf(reader.id), since)).map((m) => m.subject)).toEqual([
			`${replier.name} replied to your comment on “${build.title}”`
		]);

		// A reply to a reply, or to a comment of another build, is refused.
		await expect(postComment(reader, b, { body: 'nested', parentId: reply.id })).rejects.toMatchObject({ status: 422 });
		const otherBuild = await createPublishedBuild(owner);
		const elsewhere = await postComment(reader, await requireCommentableBuild(otherBuild.slug, reader), { body: 'Elsewhere' });
		await expect(postComment(reader, b, { body: 'cross', parentId: elsewhere.id })).rejects.toMatchObject({ status: 422 });

		// Opted out: no mail queued.
		await setNotification(reader.id, 'reply', false);
		const since2 = new Date();
		await postComment(replier, b, { body: 'Second reply.', parentId: top.id });
		expect(await queuedMailTo(await emailOf(reader.id), since2)).toEqual([]);

		const tree = await listComments(b.id, null);
		const t = tree.find((c) => c.id === top.id)!;
		expect(t.replies.map((r) => r.bodyHtml)).toEqual(['<p>About 45 °C after an hour.</p>\n', '<p>Second reply.</p>\n']);
		expect(t.mine).toBeUndefined();
		expect((await listComments(b.id, reader)).find((c) => c.id === top.id)?.mine).toBe(true);
	});

	it('only the author edits, within 15 minutes; only the author deletes', async () => {
		const b = await ref();
		const c = await postComment(reader, b, { body: 'First thought.' });
		await expect(editComment(replier, b, c.id, 'hijack')).rejects.toMatchObject({ status: 403 });
		await expect(editComment(moderator, b, c.id, 'moderated')).rejects.toMatchObject({ status: 403 });
		const edited = await editComment(reader, b, c.id, 'Second thought.');
		expect(edited.bodyHtml).toContain('Second thought.');
		expect(edited.editedAt).not.toBeNull();

		await db
			.update(schema.comment)
			.set({ createdAt: new Date(Date.now() - EDIT_WINDOW_MS - 60_000) })
			.where(eq(schema.comment.id, c.id));
		await expect(editComment(reader, b, c.id, 'Too late.')).rejects.toMatchObject({ status: 403 });

		await expect(deleteComment(replier, b, c.id)).rejects.toMatchObject({ status: 403 });
		await deleteComment(reader, b, c.id);
		expect((await listComments(b.id, reader)).some((x) => x.id === c.id)).toBe(false);
	});

	it('no comments on a locked build; rate limit per member', async () => {
		const b = await ref();
		await setBuildLocked(moderator, b.id, true, 'Cooling-off period');
		await expect(postComment(reader, await ref(), { body: 'Still here?' })).rejects.toMatchObject({ status: 403 });
		await setBuildLocked(moderator, b.id, false, 'Back open');

		const fast = await createTestUser('maker', 'Fast typist');
		users.push(fast.id);
		const open = await ref();
		const results = [];
		for (let i = 0; i < 7; i++) results.push(await postComment(fast, open, { body: `Comment ${i}` }).then(() => 'ok', (e) => e.status));
		expect(results).toEqual(['ok', 'ok', 'ok', 'ok', 'ok', 'ok', 429]);
	});
});

describe('reports and moderation', () => {
	it('a report is queued once per reporter, hiding closes it, readers lose the comment, the audit log has it', async () => {
		const b = await ref();
		const bad = await postComment(replier, b, { body: 'Just bridge the fuse, it keeps blowing.' });
		const r1 = await fileReport(reader, { targetKind: 'comment', targetId: bad.id, reason: 'Dangerous advice about the fuse' });
		const again = await fileReport(reader, { targetKind: 'comment', targetId: bad.id, reason: 'Again' });
		expect(again).toEqual({ id: r1.id, duplicate: true });
		await fileReport(owner, { targetKind: 'comment', targetId: bad.id, reason: 'Please remove' });
		await expect(fileReport(reader, { targetKind: 'comment', targetId: crypto.randomUUID(), reason: 'No such thing' })).rejects.toMatchObject({
			status: 422
		});

		const queue = await listReports('open');
		const item = queue.find((q) => q.targetId === bad.id)!;
		expect(item.reports.map((r) => r.reason)).toEqual(['Dangerous advice about the fuse', 'Please remove']);
		expect(item.context.excerpt).toContain('bridge the fuse');

		await expect(setCommentHidden(reader, bad.id, true, 'not a moderator')).rejects.toMatchObject({ status: 403 });
		await expect(setCommentHidden(moderator, bad.id, true, 'x')).rejects.toMatchObject({ status: 422 });
		await setCommentHidden(moderator, bad.id, true, 'Unsafe advice: bypassing a fuse');

		expect((await listComments(b.id, reader)).some((c) => c.id === bad.id)).toBe(false);
		expect((await listComments(b.id, moderator)).find((c) => c.id === bad.id)?.hidden).toBe(true);
		expect((await listReports('open')).some((q) => q.targetId === bad.id)).toBe(false);
		await expect(postComment(reader, b, { body: 'reply to hidden', parentId: bad.id })).rejects.toMatchObject({ status: 422 });

		await expect(listAudit(moderator, {})).rejects.toMatchObject({ status: 403 });
		const log = await listAudit(admin, { action: 'comment.hide', targetKind: 'comment' });
		const entry = log.entries.find((e) => e.targetId === bad.id)!;
		expect(entry).toMatchObject({ reason: 'Unsafe advice: bypassing a fuse', actorName: moderator.name });
		const byActor = await listAudit(admin, { actor: moderator.name.split(' ').pop() });
		expect(byActor.entries.every((e) => e.actorName === moderator.name)).toBe(true);
		const today = new Date().toISOString().slice(0, 10);
		expect((await listAudit(admin, { action: 'comment.hide', from: '2001-01-01', to: '2001-12-31' })).entries).toEqual([]);
		expect((await listAudit(admin, { action: 'comment.hide', from: today, to: today })).entries.some((e) => e.targetId === bad.id)).toBe(true);
	});

	it('closing a report closes the others about the same thing; suspension is audited and ends sessions', async () => {
		const target = await createTestUser('maker', 'Reported member');
		users.push(target.id);
		const a = await fileReport(reader, { targetKind: 'member', targetId: target.id, reason: 'Spam in every comment' });
		await fileReport(owner, { targetKind: 'member', targetId: target.id, reason: 'Spam links' });
		await expect(closeReport(reader, a.id, 'self-service')).rejects.toMatchObject({ status: 403 });
		await closeReport(moderator, a.id, 'Looked at it: one off-topic comment, no action.');
		const rows = await db.select().from(schema.report).where(eq(schema.report.targetId, target.id));
		expect(rows.map((r) => r.state)).toEqual(['closed', 'closed']);
		await expect(closeReport(moderator, a.id, 'again please')).rejects.toMatchObject({ status: 409 });

		await db.insert(schema.session).values({ id: crypto.randomUUID(), token: crypto.randomUUID(), userId: target.id, expiresAt: new Date(Date.now() + 3_600_000) });
		await setMemberSuspended(moderator, target.id, true, 'Spam account');
		expect(await db.select().from(schema.session).where(eq(schema.session.userId, target.id))).toEqual([]);
		const [u] = await db.select().from(schema.user).where(eq(schema.user.id, target.id));
		expect(u.suspendedAt).not.toBeNull();
		const log = await listAudit(admin, { action: 'member.suspend' });
		expect(log.entries.some((e) => e.targetId === target.id && e.reason === 'Spam account')).toBe(true);
		await expect(setMemberSuspended(moderator, admin.id, true, 'Not allowed')).rejects.toMatchObject({ status: 403 });
	});
});

describe('unsubscribe links', () => {
	it('round-trip, and refuse any tampering', async () => {
		const t = unsubscribeToken(reader.id, 'flag');
		expect(verifyUnsubscribeToken(t)).toEqual({ userId: reader.id, kind: 'flag' });
		const [payload, sig] = t.split('.');
		const forged = Buffer.from(`${owner.id}\nflag`).toString('base64url');
		expect(verifyUnsubscribeToken(`${forged}.${sig}`)).toBeNull();
		expect(verifyUnsubscribeToken(`${payload}.${sig.slice(0, -2)}xx`)).toBeNull();
		expect(verifyUnsubscribeToken(`${payload}`)).toBeNull();
		expect(verifyUnsubscribeToken('')).toBeNull();
		expect(verifyUnsubscribeToken(unsubscribeToken(reader.id, 'flag').replace('.', '..'))).toBeNull();
	});
});
