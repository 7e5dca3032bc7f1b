// Integration tests against the real PostgreSQL of DATABASE_URL (and the fake S3 for the photo): recording
// "I built this too", its checks, who may record, the member's own build based on it, and the list the build shows.
import { describe, it, expect } from 'vitest';
import sharp from 'sharp';
import { statusOf, useTestUsers } from './testing/builds';
import { testBuild } from './testing/parts';
import { derive, publish, addStep } from './builds';
import { builtItPanel, listBuiltIt, recordBuiltIt, removeBuiltIt, setBuiltItPhoto } from './built-it';
import { mediaAccess } from './photos/media-access';
import { builtItForm } from '$lib/schemas/built-it';

const { maker, builder, second } = useTestUsers({
	maker: ['maker', 'Original maker'],
	builder: ['maker', 'Builder one'],
	second: ['maker', 'Builder two']
});

const form = (f: Record<string, string>) => builtItForm.parse(f);

describe('recordBuiltIt', () => {
	it('stores checked blocks and lists each builder with their figures', async () => {
		const b = await testBuild(maker.id, { published: true });
		const r = await recordBuiltIt(builder, b.slug, form({ railsExpectedV: '28, -28', railsMeasuredV: '27.5, -27.7', dcOffsetMv: '4, -6', thdPoints: '10@0.03, 40@1', loadOhm: '8', note: 'Works well.' }));
		expect(r.ok).toBe(true);
		await recordBuiltIt(second, b.slug, form({ dcOffsetMv: '-120', currentLimited: 'on' }));
		const list = await listBuiltIt(b.id, null);
		expect(list.map((x) => x.member.name)).toEqual([builder.name, second.name]);
		expect(list[0].figures).toMatchObject({ railsMeasuredV: [27.5, -27.7], maxAbsOffsetMv: 6, clipPowerW: 40, loadOhm: 8 });
		expect(list[0].note).toBe('Works well.');
		// |−120 mV| is above the bring-up block's danger threshold for DC offset: the same check as in any bring-up block.
		expect(list[1].figures.maxAbsOffsetMv).toBe(120);
		expect(list[1].figures.danger + list[1].figures.caution).toBeGreaterThan(0);
		expect(list[1].blocks[0].checks.length).toBeGreaterThan(0);
		const panel = await builtItPanel(b, null, []);
		expect(panel.records).toHaveLength(2);
	});

	it('replaces the record on a second save and removes it on request', async () => {
		const b = await testBuild(maker.id, { published: true });
		await recordBuiltIt(builder, b.slug, form({ dcOffsetMv: '10' }));
		await recordBuiltIt(builder, b.slug, form({ dcOffsetMv: '3' }));
		const list = await listBuiltIt(b.id, null);
		expect(list).toHaveLength(1);
		expect(list[0].figures.maxAbsOffsetMv).toBe(3);
		expect(list[0].mine).toBe(false);
		expect((await listBuiltIt(b.id, builder))[0].mine).toBe(true);
		await removeBuiltIt(builder, b.slug);
		expect(await listBuiltIt(b.id, null)).toEqual([]);
	});

	it('answers block problems per form field and stores nothing', async () => {
		const b = await testBuild(maker.id, { published: true });
		// An expected rail of 0 V is refused by the bring-up block's own schema ("must not be 0 V").
		const r = await recordBuiltIt(builder, b.slug, form({ railsExpectedV: '0', railsMeasuredV: '12' }));
		expect(r).toEqual({ ok: false, issues: [{ path: 'railsExpectedV', message: 'must not be 0 V' }] });
		const big = await recordBuiltIt(builder, b.slug, form({ dcOffsetMv: '1', thdPoints: '20000@1' }));
		expect(big.ok).toBe(false);
		expect(!big.ok && big.issues[0]).toMatchObject({ path: 'thdPoints', message: 'must be at most 10000 W' });
		expect(await listBuiltIt(b.id, null)).toEqual([]);
	});

	it('refuses your own build, drafts and unknown builds; takes your own build based on it', async () => {
		const b = await testBuild(maker.id, { published: true });
		const draft = await testBuild(maker.id);
		expect(await statusOf(recordBuiltIt(maker, b.slug, form({ dcOffsetMv: '1' })))).toBe(409);
		expect(await statusOf(recordBuiltIt(builder, draft.slug, form({ dcOffsetMv: '1' })))).toBe(404);
		expect(await statusOf(recordBuiltIt(builder, 'no-such-build-here', form({ dcOffsetMv: '1' })))).toBe(404);
		const other = await testBuild(second.id, { published: true });
		const wrong = await recordBuiltIt(builder, b.slug, form({ dcOffsetMv: '1', basedOn: `/builds/${other.slug}` }));
		expect(!wrong.ok && wrong.issues[0].path).toBe('basedOn');
		const mine = await derive(builder, b.id);
		await addStep(builder, mine.id, { title: 'Boards', bodyMd: 'My boards.' });
		await publish(builder, mine.id);
		expect((await recordBuiltIt(builder, b.slug, form({ dcOffsetMv: '1', basedOn: `https://x.test/builds/${mine.slug}` }))).ok).toBe(true);
		expect((await listBuiltIt(b.id, null))[0].basedOn).toEqual({ slug: mine.slug, title: expect.any(String) });
	});

	it('keeps one photo per record, public while the build is published', async () => {
		const b = await testBuild(maker.id, { published: true });
		const png = await sharp({ create: { width: 64, height: 48, channels: 3, background: '#b87333' } }).png().toBuffer();
		expect(await statusOf(setBuiltItPhoto(builder, b.slug, png, 'My copy'))).toBe(404);
		await recordBuiltIt(builder, b.slug, form({ dcOffsetMv: '2' }));
		await setBuiltItPhoto(builder, b.slug, png, 'My copy on the bench');
		const [rec] = await listBuiltIt(b.id, null);
		expect(rec.photo).toMatchObject({ alt: 'My copy on the bench', width: 64, height: 48 });
		expect(await mediaAccess(`${rec.photo!.keyPrefix}/${rec.photo!.widths[0]}.webp`, null)).toMatchObject({ ok: true });
	});
});
