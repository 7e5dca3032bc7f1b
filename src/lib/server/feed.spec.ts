import { afterAll, describe, expect, it } from 'vitest';
import { JSDOM } from 'jsdom';
import { GET as feedGet } from '../../routes/feed.xml/+server';
import { GET as categoryFeedGet } from '../../routes/categories/[category]/feed.xml/+server';
import { GET as sitemapGet } from '../../routes/sitemap.xml/+server';
import { atomFeed, buildTagUri, sitemapXml, xmlEscape } from './feed';
import { createMember, insertBuilds, removeMembers } from './testing/discover';

const ATOM = 'http://www.w3.org/2005/Atom';
const { DOMParser } = new JSDOM('').window;

/** Parse with a real XML parser; a well-formedness error fails the test with the parser's message. */
function parseXml(text: string): Document {
	const doc = new DOMParser().parseFromString(text, 'application/xml');
	const err = doc.getElementsByTagName('parsererror')[0];
	expect(err?.textContent ?? null).toBeNull();
	return doc;
}
const kids = (el: Element, name: string) => Array.from(el.children).filter((c) => c.namespaceURI === ATOM && c.localName === name);
const one = (el: Element, name: string) => {
	const found = kids(el, name);
	expect(found, `<${el.localName}> has one <${name}>`).toHaveLength(1);
	return found[0];
};
const isDate = (s: string | null) => !!s && /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d+)?Z$/.test(s) && !Number.isNaN(Date.parse(s));

/** Every element RFC 4287 requires of a feed and of each entry (§4.1.1, §4.1.2). */
function expectValidAtom(doc: Document, selfUrl: string) {
	const feed = doc.documentElement;
	expect(feed.localName).toBe('feed');
	expect(feed.namespaceURI).toBe(ATOM);
	expect(one(feed, 'id').textContent).toMatch(/^(https?:|tag:)/);
	expect(one(feed, 'title').textContent).not.toBe('');
	expect(isDate(one(feed, 'updated').textContent)).toBe(true);
	const self = kids(feed, 'link').filter((l) => l.getAttribute('rel') === 'self');
	expect(self.map((l) => l.getAttribute('href'))).toEqual([selfUrl]);
	const entries = kids(feed, 'entry');
	for (const e of entries) {
		expect(one(e, 'id').textContent).toMatch(/^tag:[a-z0-9.-]+,2026:build:[0-9a-f-]{36}$/);
		expect(one(e, 'title').textContent).not.toBe('');
		expect(isDate(one(e, 'updated').textContent)).toBe(true);
		expect(kids(e, 'link').some((l) => (l.getAttribute('rel') ?? 'alternate') === 'alternate' && /^https?:\/\//.test(l.getAttribute('href') ?? ''))).toBe(true);
		expect(one(one(e, 'author'), 'name').textContent).not.toBe('');
		one(e, 'summary');
	}
	// Feed-level author is optional only when every entry has one (checked above).
	return entries;
}

const members: string[] = [];
afterAll(() => removeMembers(members));

describe('Atom feeds', () => {
	it('/feed.xml is well-formed Atom with every required element, newest build first', async () => {
		const maker = await createMember('maker', 'Feeder');
		members.push(maker.id);
		const [b] = await insertBuilds(maker.id, [
			{ title: 'Feed test: <amp> & "quotes" ±35 V', summary: 'Summary with < and & inside', category: 'preamp', publishedAt: new Date(Date.now() + 5 * 365 * 86_400_000) }
		]);
		const url = new URL('http://127.0.0.1:5216/feed.xml');
		const res = await feedGet({ url, request: new Request(url) } as never);
		expect(res.headers.get('content-type')).toBe('application/atom+xml; charset=utf-8');
		const doc = parseXml(await res.text());
		const entries = expectValidAtom(doc, 'http://127.0.0.1:5216/feed.xml');
		const first = entries[0];
		expect(one(first, 'id').textContent).toBe(buildTagUri('127.0.0.1', b.id));
		expect(one(first, 'title').textContent).toBe('Feed test: <amp> & "quotes" ±35 V');
		expect(one(first, 'summary').textContent).toBe('Summary with < and & inside');
		expect(one(first, 'link').getAttribute('href')).toBe(`http://127.0.0.1:5216/builds/${b.slug}`);
		expect(one(one(first, 'author'), 'uri').textContent).toBe(`http://127.0.0.1:5216/makers/${maker.handle}`);
		expect(one(doc.documentElement, 'updated').textContent).toBe(one(first, 'updated').textContent);
	});

	it('the category feed lists only that category, also as /feed.xml?category=; an unknown category is a 404', async () => {
		const maker = await createMember('maker', 'Categorist');
		members.push(maker.id);
		const soon = new Date(Date.now() + 5 * 365 * 86_400_000);
		const [dac, amp] = await insertBuilds(maker.id, [
			{ title: 'Category feed DAC', category: 'dac', publishedAt: soon },
			{ title: 'Category feed amp', category: 'power-amp', publishedAt: soon }
		]);
		const url = new URL('http://127.0.0.1:5216/categories/dac/feed.xml');
		const res = await categoryFeedGet({ url, params: { category: 'dac' }, request: new Request(url) } as never);
		const doc = parseXml(await res.text());
		const entries = expectValidAtom(doc, url.toString());
		expect(entries.length).toBeGreaterThan(0);
		expect(entries.every((e) => one(e, 'category').getAttribute('term') === 'dac')).toBe(true);
		const ids = entries.map((e) => one(e, 'id').textContent);
		expect(ids).toContain(buildTagUri('127.0.0.1', dac.id));
		expect(ids).not.toContain(buildTagUri('127.0.0.1', amp.id));

		const q = new URL('http://127.0.0.1:5216/feed.xml?category=dac');
		const viaQuery = parseXml(await (await feedGet({ url: q, request: new Request(q) } as never)).text());
		expect(kids(viaQuery.documentElement, 'entry').map((e) => one(e, 'id').textContent)).toEqual(ids);

		await expect(categoryFeedGet({ url, params: { category: 'spaceships' }, request: new Request(url) } as never)).rejects.toMatchObject({ status: 404 });
	});

	it('escapes text and attributes, and drops characters XML cannot carry', () => {
		expect(xmlEscape(`a<b>&"c'\u0001`)).toBe('a&lt;b&gt;&amp;&quot;c&apos;');
		const xml = atomFeed({
			id: 'tag:x.test,2026:feed',
			title: 'T & <t>',
			selfUrl: 'https://x.test/feed.xml?a=1&b=2',
			htmlUrl: 'https://x.test/',
			updated: new Date('2026-02-03T04:05:06.789Z'),
			entries: []
		});
		const doc = parseXml(xml);
		expect(one(doc.documentElement, 'title').textContent).toBe('T & <t>');
		expect(one(doc.documentElement, 'updated').textContent).toBe('2026-02-03T04:05:06Z');
		expect(kids(doc.documentElement, 'link')[0].getAttribute('href')).toBe('https://x.test/feed.xml?a=1&b=2');
	});
});

describe('sitemap.xml', () => {
	it('is a sitemaps.org urlset with absolute URLs, including published builds and not drafts', async () => {
		const maker = await createMember('maker', 'Mapper');
		members.push(maker.id);
		const [pub, draft] = await insertBuilds(maker.id, [{ title: 'Mapped' }, { title: 'Hidden draft', status: 'draft' }]);
		const url = new URL('http://127.0.0.1:5216/sitemap.xml');
		const doc = parseXml(await (await sitemapGet({ url, request: new Request(url) } as never)).text());
		expect(doc.documentElement.namespaceURI).toBe('http://www.sitemaps.org/schemas/sitemap/0.9');
		const locs = Array.from(doc.getElementsByTagName('loc')).map((l) => l.textContent ?? '');
		expect(locs.every((l) => l.startsWith('http://127.0.0.1:5216/'))).toBe(true);
		expect(locs).toContain(`http://127.0.0.1:5216/builds/${pub.slug}`);
		expect(locs).not.toContain(`http://127.0.0.1:5216/builds/${draft.slug}`);
		expect(locs).toContain(`http://127.0.0.1:5216/makers/${maker.handle}`);
		expect(sitemapXml([{ loc: 'https://x.test/?a=1&b=2' }])).toContain('<loc>https://x.test/?a=1&amp;b=2</loc>');
	});
});
