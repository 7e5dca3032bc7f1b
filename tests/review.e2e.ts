// The review flow end to end in Chromium: a maker asks for review, a reviewer tags hazards on the heatsink
// step and the supply block and sends the build back for changes, the maker gets the mail, marks the tags
// fixed and edits the build, the stamp says it was edited since, and the reviewer clears the tags and signs
// off the new revision as safe.
import { test, expect } from '@playwright/test';
import { signedInPage } from './helpers/auth';
import { waitForMail, linkIn } from './helpers/mail';
import { createPublishedBuild } from './helpers/builds';

const as = signedInPage;

test('ask for review → hazard tags and send-back → mail → fixed and edited → edited since → cleared and signed off', async ({ browser }) => {
	test.setTimeout(180_000);
	const joss = await as(browser, 'joss@starground.test');
	const build = await createPublishedBuild(joss);
	const buildUrl = `/builds/${build.slug}`;

	// The maker asks for review.
	await joss.goto(buildUrl, { waitUntil: 'networkidle' });
	const reviewBox = joss.locator('#review-state');
	await expect(reviewBox.locator('[data-review-label]')).toHaveText(/Not reviewed/);
	await reviewBox.getByRole('link', { name: 'Ask for review' }).click();
	await joss.getByLabel('Note for the reviewer (optional)').fill('Please check the heatsink insulation first.');
	await joss.getByRole('button', { name: 'Put Rev A on the review desk' }).click();
	await expect(joss.locator('[data-outcome]')).toHaveText(/Review asked: your build is on the review desk/);
	await expect(reviewBox.locator('[data-waiting]')).toBeVisible();
	await expect(reviewBox.locator('[data-review-label]')).toHaveAttribute('data-review-label', 'waiting');

	// The reviewer finds it on the desk (with its mains marker) and opens review mode.
	const maren = await as(browser, 'maren@starground.test');
	await maren.goto('/review-desk', { waitUntil: 'networkidle' });
	const row = maren.locator(`[data-desk-build="${build.slug}"]`);
	await expect(row).toBeVisible();
	await expect(row.locator('[data-mains]')).toBeVisible();
	await expect(row.locator('[data-maker-note]')).toContainText('Please check the heatsink insulation first.');
	await row.getByRole('link', { name: 'Review' }).click();
	await expect(maren).toHaveURL(new RegExp(`${buildUrl}/review$`));

	// Tag a hazard on the heatsink step…
	const heatsink = maren.locator('[data-review-target="step"]').filter({ hasText: 'Heatsink and mounting' });
	await heatsink.getByText(/Tag a hazard on step 2/).click();
	await heatsink.getByLabel('What kind of hazard').selectOption('heat');
	await heatsink.getByLabel('Fix before use').check();
	await heatsink.getByLabel(/^Note/).fill('The tab sits at V− and is bolted **straight** to a chassis-bonded heatsink: fit an insulator.');
	await heatsink.getByRole('button', { name: 'Tag the hazard' }).click();
	await expect(heatsink.locator('[data-flag]')).toHaveCount(1);
	await expect(heatsink.locator('[data-flag] strong')).toHaveText('straight');

	// …and the supply block.
	const supply = maren.locator('[data-review-target="spec"]').first();
	await supply.getByText(/Tag a hazard on this supply block/).click();
	await supply.getByLabel('What kind of hazard').selectOption('mains-earth');
	await supply.getByLabel('Do not power up').check();
	await supply.getByLabel(/^Note/).fill('Fuse is sized for the amplifier, not the transformer inrush; check the primary fuse rating.');
	await supply.getByRole('button', { name: 'Tag the hazard' }).click();
	await expect(supply.locator('[data-flag]')).toHaveCount(1);

	// A sign-off is refused while tags are still tagged; a send-back goes through and is recorded against Rev A.
	await maren.getByRole('radio', { name: /^Sign off as safe —/ }).check();
	await maren.getByLabel(/^Summary/).fill('Two points to fix before first power-up: tab insulation and the primary fuse.');
	await maren.getByRole('button', { name: /Record the review of Rev A/ }).click();
	await expect(maren.getByText(/hazard tags? tagged\. Clear/)).toBeVisible();
	await maren.getByRole('radio', { name: /^Send back for changes —/ }).check();
	await maren.getByRole('button', { name: /Record the review of Rev A/ }).click();
	await expect(maren).toHaveURL(new RegExp(`${buildUrl}\\?done=review-rework(#review-state)?$`));
	await expect(maren.locator('[data-outcome]')).toHaveText(/Review recorded: you sent this revision back for changes/);
	await expect(maren.locator('#review-state [data-review-label]')).toHaveText(/Sent back for changes at Rev A/);

	// The maker gets the mails (hazard tag and review), with an unsubscribe link.
	const reviewMail = await waitForMail('joss@starground.test', new RegExp(`Sent back for changes at Rev A: “${build.title}”`));
	expect(reviewMail.text).toContain('Maren Quist');
	expect(reviewMail.text).toMatch(/\/unsubscribe\?token=/);
	const flagMail = await waitForMail('joss@starground.test', new RegExp(`Hazard tagged on “${build.title}”`));
	expect(flagMail.html).toContain('See the hazard tag');
	const tagLink = linkIn(flagMail, '/hazards/');
	expect(new URL(tagLink).pathname).toMatch(new RegExp(`^${buildUrl}/hazards/[0-9a-f-]{36}$`));
	// The tag's page before the move still answers, with a permanent redirect to the new address.
	const old = await joss.request.get(new URL(tagLink).pathname.replace('/hazards/', '/flags/'), { maxRedirects: 0 });
	expect(old.status()).toBe(308);
	expect(old.headers()['location']).toBe(new URL(tagLink).pathname);

	// Its one-click unsubscribe link works without signing in, can be undone, and refuses a forged token.
	const anon = await browser.newPage();
	const unsub = linkIn(flagMail, '/unsubscribe?token=');
	await anon.goto(unsub, { waitUntil: 'networkidle' });
	// Opening the link only asks (mail scanners open links too); the button turns the mail off.
	await anon.getByRole('button', { name: 'Turn these e-mails off' }).click();
	await expect(anon.locator('[data-unsubscribed="flag"]')).toContainText('hazard tag');
	await anon.getByRole('button', { name: /turn it back on/ }).click();
	await expect(anon.getByRole('heading', { name: 'Turned back on' })).toBeVisible();
	const token = new URL(unsub).searchParams.get('token')!;
	const forged = await anon.goto(`/unsubscribe?token=${encodeURIComponent(token.slice(0, -3) + 'AAA')}`);
	expect(forged?.status()).toBe(400);
	await expect(anon.getByText('This unsubscribe link is not valid')).toBeVisible();

	// The maker sees the hazard tags at the top and inline markers, and marks both fixed.
	await joss.goto(buildUrl, { waitUntil: 'networkidle' });
	await expect(joss.locator('#hazards [data-flag]')).toHaveCount(2);
	await expect(joss.locator('#step-2 [data-flag-marker]')).toHaveText(/1 hazard tag to deal with/);
	await expect(joss.locator('#hazards [data-flag-state="open"]').first()).toHaveText('Tagged');
	for (let i = 0; i < 2; i++) {
		const flag = joss.locator('#hazards [data-flag]').filter({ has: joss.locator('[data-flag-state="open"]') }).first();
		await flag.getByText('Mark fixed…').click();
		await flag.getByLabel('What did you change?').fill(i === 0 ? 'Fitted a mica insulator and shoulder washer.' : 'Primary fuse now T2A, sized for the transformer.');
		await flag.getByRole('button', { name: 'Mark fixed' }).click();
		await expect(joss.locator('#hazards [data-flag-state="addressed"]')).toHaveCount(i + 1);
		// The build page is a plain page: the form lands back on it, which says what happened.
		await expect(joss.locator('[data-outcome]')).toHaveText(/Hazard tag marked fixed\./);
	}
	await expect(joss.locator('[data-flag-marker]')).toHaveCount(0);

	// The maker edits the build: a new revision; the stamp says it was edited since the send-back at Rev A.
	await joss.goto(`${buildUrl}/edit`, { waitUntil: 'networkidle' });
	const addStep = joss.locator('form[action="?/addStep"]');
	await addStep.getByLabel('Title').fill('Tab insulation');
	await addStep.getByLabel('Text (Markdown)').fill('Mica with grease on both faces; measured open circuit tab to chassis.');
	await addStep.getByRole('button', { name: 'Add step' }).click();
	await expect(joss.getByRole('heading', { name: /Step 3\s*Tab insulation/ })).toBeVisible();
	// The edit is a pending change until the maker publishes it as a revision with a note.
	await expect(joss.locator('[data-pending-changes]')).toContainText('1 step added');
	await joss.locator('#revision-note').fill('Tab insulation step added.');
	await joss.getByRole('button', { name: /Publish changes as Rev B/ }).click();
	await expect(joss.getByText(/Published as Rev B/)).toBeVisible();
	await joss.goto(buildUrl, { waitUntil: 'networkidle' });
	await expect(joss.locator('#review-state [data-review-label]')).toHaveText(/Edited since send-back at Rev A/);
	await joss.locator('#review-state').getByRole('link', { name: 'Ask for review again' }).click();
	await joss.getByRole('button', { name: 'Put Rev B on the review desk' }).click();
	await expect(joss.locator('[data-outcome]')).toHaveText(/Review asked again/);
	await expect(joss.locator('#review-state [data-waiting]')).toBeVisible();

	// The reviewer clears both tags and signs off Rev B as safe.
	// A re-review: the page opens with what changed since the send-back at Rev A.
	await maren.goto(`${buildUrl}/review`, { waitUntil: 'networkidle' });
	await expect(maren.locator('[data-since-verdict] h2')).toHaveText('Changed since the send-back at Rev A');
	await expect(maren.locator('[data-since-verdict] [data-step-diff="added"]')).toContainText('Tab insulation');
	for (let i = 0; i < 2; i++) {
		const tag = maren.locator('[data-flag]').filter({ has: maren.locator('[data-flag-state="addressed"]') }).first();
		await tag.getByText('Clear the tag…').click();
		await tag.getByLabel(/^Note on clearing/).fill('Checked the new step and the photo.');
		await tag.getByRole('button', { name: 'Clear the tag' }).click();
		await expect(maren.locator('[data-flag-state="resolved"]')).toHaveCount(i + 1);
	}
	await maren.getByRole('radio', { name: /^Sign off as safe —/ }).check();
	await maren.getByLabel(/^Summary/).fill('Tab insulated and the fuse now matches the transformer. Fine to power up.');
	for (const box of await maren.locator('[data-checklist] input[type="checkbox"]').all()) await box.check();
	await maren.getByRole('button', { name: /Record the review of Rev B/ }).click();
	await expect(maren).toHaveURL(new RegExp(`${buildUrl}\\?done=review-safe(#review-state)?$`));

	// Everyone, signed out too, sees "Signed off as safe at Rev B" with the peer-opinion sentence.
	const reader = await browser.newPage();
	await reader.goto(buildUrl, { waitUntil: 'networkidle' });
	await expect(reader.locator('#review-state [data-review-label]')).toHaveText(/Signed off as safe at Rev B/);
	await expect(reader.locator('#review-state [data-review-label]')).not.toHaveText(/Edited since/);
	await expect(reader.locator('[data-peer-opinion]')).toContainText('not a certification');
	await expect(reader.locator('[data-review="rework"]')).toContainText('Sent back for changes at Rev A');
	await expect(reader.locator('[data-review="safe"]')).toContainText('Signed off as safe at Rev B');
	await waitForMail('joss@starground.test', new RegExp(`Signed off as safe at Rev B: “${build.title}”`));
});

test('a maker can never open review mode on their own build, and makers cannot at all', async ({ browser }) => {
	const maren = await as(browser, 'maren@starground.test');
	const own = await createPublishedBuild(maren, { supply: false });
	const res = await maren.goto(`/builds/${own.slug}/review`, { waitUntil: 'networkidle' });
	expect(res?.status()).toBe(403);
	const aiko = await as(browser, 'aiko@starground.test');
	const res2 = await aiko.goto(`/builds/${own.slug}/review`, { waitUntil: 'networkidle' });
	expect(res2?.status()).toBe(403);
});
