// Step text with photos placed in it: `[[photo:1a2b3c4d]]` resolves to a photo of the same build only,
// never another build's and never an outside address; code keeps it as text; inline code and block quotes
// come out as their HTML elements (CommonMark 0.31 §6.1 code spans, §5.1 block quotes).
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { JSDOM } from 'jsdom';
import { db } from '../db';
import * as schema from '../db/schema';
import { createTestUser, removeTestUsers, uniqueTitle } from '../testing/builds';
import { addStep, createDraft, getRevisionView, loadPublishedContent, markRemovedPhotos, publish, renderStepMarkdown, stepVersion } from './index';
import { deletePhoto } from '../photos';
import { renderMarkdown } from '../markdown';
import { eq } from 'drizzle-orm';

let maker: Awaited<ReturnType<typeof createTestUser>>;
let mine: { id: string }, theirs: { id: string };
let myPhoto: schema.Photo, theirPhoto: schema.Photo;

const doc = (html: string) => new JSDOM(`<body>${html}</body>`).window.document;

async function photoRow(buildId: string): Promise<schema.Photo> {
	const id = crypto.randomUUID();
	const [row] = await db
		.insert(schema.photo)
		.values({ id, ownerId: maker.id, buildId, keyPrefix: `photos/${id}`, widths: [320, 640, 1280], width: 1280, height: 960, alt: 'Amplifier board with both heatsinks fitted' })
		.returning();
	return row;
}

beforeAll(async () => {
	maker = await createTestUser('maker', 'Steps');
	const fields = (t: string) => ({ title: uniqueTitle(t), summary: '', category: 'power-amp' as const, topology: 'class-ab-discrete' as const, mainsPowered: false, licence: 'CC-BY-4.0' as const });
	mine = await createDraft(maker.id, fields('Placed photos'));
	theirs = await createDraft(maker.id, fields('Another build'));
	myPhoto = await photoRow(mine.id);
	theirPhoto = await photoRow(theirs.id);
});
afterAll(async () => {
	await removeTestUsers([maker.id]);
});

describe('photos placed in step text', () => {
	it('resolves a photo of the build to its largest rendition under /media, with its alt text and size', async () => {
		const ref = `[[photo:${myPhoto.id.slice(0, 8)}]]`;
		const html = await renderStepMarkdown(db, mine.id, `Fit the board first.\n\n${ref}\n\nThen the heatsinks.`);
		const img = doc(html).querySelector('img.placed-photo')!;
		expect(img.getAttribute('src')).toBe(`/media/photos/${myPhoto.id}/1280.webp`);
		expect(img.getAttribute('alt')).toBe(myPhoto.alt);
		expect([img.getAttribute('width'), img.getAttribute('height')]).toEqual(['1280', '960']);
		// The photo sits between the two paragraphs, where it was placed.
		const text = doc(html).body.textContent!;
		expect(text.indexOf('Fit the board')).toBeLessThan(text.indexOf('Then the heatsinks'));
		expect(doc(html).querySelectorAll('p')[1].querySelector('img')).not.toBeNull();
	});

	it('never resolves another build’s photo, an unknown one, or any address: a short note instead', async () => {
		const html = await renderStepMarkdown(db, mine.id, `[[photo:${theirPhoto.id.slice(0, 8)}]] and [[photo:00000000]]`);
		expect(html).not.toContain(theirPhoto.id);
		expect(doc(html).querySelectorAll('img')).toHaveLength(0);
		expect(doc(html).querySelectorAll('.photo-missing')).toHaveLength(2);
		expect(doc(html).body.textContent).toContain('is not a photo of this build');
		// The syntax takes no URL: anything else is plain text, and outside images are still removed.
		const outside = await renderStepMarkdown(db, mine.id, '[[photo:https://example.com/x.png]] ![x](https://example.com/x.png)');
		expect(doc(outside).querySelectorAll('img')).toHaveLength(0);
		expect(doc(outside).body.textContent).toContain('[[photo:https://example.com/x.png]]');
	});

	it('stays text inside code spans and code blocks, and in comments (no resolver)', async () => {
		const ref = `[[photo:${myPhoto.id.slice(0, 8)}]]`;
		const html = await renderStepMarkdown(db, mine.id, `Type \`${ref}\` to place it.\n\n\`\`\`\n${ref}\n\`\`\``);
		expect(doc(html).querySelectorAll('img')).toHaveLength(0);
		expect(doc(html).querySelector('p code')!.textContent).toBe(ref);
		expect(doc(html).querySelector('pre code')!.textContent).toBe(`${ref}\n`);
		expect(doc(renderMarkdown(`See ${ref}`)).querySelectorAll('img')).toHaveLength(0);
	});

	it('is stored resolved when a step is saved', async () => {
		const { id } = await addStep(maker, mine.id, { title: 'Heatsinks', bodyMd: `[[photo:${myPhoto.id.slice(0, 8).toUpperCase()}]]` });
		const [step] = await db.select().from(schema.buildStep).where(eq(schema.buildStep.id, id));
		expect(step.bodyHtml).toContain(`/media/photos/${myPhoto.id}/1280.webp`);
	});
});

describe('inline code and block quotes', () => {
	it('render as <code> inside the paragraph and <blockquote> with its paragraph, nothing added', () => {
		const d = doc(renderMarkdown('Use `0R22` emitter resistors.\n\n> Check the rails before fitting the chips.\n> Twice.'));
		expect(d.querySelector('p > code')!.textContent).toBe('0R22');
		expect(d.querySelector('p')!.textContent).toBe('Use 0R22 emitter resistors.');
		const q = d.querySelector('blockquote > p')!;
		expect(q.textContent).toBe('Check the rails before fitting the chips.\nTwice.');
	});
});

describe('deleting a photo placed in step text', () => {
	it('takes its code out of the step text in the same transaction and renders the text again', async () => {
		const b = await createDraft(maker.id, { title: uniqueTitle('Photo deleted'), summary: '', category: 'power-amp', topology: 'class-ab-discrete', mainsPowered: false, licence: 'CC-BY-4.0' });
		const gone = await photoRow(b.id);
		const kept = await photoRow(b.id);
		const code = (p: schema.Photo) => `[[photo:${p.id.slice(0, 8)}]]`;
		const { id } = await addStep(maker, b.id, { title: 'Boards', bodyMd: `Fit the board.\n\n${code(gone)}\n\nThen ${code(kept)} the heatsinks.` });
		const [before] = await db.select().from(schema.buildStep).where(eq(schema.buildStep.id, id));
		expect(before.bodyHtml).toContain(`/media/photos/${gone.id}/`);

		await deletePhoto(gone.id, maker);
		const [after] = await db.select().from(schema.buildStep).where(eq(schema.buildStep.id, id));
		expect(after.bodyMd).toBe(`Fit the board.\n\nThen ${code(kept)} the heatsinks.`);
		expect(after.bodyHtml).not.toContain(gone.id);
		expect(doc(after.bodyHtml).querySelectorAll('.photo-missing')).toHaveLength(0);
		// The other placed photo stays, and the step's version moved on (an editor holding the old text gets a conflict).
		expect(doc(after.bodyHtml).querySelector('img.placed-photo')!.getAttribute('src')).toBe(`/media/photos/${kept.id}/1280.webp`);
		expect(stepVersion(after)).not.toBe(stepVersion(before));
	});

	it('shows a published revision’s placed photo that was deleted since as a sentence, not a broken image', async () => {
		const b = await createDraft(maker.id, { title: uniqueTitle('Published photo'), summary: '', category: 'power-amp', topology: 'class-ab-discrete', mainsPowered: false, licence: 'CC-BY-4.0' });
		const p = await photoRow(b.id);
		await addStep(maker, b.id, { title: 'Boards', bodyMd: `Fit the board.\n\n[[photo:${p.id.slice(0, 8)}]]` });
		await publish(maker, b.id);
		await deletePhoto(p.id, maker);
		const [row] = await db.select().from(schema.build).where(eq(schema.build.id, b.id));
		// Readers see Rev A, whose stored HTML still places the photo: it reads as removed.
		for (const html of [(await loadPublishedContent(row))!.content.steps[0].bodyHtml, (await getRevisionView(b.id, 1))!.snapshot.steps[0].bodyHtml]) {
			expect(html).not.toContain(p.id);
			expect(doc(html).querySelectorAll('img')).toHaveLength(0);
			expect(doc(html).querySelector('.photo-missing')!.textContent).toBe('[This photo has been removed.]');
			expect(doc(html).body.textContent).toContain('Fit the board.');
		}
	});

	it('leaves images of photos that exist and anything that is not a placed photo as they are', () => {
		const id = crypto.randomUUID();
		const placed = `<p><img class="placed-photo" src="/media/photos/${id}/1280.webp" alt="a &quot;quoted&quot; &gt; alt" width="1280" height="960" loading="lazy" decoding="async"></p>`;
		expect(markRemovedPhotos(placed, () => true)).toBe(placed);
		expect(markRemovedPhotos(placed, () => false)).toBe('<p><span class="photo-missing">[This photo has been removed.]</span></p>');
		const other = `<p><img src="/media/photos/${id}/1280.webp" alt=""></p>`;
		expect(markRemovedPhotos(other, () => false)).toBe(other);
	});
});
