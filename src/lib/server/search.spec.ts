import { afterAll, describe, expect, it } from 'vitest';
import { markedToHtml, plainSnippet, suggestTitles, suggestTsquery } from './search';
import { GET as suggestGet } from '../../routes/api/v1/search/suggest/+server';
import { createMember, insertBuilds, removeMembers, uniqueWord } from './testing/discover';

describe('markedToHtml (snippet sanitizing)', () => {
	it('escapes everything and turns only balanced hit markers into <mark>', () => {
		expect(markedToHtml('a \uE000b<\uE001 & "c"')).toBe('a <mark>b&lt;</mark> &amp; &quot;c&quot;');
		expect(markedToHtml('<img src=x onerror=alert(1)>\uE000hit\uE001')).toBe('&lt;img src=x onerror=alert(1)&gt;<mark>hit</mark>');
		// A stray or nested marker never yields an unbalanced tag.
		expect(markedToHtml('x\uE000y\uE000z\uE001 w\uE001')).toBe('xy<mark>z</mark> w');
		expect(markedToHtml('</mark><script>')).toBe('&lt;/mark&gt;&lt;script&gt;');
	});
	it('plainSnippet drops Markdown punctuation but keeps comparisons', () => {
		expect(plainSnippet('## Wiring **earth** and `R1` [link](http://x) ![p](y.png)')).toBe('Wiring earth and R1 link');
		expect(plainSnippet('> quoted\nC2 > 1u')).toBe('quoted C2 > 1u');
	});
});

describe('suggestTsquery', () => {
	it('every word on the title weight, the last as a prefix; punctuation cannot inject syntax', () => {
		expect(suggestTsquery('dual rail sup')).toBe('dual:A & rail:A & sup:*A');
		expect(suggestTsquery("amp' | !x:* & (")).toBe('amp:A & x:*A');
		expect(suggestTsquery('  ±  ')).toBeNull();
	});
});

const members: string[] = [];
afterAll(() => removeMembers(members));

describe('GET /api/v1/search/suggest', () => {
	it('offers published titles that start matching, never drafts', async () => {
		const maker = await createMember('maker', 'Suggester');
		members.push(maker.id);
		const word = uniqueWord();
		const [pub, draft] = await insertBuilds(maker.id, [
			{ title: `${word} headphone amp` },
			{ title: `${word} headphone draft`, status: 'draft' }
		]);
		const rows = await suggestTitles(`${word.slice(0, 8)}`);
		expect(rows.map((r) => r.slug)).toContain(pub.slug);
		expect(rows.map((r) => r.slug)).not.toContain(draft.slug);
		const url = new URL(`http://localhost/api/v1/search/suggest?q=${word}+head`);
		const res = await suggestGet({ url, request: new Request(url) } as never);
		expect(res.status).toBe(200);
		expect((await res.json()).items).toEqual([{ slug: pub.slug, title: pub.title, url: `/builds/${pub.slug}` }]);
		const bad = new URL('http://localhost/api/v1/search/suggest?limit=500');
		const r = await suggestGet({ url: bad, request: new Request(bad) } as never);
		expect(r.status).toBe(422);
		expect((await r.json()).error.issues[0].path).toBe('limit');
	});
});
