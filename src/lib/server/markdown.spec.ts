import { describe, it, expect } from 'vitest';
import { JSDOM } from 'jsdom';
import { renderMarkdown, sanitizeHtml, isAllowedImageSrc } from './markdown';

/** Parse the output the way a browser would, to assert on elements rather than on strings. */
function dom(html: string) {
	return new JSDOM(`<body>${html}</body>`).window.document.body;
}

/** Every attribute name of every element, lower-cased. */
function attributeNames(body: HTMLElement): string[] {
	return [...body.querySelectorAll('*')].flatMap((el) => [...el.attributes].map((a) => a.name.toLowerCase()));
}

describe('renderMarkdown: ordinary Markdown', () => {
	it('renders emphasis, lists, code and tables', () => {
		const html = renderMarkdown(
			'**Rails** at ±28 V\n\n- bridge\n- reservoir `2 × 10 mF`\n\n| part | value |\n|---|---|\n| R1 | 4k7 |'
		);
		const body = dom(html);
		expect(body.querySelector('strong')?.textContent).toBe('Rails');
		expect(body.querySelectorAll('li')).toHaveLength(2);
		expect(body.querySelector('code')?.textContent).toBe('2 × 10 mF');
		expect(body.querySelector('table td')?.textContent).toBe('R1');
	});

	it('moves headings below the page headings (# → h3)', () => {
		const body = dom(renderMarkdown('# Bring-up\n\n#### Deep'));
		expect(body.querySelector('h3')?.textContent).toBe('Bring-up');
		expect(body.querySelector('h6')?.textContent).toBe('Deep');
		expect(body.querySelector('h1')).toBeNull();
	});

	it('keeps https and relative links and marks them nofollow noopener ugc', () => {
		const body = dom(renderMarkdown('[notes](https://example.org/a) and [step](/builds/x#step-2)'));
		const links = [...body.querySelectorAll('a')];
		expect(links.map((a) => a.getAttribute('href'))).toEqual(['https://example.org/a', '/builds/x#step-2']);
		for (const a of links) expect(a.getAttribute('rel')).toBe('nofollow noopener ugc');
	});

	it('keeps images from our media path only, lazily loaded; images from other hosts are dropped', () => {
		const body = dom(renderMarkdown('![board](/media/photos/ab/640.webp) ![scope](https://example.org/s.png)'));
		const imgs = [...body.querySelectorAll('img')];
		expect(imgs.map((i) => i.getAttribute('src'))).toEqual(['/media/photos/ab/640.webp']);
		expect(imgs.every((i) => i.getAttribute('loading') === 'lazy')).toBe(true);
		expect(imgs[0].getAttribute('alt')).toBe('board');
	});
});

describe('renderMarkdown: XSS vectors never survive', () => {
	const vectors: [string, string][] = [
		['script tag', 'hello <script>alert(1)</script>'],
		['script inside inline HTML', '<div><script src="https://evil.example/x.js"></script></div>'],
		['img onerror', '<img src="x" onerror="alert(1)">'],
		['img onerror with https src', '<img src="https://example.org/a.png" onerror="alert(1)">'],
		['javascript: link (Markdown)', '[click](javascript:alert(1))'],
		['javascript: link (HTML)', '<a href="javascript:alert(1)">click</a>'],
		['obfuscated javascript: link', '<a href="jav&#x09;ascript:alert(1)">click</a>'],
		['upper-case JAVASCRIPT: link', '<a href="JaVaScRiPt:alert(1)">x</a>'],
		['vbscript: link', '<a href="vbscript:msgbox(1)">x</a>'],
		['data: link', '<a href="data:text/html;base64,PHNjcmlwdD5hbGVydCgxKTwvc2NyaXB0Pg==">x</a>'],
		['data: image (Markdown)', '![x](data:image/svg+xml;base64,PHN2ZyBvbmxvYWQ9YWxlcnQoMSk+)'],
		['data: image (HTML)', '<img src="data:image/png;base64,iVBORw0KGgo=">'],
		['svg onload', '<svg onload="alert(1)"><circle r="4"/></svg>'],
		['svg with script', '<svg><script>alert(1)</script></svg>'],
		['math with link', '<math><mtext><a href="javascript:alert(1)">x</a></mtext></math>'],
		['style tag', '<style>body{background:url(javascript:alert(1))}</style>text'],
		['style attribute', '<p style="background:url(https://evil.example/t)">x</p>'],
		['iframe', '<iframe src="https://evil.example"></iframe>'],
		['iframe srcdoc', '<iframe srcdoc="<script>alert(1)</script>"></iframe>'],
		['form with button', '<form action="https://evil.example"><input name="p"><button>go</button></form>'],
		['object/embed', '<object data="x.swf"></object><embed src="x.swf">'],
		['body onload', '<body onload="alert(1)">'],
		['details ontoggle', '<details open ontoggle="alert(1)"><summary>x</summary></details>'],
		['mouseover on a span', '<span onmouseover="alert(1)">hover</span>'],
		['meta refresh', '<meta http-equiv="refresh" content="0;url=javascript:alert(1)">'],
		['base href', '<base href="https://evil.example/">'],
		['link stylesheet', '<link rel="stylesheet" href="https://evil.example/x.css">'],
		['srcset from elsewhere', '<img src="https://example.org/a.png" srcset="http://evil.example/b.png 2x">'],
		['plain http image', '![x](http://evil.example/track.png)'],
		['protocol-relative image', '<img src="//evil.example/track.png">'],
		['mutation XSS via noscript', '<noscript><p title="</noscript><img src=x onerror=alert(1)>">'],
		['template', '<template><img src=x onerror=alert(1)></template>']
	];

	for (const [name, md] of vectors) {
		it(`drops: ${name}`, () => {
			const html = renderMarkdown(md);
			const body = dom(html);
			expect(body.querySelector('script, style, iframe, form, input, button, svg, math, object, embed, meta, base, link, template')).toBeNull();
			expect(attributeNames(body).filter((n) => n.startsWith('on') || n === 'style' || n === 'srcset' || n === 'srcdoc')).toEqual([]);
			for (const el of body.querySelectorAll('[href], [src]')) {
				const url = (el.getAttribute('href') ?? el.getAttribute('src') ?? '').replace(/\s/g, '');
				expect(url).not.toMatch(/^(javascript|vbscript|data):/i);
			}
			for (const img of body.querySelectorAll('img')) {
				expect(isAllowedImageSrc(img.getAttribute('src') ?? '')).toBe(true);
			}
			expect(html.toLowerCase()).not.toContain('alert(1)</script');
		});
	}

	it('keeps the text around a removed script', () => {
		const body = dom(renderMarkdown('before <script>alert(1)</script> after'));
		expect(body.textContent).toContain('before');
		expect(body.textContent).toContain('after');
		expect(body.textContent).not.toContain('alert');
	});

	it('escapes angle brackets in code, so code samples show as text', () => {
		const body = dom(renderMarkdown('```\n<script>alert(1)</script>\n```'));
		expect(body.querySelector('script')).toBeNull();
		expect(body.querySelector('code')?.textContent).toContain('<script>alert(1)</script>');
	});

	it('applies the same rules to raw HTML through sanitizeHtml', () => {
		const body = dom(sanitizeHtml('<a href="javascript:alert(1)" onclick="x()">x</a><img src="/media/a/1.webp">'));
		expect(body.querySelector('a')?.hasAttribute('href')).toBe(false);
		expect(body.querySelector('a')?.hasAttribute('onclick')).toBe(false);
		expect(body.querySelector('img')?.getAttribute('src')).toBe('/media/a/1.webp');
	});
});

describe('isAllowedImageSrc', () => {
	it('allows only our media path', () => {
		expect(isAllowedImageSrc('/media/photos/x/320.webp')).toBe(true);
		expect(isAllowedImageSrc('https://example.org/a.png')).toBe(false);
		expect(isAllowedImageSrc('http://example.org/a.png')).toBe(false);
		expect(isAllowedImageSrc('/media/../api/v1/builds')).toBe(false);
		expect(isAllowedImageSrc('/api/v1/builds')).toBe(false);
		expect(isAllowedImageSrc('//evil.example/a.png')).toBe(false);
		expect(isAllowedImageSrc(' data:image/png;base64,AAAA')).toBe(false);
	});

	it('decodes before checking: encoded dots, slashes and backslashes never leave /media/', () => {
		for (const src of [
			'/media/%2e%2e/api/v1/builds',
			'/media/%2E%2E/%2E%2E/sign-out',
			'/media/%252e%252e/api/v1/builds',
			'/media/.%2e/x',
			'/media/%2f%2fevil.example/a.png',
			'/media/%5c..%5capi',
			'/media/a/%00/../b',
			'/media/%zz'
		]) {
			expect(isAllowedImageSrc(src), src).toBe(false);
		}
		expect(isAllowedImageSrc('/media/photos/a%20b/320.webp')).toBe(true);
	});
});
