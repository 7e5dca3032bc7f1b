// Comments, reports and the moderation desk end to end in Chromium: hostile Markdown never runs, a member
// reports a comment, a moderator hides it, readers no longer see it, and the admin's audit log has the entry.
import { test, expect, type Browser, type Page } from '@playwright/test';
import { signIn } from './helpers/auth';
import { createPublishedBuild, origin, uniqueTitle } from './helpers/builds';

async function as(browser: Browser, email: string): Promise<Page> {
	const ctx = await browser.newContext();
	const page = await ctx.newPage();
	await signIn(page, email);
	return page;
}

/** Fail the test if any page opens a dialog (alert/confirm/prompt) — the XSS canary. */
function guard(page: Page, dialogs: string[]) {
	page.on('dialog', async (d) => {
		dialogs.push(d.message());
		await d.dismiss();
	});
}

const XSS = [
	'Nice build <img src=x onerror="alert(\'img\')"> and <script>alert("script")</script>',
	'[click me](javascript:alert("link")) <svg onload=alert("svg")></svg> <a href="jav&#x09;ascript:alert(\'tab\')">tab</a>',
	'**still bold** <iframe src="javascript:alert(\'frame\')"></iframe> <details open ontoggle=alert("toggle")>x</details>',
	'<img src=x onerror="alert(\'block\')">'
].join('\n\n');

test('hostile comments never run; a reported comment is hidden by a moderator, vanishes for readers and is audited', async ({ browser }) => {
	test.setTimeout(150_000);
	const dialogs: string[] = [];

	// Aiko publishes a build and comments on it with hostile markup.
	const aiko = await as(browser, 'aiko@starground.test');
	guard(aiko, dialogs);
	const build = await createPublishedBuild(aiko, { title: uniqueTitle('Passive preamp'), supply: false });
	const url = `/builds/${build.slug}`;
	await aiko.goto(url, { waitUntil: 'networkidle' });
	await aiko.getByLabel('Add a comment (Markdown)').fill(XSS);
	await aiko.getByRole('button', { name: 'Post comment' }).click();
	// A plain form (the build page ships no JavaScript): the page comes back at the new comment.
	const posted = aiko.locator('[data-comment]').filter({ hasText: 'Nice build' });
	await expect(posted).toBeVisible();
	expect(new URL(aiko.url()).hash).toBe(`#comment-${await posted.getAttribute('data-comment')}`);
	const body = posted.locator('[data-comment-body]');
	await expect(body.locator('strong')).toHaveText('still bold');
	await expect(body.locator('script, iframe, svg, img, [onerror], [onload], [ontoggle]')).toHaveCount(0);
	await expect(body.locator('a[href^="javascript"], a[href*="script:"]')).toHaveCount(0);

	// A plain comment that stays, to show hiding is targeted.
	await aiko.getByLabel('Add a comment (Markdown)').fill('Measured 4 mV DC offset on both channels.');
	await aiko.getByRole('button', { name: 'Post comment' }).click();
	await expect(aiko.locator('[data-comment]').filter({ hasText: '4 mV DC offset' })).toBeVisible();

	// Joss reads (server-rendered) and reports the hostile comment.
	const joss = await as(browser, 'joss@starground.test');
	guard(joss, dialogs);
	await joss.goto(url, { waitUntil: 'networkidle' });
	const target = joss.locator('[data-comment]').filter({ hasText: 'Nice build' });
	await expect(target).toBeVisible();
	const commentId = await target.getAttribute('data-comment');
	expect(commentId).toMatch(/^[0-9a-f-]{36}$/);
	await target.locator('[data-comment-report] summary').click();
	await target.getByLabel(/Why should a moderator look/).fill('Markup that tries to run scripts in readers’ browsers.');
	await target.getByRole('button', { name: 'Send report' }).click();
	await expect(target.getByText(/Reported — thank you/)).toBeVisible();

	// Tomas hides it from the moderation desk.
	const tomas = await as(browser, 'tomas@starground.test');
	guard(tomas, dialogs);
	await tomas.goto('/moderation', { waitUntil: 'networkidle' });
	const report = tomas.locator('[data-report-kind="comment"]').filter({ has: tomas.locator(`a[href$="#comment-${commentId}"]`) });
	await expect(report).toHaveCount(1);
	await expect(report.locator('[data-excerpt]')).toContainText('Nice build');
	const why = `Script injection attempt ${Date.now().toString(36)}`;
	await report.getByLabel(/Reason/).fill(why);
	await report.getByRole('button', { name: 'Hide comment' }).click();
	await expect(tomas.getByText('Comment hidden from readers')).toBeVisible();
	await expect(tomas.locator(`[data-hidden-comment="${commentId}"]`)).toBeVisible();
	// Moderators still see it, marked hidden.
	await tomas.goto(url, { waitUntil: 'networkidle' });
	await expect(tomas.locator(`[data-comment="${commentId}"]`)).toContainText('hidden from readers');

	// Readers (signed out and signed in) no longer see it; the other comment stays.
	const reader = await browser.newPage();
	guard(reader, dialogs);
	await reader.goto(url, { waitUntil: 'networkidle' });
	await expect(reader.locator('[data-comment]').filter({ hasText: '4 mV DC offset' })).toBeVisible();
	await expect(reader.locator(`[data-comment="${commentId}"]`)).toHaveCount(0);
	await expect(reader.getByText('Nice build')).toHaveCount(0);
	const api = await reader.request.get(`${origin()}/api/v1/builds/${build.slug}/comments`);
	expect(api.status()).toBe(200);
	const listed = await api.json();
	expect(listed.items.map((c: { id: string }) => c.id)).not.toContain(commentId);
	await joss.goto(url, { waitUntil: 'networkidle' });
	await expect(joss.locator(`[data-comment="${commentId}"]`)).toHaveCount(0);

	// The audit log: admins read it (with the reason); moderators may not.
	const ilse = await as(browser, 'ilse@starground.test');
	await ilse.goto('/admin/audit?action=comment.hide', { waitUntil: 'networkidle' });
	const entry = ilse.locator('[data-audit="comment.hide"]').filter({ hasText: why });
	await expect(entry).toHaveCount(1);
	await expect(entry).toContainText('Tomas Eberhart');
	await expect(ilse.getByLabel('Action')).toHaveValue('comment.hide');
	const denied = await tomas.goto('/admin/audit');
	expect(denied?.status()).toBe(403);

	expect(dialogs).toEqual([]);
});

test('a refused post keeps the draft and says why; replies thread one level; own comments can be edited and deleted', async ({ browser }) => {
	const oskar = await as(browser, 'oskar@starground.test');
	const build = await createPublishedBuild(oskar, { supply: false });
	await oskar.goto(`/builds/${build.slug}`, { waitUntil: 'networkidle' });

	// The server refuses an over-long comment: the page comes back with the text still in the box and the reason.
	const tooLong = 'x'.repeat(5001);
	const box = oskar.getByLabel('Add a comment (Markdown)');
	await box.evaluate((el, v) => {
		(el as HTMLTextAreaElement).removeAttribute('maxlength');
		(el as HTMLTextAreaElement).value = v;
	}, tooLong);
	await oskar.getByRole('button', { name: 'Post comment' }).click();
	await expect(oskar.locator('[data-comments] [role="alert"]')).toContainText(/under 5000 characters/);
	await expect(box).toHaveValue(tooLong);
	await expect(oskar.locator('[data-comment]')).toHaveCount(0);

	await box.fill('Which insulator did you use under the tab?');
	await oskar.getByRole('button', { name: 'Post comment' }).click();
	const saved = oskar.locator('[data-comment]').filter({ hasText: 'Which insulator' });
	await expect(saved).toBeVisible();
	const mineId = await saved.getAttribute('data-comment');
	expect(mineId).toMatch(/^[0-9a-f-]{36}$/);
	const mine = oskar.locator(`[data-comment="${mineId}"]`);
	await expect(box).toHaveValue('');

	// Edit within the window.
	await mine.locator('[data-comment-edit] summary').click();
	await mine.getByLabel('Edit your comment').fill('Which insulator did you use under the tab, mica or pad?');
	await mine.getByRole('button', { name: 'Save' }).click();
	await expect(mine).toContainText('mica or pad?');
	await expect(mine).toContainText('(edited)');

	// Another member replies; the reply sits under the comment and has no reply form of its own.
	const joss = await as(browser, 'joss@starground.test');
	await joss.goto(`/builds/${build.slug}`, { waitUntil: 'networkidle' });
	const parent = joss.locator('li').filter({ has: joss.locator('[data-comment]').filter({ hasText: 'mica or pad?' }) }).first();
	await parent.locator('[data-comment-reply] summary').first().click();
	await joss.getByLabel(/Your reply to/).fill('Mica with grease; pads dry out.');
	await joss.getByRole('button', { name: 'Post reply' }).click();
	const reply = parent.locator('ol [data-comment]').filter({ hasText: 'pads dry out' });
	await expect(reply).toBeVisible();
	await expect(parent.locator('[data-comment-reply]')).toHaveCount(1);

	// Joss deletes the reply: asked first, then gone, and the page says so.
	await reply.locator('[data-comment-delete] summary').click();
	await reply.getByRole('button', { name: 'Yes, delete it' }).click();
	await expect(joss.locator('[data-comment-outcome]')).toHaveText('Your comment is deleted.');
	await expect(joss.locator('[data-comment]').filter({ hasText: 'pads dry out' })).toHaveCount(0);
});
