/**
 * Atom feeds of newly published builds (RFC 4287) and the sitemap (sitemaps.org 0.9). Pure builders
 * (atomFeed, sitemapXml) plus the queries that feed them.
 */
import { and, desc, eq, isNotNull, sql } from 'drizzle-orm';
import { db } from './db';
import * as schema from './db/schema';
import { CATEGORY_LABELS, labelOf } from '$lib/labels';
import { escapeUTF8 } from 'entities';

/** Escape text for XML character data and attribute values. */
export function xmlEscape(s: string): string {
	// Also drop characters XML 1.0 does not allow at all (C0 controls other than tab, LF, CR).
	return escapeUTF8(s.replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f\ufffe\uffff]/g, ''));
}

export interface AtomEntry {
	/** A permanent, unique IRI: tag URI of the build. */
	id: string;
	title: string;
	/** Last significant change. */
	updated: Date;
	published: Date;
	/** The entry's page. */
	link: string;
	author: { name: string; uri?: string };
	summary: string;
	category?: { term: string; label: string };
}

export interface AtomFeed {
	id: string;
	title: string;
	subtitle?: string;
	/** The feed document's own URL (link rel="self"). */
	selfUrl: string;
	/** The HTML page the feed follows (link rel="alternate"). */
	htmlUrl: string;
	updated: Date;
	entries: AtomEntry[];
}

const isoSeconds = (d: Date) => d.toISOString().replace(/\.\d{3}Z$/, 'Z');

/** An Atom 1.0 document: feed id, title, updated, self and alternate links, then one <entry> per item. */
export function atomFeed(f: AtomFeed): string {
	const e = xmlEscape;
	const entries = f.entries
		.map(
			(x) => `  <entry>
    <id>${e(x.id)}</id>
    <title type="text">${e(x.title)}</title>
    <updated>${isoSeconds(x.updated)}</updated>
    <published>${isoSeconds(x.published)}</published>
    <link rel="alternate" type="text/html" href="${e(x.link)}"/>
    <author><name>${e(x.author.name)}</name>${x.author.uri ? `<uri>${e(x.author.uri)}</uri>` : ''}</author>
${x.category ? `    <category term="${e(x.category.term)}" label="${e(x.category.label)}"/>\n` : ''}    <summary type="text">${e(x.summary || x.title)}</summary>
  </entry>`
		)
		.join('\n');
	return `<?xml version="1.0" encoding="utf-8"?>
<feed xmlns="http://www.w3.org/2005/Atom" xml:lang="en">
  <id>${e(f.id)}</id>
  <title type="text">${e(f.title)}</title>
${f.subtitle ? `  <subtitle type="text">${e(f.subtitle)}</subtitle>\n` : ''}  <updated>${isoSeconds(f.updated)}</updated>
  <link rel="self" type="application/atom+xml" href="${e(f.selfUrl)}"/>
  <link rel="alternate" type="text/html" href="${e(f.htmlUrl)}"/>
  <generator>Starground</generator>
${entries}
</feed>
`;
}

/**
 * Permanent id of a build for feeds: a tag URI (RFC 4151) on the site's host name, so that it survives
 * a slug change. ('starground.example', 'b3…') → 'tag:starground.example,2026:build:b3…'.
 */
export function buildTagUri(hostname: string, buildId: string): string {
	return `tag:${hostname},2026:build:${buildId}`;
}

/** Entries in a feed. */
export const FEED_SIZE = 50;
/** `updated` of a feed with no entries yet (stable, so its ETag is too). */
const EMPTY_FEED_UPDATED = new Date('2026-01-01T00:00:00Z');

/** The newest published builds (optionally of one category) as an Atom feed for the site at `origin`. */
export async function buildsFeed(origin: string, category?: string): Promise<string> {
	const maker = schema.user;
	const rows = await db
		.select({
			id: schema.build.id,
			slug: schema.build.slug,
			title: schema.build.title,
			summary: schema.build.summary,
			category: schema.build.category,
			publishedAt: schema.build.publishedAt,
			updatedAt: schema.build.updatedAt,
			makerName: maker.name,
			makerHandle: maker.handle
		})
		.from(schema.build)
		.innerJoin(maker, eq(maker.id, schema.build.ownerId))
		.where(and(eq(schema.build.status, 'published'), category ? eq(schema.build.category, category) : undefined))
		.orderBy(desc(schema.build.publishedAt), desc(schema.build.id))
		.limit(FEED_SIZE);
	const host = new URL(origin).hostname;
	const label = category ? labelOf(CATEGORY_LABELS, category) : '';
	const entries: AtomEntry[] = rows.map((r) => {
		const published = r.publishedAt ?? r.updatedAt;
		return {
			id: buildTagUri(host, r.id),
			title: r.title,
			published,
			updated: r.updatedAt > published ? r.updatedAt : published,
			link: `${origin}/builds/${r.slug}`,
			author: { name: r.makerName, uri: r.makerHandle ? `${origin}/makers/${r.makerHandle}` : undefined },
			summary: r.summary,
			category: { term: r.category, label: labelOf(CATEGORY_LABELS, r.category) }
		};
	});
	const updated = entries.reduce((m, x) => (x.updated > m ? x.updated : m), EMPTY_FEED_UPDATED);
	return atomFeed({
		id: category ? `${origin}/categories/${category}/feed.xml` : `${origin}/feed.xml`,
		title: category ? `Starground — new ${label.toLowerCase()} builds` : 'Starground — new builds',
		subtitle: 'Newly published DIY audio build journals.',
		selfUrl: category ? `${origin}/categories/${category}/feed.xml` : `${origin}/feed.xml`,
		htmlUrl: category ? `${origin}/builds?category=${category}` : `${origin}/builds`,
		updated,
		entries
	});
}

/** An Atom response: the right media type; caching and ETag come from the HTTP cache hook. */
export function atomResponse(xml: string): Response {
	return new Response(xml, { headers: { 'content-type': 'application/atom+xml; charset=utf-8' } });
}

export interface SitemapUrl {
	loc: string;
	lastmod?: Date;
}

/** A sitemaps.org 0.9 urlset (at most 50,000 URLs, the protocol's limit). */
export function sitemapXml(urls: SitemapUrl[]): string {
	const body = urls
		.slice(0, 50_000)
		.map((u) => `  <url><loc>${xmlEscape(u.loc)}</loc>${u.lastmod ? `<lastmod>${isoSeconds(u.lastmod)}</lastmod>` : ''}</url>`)
		.join('\n');
	return `<?xml version="1.0" encoding="utf-8"?>
<urlset xmlns="http://www.sitemaps.org/schemas/sitemap/0.9">
${body}
</urlset>
`;
}

/** Public pages for search engines: the fixed pages, every published build, every maker with one. */
export async function sitemapUrls(origin: string): Promise<SitemapUrl[]> {
	const [builds, makers] = await Promise.all([
		db
			.select({ slug: schema.build.slug, updatedAt: schema.build.updatedAt })
			.from(schema.build)
			.where(eq(schema.build.status, 'published'))
			.orderBy(desc(schema.build.publishedAt))
			.limit(45_000),
		db
			.select({ handle: schema.user.handle, lastmod: sql<Date>`max(${schema.build.updatedAt})`.mapWith(schema.build.updatedAt) })
			.from(schema.user)
			.innerJoin(schema.build, eq(schema.build.ownerId, schema.user.id))
			.where(and(eq(schema.build.status, 'published'), isNotNull(schema.user.handle)))
			.groupBy(schema.user.handle)
			.limit(4_000)
	]);
	return [
		{ loc: `${origin}/` },
		{ loc: `${origin}/builds` },
		{ loc: `${origin}/tools` },
		{ loc: `${origin}/api/docs` },
		...builds.map((b) => ({ loc: `${origin}/builds/${b.slug}`, lastmod: b.updatedAt })),
		...makers.map((m) => ({ loc: `${origin}/makers/${m.handle}`, lastmod: m.lastmod }))
	];
}
