// Suspending a member is one act whichever screen it comes from: the members page and the moderation desk
// both call setMemberSuspended, which closes the member's open reports in the same transaction as the
// suspension and its audit entry. Real PostgreSQL; the screens' form actions are called as SvelteKit would.
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';

// The route guards read the current request through getRequestEvent(); give them one we control.
const current: { event: { locals: { user: unknown }; url: URL; request: Request } } = {
	event: { locals: { user: null }, url: new URL('http://x/'), request: new Request('http://x/') }
};
vi.mock('$app/server', () => ({ getRequestEvent: () => current.event }));

const { db } = await import('../db');
const schema = await import('../db/schema');
const { createTestUser, removeTestUsers } = await import('../testing/builds');
const { fileReport } = await import('./index');
const membersPage = await import('../../../routes/admin/members/+page.server');
const desk = await import('../../../routes/moderation/+page.server');

type Member = Awaited<ReturnType<typeof createTestUser>>;
const users: string[] = [];
let moderator: Member;
let reporter: Member;
let witness: Member;

beforeAll(async () => {
	moderator = await createTestUser('moderator', 'Act moderator');
	reporter = await createTestUser('maker', 'Act reporter');
	witness = await createTestUser('maker', 'Act witness');
	users.push(moderator.id, reporter.id, witness.id);
});
afterAll(() => removeTestUsers(users));

/** Post a form to one of the screens' actions, signed in as `who`, as a browser without JavaScript would. */
async function post(screen: 'members' | 'desk', action: string, who: Member, form: Record<string, string>) {
	const path = screen === 'members' ? '/admin/members' : '/moderation';
	const url = new URL(`http://x${path}?/${action}`);
	const request = new Request(url, { method: 'POST', body: new URLSearchParams(form), headers: { accept: 'text/html' } });
	current.event = { locals: { user: { ...who, suspendedAt: null } }, url, request };
	const actions = (screen === 'members' ? membersPage.actions : desk.actions) as Record<string, (e: unknown) => Promise<unknown>>;
	return actions[action]({ request, url, params: {}, locals: current.event.locals });
}

const SUSPEND = { members: { action: 'suspend' }, desk: { action: 'suspendMember' } } as const;

async function reportsAbout(memberId: string) {
	return db.select().from(schema.report).where(and(eq(schema.report.targetKind, 'member'), eq(schema.report.targetId, memberId)));
}
async function memberRow(memberId: string) {
	return (await db.select().from(schema.user).where(eq(schema.user.id, memberId)))[0];
}

/** A member with two open reports about them (by two members). */
async function reportedMember(): Promise<Member> {
	const m = await createTestUser('maker', 'Reported member');
	users.push(m.id);
	await fileReport({ id: reporter.id, role: 'maker' }, { targetKind: 'member', targetId: m.id, reason: 'Spam links in every comment' });
	await fileReport({ id: witness.id, role: 'maker' }, { targetKind: 'member', targetId: m.id, reason: 'Advertising in comments' });
	return m;
}

/**
 * Make PostgreSQL refuse to close reports about `memberId` for the length of `fn`: a trigger on the report
 * table raises an exception for that target. The act then fails at its last step, after the suspension
 * and the audit entry were written — so if they were in another transaction, they would stay.
 */
async function withReportClosingRefused<T>(memberId: string, fn: () => Promise<T>): Promise<T> {
	const name = `refuse_close_${memberId.replace(/-/g, '_')}`;
	await db.execute(
		sql.raw(`create function ${name}() returns trigger language plpgsql as $$
			begin
				if new.target_id = '${memberId}' and new.state = 'closed' then raise exception 'closing refused by the test'; end if;
				return new;
			end $$;
			create trigger ${name} before update on report for each row execute function ${name}();`)
	);
	try {
		return await fn();
	} finally {
		await db.execute(sql.raw(`drop trigger ${name} on report; drop function ${name}();`));
	}
}

describe('suspending a member (members page and moderation desk alike)', () => {
	for (const screen of ['members', 'desk'] as const) {
		it(`from the ${screen === 'members' ? 'members page' : 'moderation desk'}: closes their open reports with the suspension, in one transaction`, async () => {
			// All or nothing: when closing the reports fails, the suspension and its audit entry are rolled back.
			const m = await reportedMember();
			const reason = `Spam account (${screen})`;
			const refused = await withReportClosingRefused(m.id, () => post(screen, SUSPEND[screen].action, moderator, { userId: m.id, reason })).catch((e: unknown) => e);
			expect(String((refused as { cause?: unknown }).cause ?? refused)).toContain('closing refused by the test');
			expect((await memberRow(m.id)).suspendedAt).toBeNull();
			expect((await reportsAbout(m.id)).map((r) => r.state)).toEqual(['open', 'open']);
			const auditFor = () => db.select().from(schema.auditEntry).where(eq(schema.auditEntry.targetId, m.id));
			expect(await auditFor()).toEqual([]);

			// And when nothing fails: suspended, every open report about them closed by the moderator, audited once.
			const res = await post(screen, SUSPEND[screen].action, moderator, { userId: m.id, reason });
			expect(res).toMatchObject({ ok: 'Member suspended; their sessions have ended.' });
			const row = await memberRow(m.id);
			expect(row.suspendedAt).not.toBeNull();
			expect(row.suspendedReason).toBe(reason);
			const reports = await reportsAbout(m.id);
			expect(reports.map((r) => [r.state, r.handledById, r.resolution])).toEqual([
				['closed', moderator.id, `Member suspended: ${reason}`],
				['closed', moderator.id, `Member suspended: ${reason}`]
			]);
			expect((await auditFor()).map((a) => [a.action, a.actorId, a.reason])).toEqual([['member.suspend', moderator.id, reason]]);
		});
	}

	it('the members page also needs a reason now, and a refusal changes nothing on either screen', async () => {
		const m = await reportedMember();
		// Too short a reason: refused before anything is written (both screens validate the form first).
		expect(await post('members', 'suspend', moderator, { userId: m.id, reason: 'x' })).toMatchObject({ status: 400 });
		expect(await post('desk', 'suspendMember', moderator, { userId: m.id, reason: 'x' })).toMatchObject({ status: 400 });
		// A maker is not a moderator: the guard refuses (403) on both screens.
		for (const [screen, action] of [['members', 'suspend'], ['desk', 'suspendMember']] as const) {
			await expect(post(screen, action, reporter, { userId: m.id, reason: 'Not my call' })).rejects.toMatchObject({ status: 403 });
		}
		expect((await memberRow(m.id)).suspendedAt).toBeNull();
		expect((await reportsAbout(m.id)).map((r) => r.state)).toEqual(['open', 'open']);
	});
});
