/**
 * Markdown → safe HTML for step text, comments, reviews and flags (step text may place the build's photos: PHOTO_REF). Rendered once on save and stored
 * next to the source: `marked` (GitHub-flavoured) and then DOMPurify on one reused jsdom window.
 *
 * What survives: ordinary HTML text markup (paragraphs, lists, tables, code, emphasis, links, images).
 * What never does: scripts, event handlers, styles, iframes, forms, SVG and MathML, `javascript:`,
 * `vbscript:` and `data:` URIs. Images load only from our own media path (`/media/…`).
 * Links get rel="nofollow noopener ugc" (readers' content; no SEO credit, no window.opener).
 */
import { Marked } from 'marked';
import createDOMPurify, { type WindowLike } from 'dompurify';
import { JSDOM } from 'jsdom';
import { escapeAttribute, escapeUTF8 as escapeHtml } from 'entities';

const marked = new Marked({
	gfm: true,
	breaks: false,
	async: false,
	// Headings inside a step or comment sit below the page's own h1/h2: `# x` becomes h3.
	walkTokens(token) {
		if (token.type === 'heading') token.depth = Math.min(6, token.depth + 2);
	}
});

/**
 * A photo of the build placed in step text: `[[photo:1a2b3c4d]]`, the first 8 characters of the photo's
 * id (the step editor offers the code beside each photo). Only the build's own photos resolve (the caller
 * looks them up: see ../builds/steps renderStepMarkdown); the syntax takes no URL, so it can never point
 * elsewhere. Inside code spans and code blocks it stays text.
 */
export const PHOTO_REF = /\[\[photo:([0-9a-fA-F]{8})\]\]/g;

/** What a placed photo renders as: an image we serve (`/media/…`, checked again by the sanitizer). */
export interface PlacedPhoto {
	src: string;
	alt: string;
	width: number;
	height: number;
}

/** The resolver of the parse in progress (parsing is synchronous, so one at a time). */
let resolvePhoto: ((ref: string) => PlacedPhoto | null) | null = null;

marked.use({
	extensions: [
		{
			name: 'photoRef',
			level: 'inline',
			start(src: string) {
				const i = src.indexOf('[[photo:');
				return i < 0 ? undefined : i;
			},
			tokenizer(src: string) {
				const m = /^\[\[photo:([0-9a-fA-F]{8})\]\]/.exec(src);
				return m ? { type: 'photoRef', raw: m[0], ref: m[1].toLowerCase() } : undefined;
			},
			renderer(token) {
				const ref = (token as unknown as { ref: string }).ref;
				if (!resolvePhoto) return escapeHtml(token.raw);
				const p = resolvePhoto(ref);
				if (!p) return `<span class="photo-missing">[photo ${escapeHtml(ref)} is not a photo of this build]</span>`;
				return `<img class="placed-photo" src="${escapeAttribute(p.src)}" alt="${escapeAttribute(p.alt)}" width="${p.width}" height="${p.height}">`;
			}
		}
	]
});

const { window } = new JSDOM('<!doctype html><html><body></body></html>');
const purify = createDOMPurify(window as unknown as WindowLike);

/** Schemes that run code or smuggle content: never allowed in href or src. */
const BAD_SCHEME = /^(?:javascript|vbscript|data|file|blob):/i;
/** Remove the characters browsers ignore inside a URL scheme ("java\tscript:", "\u0000javascript:"). */
function normaliseUrl(raw: string): string {
	// eslint-disable-next-line no-control-regex
	return raw.replace(/[\u0000-\u0020\u007f-\u009f\u00ad\u200b-\u200f\u2028\u2029\ufeff]/g, '');
}

/** Percent-decode until nothing changes (at most a few rounds); null when the encoding is broken. */
function fullyDecoded(s: string): string | null {
	let cur = s;
	for (let i = 0; i < 5; i++) {
		let next: string;
		try {
			next = decodeURIComponent(cur);
		} catch {
			return null;
		}
		if (next === cur) return cur;
		cur = next;
	}
	return null;
}

/**
 * True only for an image we serve ourselves: a path under `/media/` that stays there once decoded
 * and resolved (no `..`, `%2e%2e`, backslashes or doubled slashes). Images from other hosts would
 * tell them who reads the page, so they are dropped (and the page's Content-Security-Policy would
 * block them as well). Exported for tests.
 */
export function isAllowedImageSrc(src: string): boolean {
	const s = normaliseUrl(src);
	if (BAD_SCHEME.test(s)) return false;
	const decoded = fullyDecoded(s);
	// eslint-disable-next-line no-control-regex
	if (decoded === null || /[\u0000-\u001f\u007f]/.test(decoded)) return false;
	if (!decoded.startsWith('/media/') || decoded.includes('\\') || decoded.includes('//')) return false;
	let resolved: URL;
	try {
		resolved = new URL(decoded, 'http://starground.invalid');
	} catch {
		return false;
	}
	const path = decoded.split(/[?#]/)[0];
	let resolvedPath: string;
	try {
		resolvedPath = decodeURIComponent(resolved.pathname);
	} catch {
		return false;
	}
	return resolved.origin === 'http://starground.invalid' && resolvedPath === path && !path.split('/').some((seg) => seg === '..' || seg === '.');
}

purify.addHook('afterSanitizeAttributes', (node) => {
	const el = node as unknown as Element;
	if (!el.getAttribute) return;
	for (const attr of ['href', 'src', 'xlink:href', 'action', 'formaction', 'poster', 'background', 'cite']) {
		const value = el.getAttribute(attr);
		if (value !== null && BAD_SCHEME.test(normaliseUrl(value))) el.removeAttribute(attr);
	}
	const tag = el.tagName?.toLowerCase();
	if (tag === 'img') {
		const src = el.getAttribute('src');
		el.removeAttribute('srcset');
		if (!src || !isAllowedImageSrc(src)) {
			el.remove();
			return;
		}
		el.setAttribute('loading', 'lazy');
		el.setAttribute('decoding', 'async');
		el.setAttribute('referrerpolicy', 'no-referrer');
	}
	if (tag === 'a') {
		if (el.hasAttribute('href')) el.setAttribute('rel', 'nofollow noopener ugc');
		el.removeAttribute('target');
	}
});

const PURIFY_CONFIG = {
	USE_PROFILES: { html: true },
	FORBID_TAGS: [
		'style',
		'script',
		'iframe',
		'frame',
		'frameset',
		'object',
		'embed',
		'form',
		'input',
		'button',
		'select',
		'textarea',
		'option',
		'base',
		'link',
		'meta',
		'svg',
		'math',
		'video',
		'audio',
		'source',
		'picture',
		'template',
		'dialog',
		'marquee'
	],
	FORBID_ATTR: ['style', 'srcset', 'action', 'formaction', 'background', 'poster', 'ping', 'target'],
	ALLOW_DATA_ATTR: false,
	ALLOW_ARIA_ATTR: false
};

/**
 * Render a member's Markdown to sanitized HTML, safe to insert with `{@html}`.
 * renderMarkdown('**Rails** at ±28 V <script>x()</script>') → '<p><strong>Rails</strong> at ±28 V </p>\n'.
 * Costs tens of milliseconds (jsdom): call it on save and store the result, not on every view.
 */
export function renderMarkdown(md: string, opts: { photos?: (ref: string) => PlacedPhoto | null } = {}): string {
	resolvePhoto = opts.photos ?? null;
	try {
		const html = marked.parse(md ?? '', { async: false }) as string;
		return purify.sanitize(html, PURIFY_CONFIG) as unknown as string;
	} finally {
		resolvePhoto = null;
	}
}

/** Sanitize HTML that did not come from Markdown (same rules as renderMarkdown). */
export function sanitizeHtml(html: string): string {
	return purify.sanitize(html ?? '', PURIFY_CONFIG) as unknown as string;
}
