// Integration test against the real PostgreSQL of DATABASE_URL: the bench sheet PDF of a build, parsed back with
// PDF.js (pdfjs-dist, an independent reader) to check its pages and text.
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { createTestUser, removeTestUsers } from './testing/builds';
import { AMP, SUPPLY, statusOf, testBuild } from './testing/parts';
import { saveSpecBlock } from './specs';
import { savePartsList } from './parts';
import { addStep, publish } from './builds';
import { loadBenchSheet, renderBenchSheetPdf } from './bench-sheet';
import { emptyDraft } from '$lib/parts';

type TestUser = Awaited<ReturnType<typeof createTestUser>>;
let maker: TestUser;
beforeAll(async () => {
	maker = await createTestUser('maker', 'Sheet maker');
});
afterAll(() => removeTestUsers([maker.id]));

/** Every page's text, joined per page. */
async function pdfText(bytes: Buffer): Promise<{ pages: number; text: string[]; title: unknown }> {
	const doc = await getDocument({ data: new Uint8Array(bytes), useSystemFonts: false, isEvalSupported: false }).promise;
	const text: string[] = [];
	for (let i = 1; i <= doc.numPages; i++) {
		const page = await doc.getPage(i);
		const content = await page.getTextContent();
		text.push(content.items.map((it) => ('str' in it ? it.str : '')).join(' '));
	}
	const meta = await doc.getMetadata();
	return { pages: doc.numPages, text, title: (meta.info as { Title?: string }).Title };
}

describe('bench sheet PDF', () => {
	it('carries the build’s values, kitting groups, bring-up boxes and cautions, readable by another PDF reader', async () => {
		const b = await testBuild(maker.id);
		await saveSpecBlock(maker, b.id, { kind: 'amplifier', data: AMP });
		await saveSpecBlock(maker, b.id, { kind: 'supply', data: SUPPLY });
		await savePartsList(maker, b.id, [
			{ ...emptyDraft(), designators: 'R1, R2', quantity: '2', kind: 'resistor', value: '0R22', ratingW: '5' },
			{ ...emptyDraft(), designators: 'C1', kind: 'capacitor', value: '4u7', ratingV: '63' },
			{ ...emptyDraft(), designators: 'U1', kind: 'ic', value: '5-pin monolithic power amplifier IC', package: 'TO-220' }
		]);
		await addStep(maker, b.id, { title: 'Boards', bodyMd: 'Populate.' });
		await publish(maker, b.id);

		const sheet = await loadBenchSheet(b.slug, null, 'https://starground.test');
		const pdf = await renderBenchSheetPdf(sheet);
		expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
		const { pages, text, title } = await pdfText(pdf);
		expect(pages).toBeGreaterThanOrEqual(1);
		expect(title).toBe(`Bench sheet: ${b.title}`);
		const all = text.join('\n');
		expect(all).toContain(b.title);
		expect(all).toContain('Rev A');
		expect(all).toContain(`https://starground.test/builds/${b.slug}`);
		expect(all).toContain('CAUTION');
		expect(all).toContain('Mains powered.');
		// 0R22 (IEC 60062 RKM) printed as 220 mΩ, 4u7 as 4.7 µF (the formatter writes the Greek mu): Ω and µ come
		// through the embedded font.
		expect(all).toContain('220 mΩ');
		expect(all).toMatch(/4\.70 [µμ]F/);
		expect(all).toMatch(/Resistor \(2\)/);
		expect(all).toMatch(/Capacitor \(1\)/);
		expect(all).toContain('TO-220');
		// Bring-up boxes for the amplifier's ±28 V rails and two channels.
		expect(all).toContain('Positive rail');
		expect(all).toContain('−28 V');
		expect(all).toContain('DC offset, channel 2 (no speaker)');
		expect(all).toContain(`page 1 of ${pages}`);
	});

	it('is refused for a draft the viewer may not see', async () => {
		const d = await testBuild(maker.id);
		expect(await statusOf(loadBenchSheet(d.slug, null, 'https://starground.test'))).toBe(404);
		expect((await loadBenchSheet(d.slug, maker, 'https://starground.test')).subtitle).toContain('draft');
	});
});
