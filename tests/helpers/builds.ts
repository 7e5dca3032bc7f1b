// Make builds for end-to-end tests through the app's own form actions over HTTP (as a browser without
// JavaScript would post them), with the signed-in page's cookies. Nothing depends on seed content.
import { expect, type APIRequestContext, type Page } from '@playwright/test';
import { SUPPLY_FORM as SUPPLY_FORM_FIXTURE } from '../../src/lib/specs/fixtures';
import { revisionLabel } from '../../src/lib/revision-label';

export const origin = () => process.env.ORIGIN ?? 'http://127.0.0.1:3100';

/** The spec editor's form fields for a valid mains supply block (fused, earthed metal chassis): one fixture set with the unit tests. */
export const SUPPLY_FORM: Record<string, string> = { ...SUPPLY_FORM_FIXTURE };

/** One parts-list row as the parts editor posts it (a 22k resistor R1; no substitution). */
export const PART_ROW = {
	designators: 'R1',
	quantity: '1',
	kind: 'resistor',
	value: '22k',
	tolerance: '',
	ratingV: '',
	ratingW: '',
	package: '',
	notes: '',
	designValue: '',
	reason: ''
};

/** POST a form action as a browser form would (urlencoded, Accept text/html, same Origin); no redirect following. */
export async function postForm(request: APIRequestContext, path: string, form: Record<string, string>) {
	return request.post(path, {
		form,
		headers: { origin: origin(), accept: 'text/html' },
		maxRedirects: 0
	});
}

/** A title no other run uses, so slugs and mail subjects are unique. */
export function uniqueTitle(base: string): string {
	return `${base} ${Date.now().toString(36)}${Math.random().toString(36).slice(2, 5)}`;
}

export interface MadeBuild {
	slug: string;
	title: string;
}

/**
 * A published build owned by the member signed in on `page`: mains powered, with a mains step, a heatsink
 * step and (unless `supply: false`) a power-supply spec block; published as r1.
 */
export async function createPublishedBuild(page: Page, opts: { title?: string; supply?: boolean } = {}): Promise<MadeBuild> {
	const title = opts.title ?? uniqueTitle('Bench chip amp');
	const req = page.request;
	const created = await postForm(req, '/builds/new', {
		title,
		summary: 'A stereo chip amp built for an end-to-end test.',
		category: 'power-amp',
		topology: 'class-ab-chip',
		mainsPowered: 'on',
		licence: 'CC-BY-SA-4.0'
	});
	expect(created.status(), 'create draft').toBe(303);
	const slug = new URL(created.headers()['location'], origin()).pathname.split('/')[2];
	expect(slug).toBeTruthy();

	for (const step of [
		{ title: 'Mains inlet and fuse', bodyMd: 'Fused IEC inlet; protective earth to the chassis stud.' },
		{ title: 'Heatsink and mounting', bodyMd: 'The chip tab sits at V−; it is bolted straight to the heatsink.' }
	]) {
		const res = await postForm(req, `/builds/${slug}/edit?/addStep`, step);
		expect(res.status(), `add step ${step.title}`).toBe(200);
	}
	if (opts.supply !== false) {
		const res = await postForm(req, `/builds/${slug}/edit/specs?/save`, SUPPLY_FORM);
		expect(res.status(), 'save supply block').toBe(303);
	}
	const pub = await postForm(req, `/builds/${slug}/edit?/publish`, {});
	expect([200, 303], 'publish').toContain(pub.status());
	return { slug, title };
}

/**
 * On a published build's editor, with pending changes: publish them as revision `number` (default 2, Rev B) with
 * `note`, then open the revisions page, check that revision's row carries the note, and follow "Changes from <the
 * one before>" to its diff.
 */
export async function publishChangesAndOpenDiff(page: Page, slug: string, note: string, number = 2): Promise<void> {
	const next = revisionLabel(number);
	const previous = revisionLabel(number - 1);
	await page.locator('#revision-note').fill(note);
	await page.getByRole('button', { name: `Publish changes as ${next}` }).click();
	await expect(page.getByText(new RegExp(`Published as ${next}`))).toBeVisible();
	await expect(page.getByText(`No changes since ${next}`)).toBeVisible();
	await page.goto(`/builds/${slug}/revisions`);
	const block = page.locator('[data-revision-block]');
	await expect(block.locator('tbody tr')).toHaveCount(number);
	await expect(block.locator(`tr[data-revision="${number}"]`)).toContainText(note);
	await block.getByRole('link', { name: `Changes from ${previous}` }).click();
	await expect(page.getByRole('heading', { name: new RegExp(`Changes from ${previous} to ${next}`) })).toBeVisible();
}
