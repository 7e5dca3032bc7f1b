/**
 * The builds API's JSON shapes (API.md): a list item, a build's detail, a photo, a lineage link. Pure
 * functions over what the list query (./list) and the detail loader (./queries) read.
 */
import type { Build } from '../db/schema';
import { photoUrl } from '../photos';
import { reviewStateJson, type ReviewState } from '../reviews/state';
import { CATEGORY_LABELS, PROGRESS_LABELS, TOPOLOGY_LABELS, labelOf } from '$lib/labels';
import type { PhotoView } from '$lib/media';
import type { BuildListRow } from './list';
import type { BuildContent, Lineage, LineageLink } from './queries';
import { snapshotPart, snapshotSpecBlock } from './snapshot';

/** A photo in API form: pixel sizes, alt text and the URL of every WebP rendition. */
export function serializePhoto(p: Omit<PhotoView, 'placeholder'>) {
	const widths = [...p.widths].sort((a, b) => a - b);
	return {
		id: p.id,
		alt: p.alt,
		widthPx: p.width,
		heightPx: p.height,
		url: photoUrl(p.keyPrefix, widths[widths.length - 1]),
		renditions: widths.map((w) => ({ widthPx: w, url: photoUrl(p.keyPrefix, w) }))
	};
}

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null);

/**
 * What every list shows of a list row, as both the API list items and the build cards (server/discover)
 * carry it: names and labels, the maker, the publish time (ISO 8601) and the cover as a photo view.
 */
export function listRowFields(r: BuildListRow) {
	return {
		slug: r.slug,
		title: r.title,
		summary: r.summary,
		category: r.category,
		categoryLabel: labelOf(CATEGORY_LABELS, r.category),
		topology: r.topology,
		topologyLabel: labelOf(TOPOLOGY_LABELS, r.topology),
		mainsPowered: r.mainsPowered,
		progress: r.progress,
		derivedCount: r.derivedCount,
		publishedAt: iso(r.publishedAt),
		maker: { name: r.makerName, handle: r.makerHandle },
		cover: coverView(r)
	};
}

/** The cover photo of a list row (left-joined: all fields null when the build has none). */
function coverView(r: BuildListRow): PhotoView | null {
	const c = r.cover;
	return c?.id
		? { id: c.id, keyPrefix: c.keyPrefix!, widths: c.widths!, width: c.width!, height: c.height!, alt: c.alt!, placeholder: c.placeholder }
		: null;
}

/** One build in a list, as the API answers it. */
export function serializeListItem(r: BuildListRow) {
	const f = listRowFields(r);
	return {
		...f,
		url: `/builds/${r.slug}`,
		licence: r.licence,
		status: r.status,
		progressLabel: labelOf(PROGRESS_LABELS, r.progress),
		revision: r.revision,
		locked: r.locked,
		updatedAt: iso(r.updatedAt),
		cover: f.cover ? serializePhoto(f.cover) : null,
		derivedFrom:
			r.originSlug && r.originStatus !== 'draft' ? { slug: r.originSlug, title: r.originTitle, url: `/builds/${r.originSlug}` } : null
	};
}

function serializeLink(l: LineageLink) {
	return { slug: l.slug, url: `/builds/${l.slug}`, title: l.title, status: l.status, maker: { name: l.makerName, handle: l.makerHandle } };
}

/** What the detail of a build is made of (see getBuildDetail, which loads it). */
export interface BuildDetailParts {
	build: Build;
	maker: { name: string; handle: string | null };
	content: BuildContent;
	lineage: Lineage;
	review: ReviewState;
}

/**
 * GET /api/v1/builds/:slug as JSON: the build with steps, spec blocks (derived values and checks), parts
 * list, review state (latest verdict, the revision it was given on, open flags) and lineage.
 */
export function serializeBuildDetail({ build: b, maker: m, content, lineage, review }: BuildDetailParts) {
	const coverPhoto = content.cover;
	return {
		slug: b.slug,
		url: `/builds/${b.slug}`,
		title: b.title,
		summary: b.summary,
		category: b.category,
		categoryLabel: labelOf(CATEGORY_LABELS, b.category),
		topology: b.topology,
		topologyLabel: labelOf(TOPOLOGY_LABELS, b.topology),
		mainsPowered: b.mainsPowered,
		licence: b.licence,
		status: b.status,
		progress: b.progress,
		progressLabel: labelOf(PROGRESS_LABELS, b.progress),
		revision: b.revision,
		derivedCount: b.derivedCount,
		locked: b.locked,
		lockedReason: b.locked ? b.lockedReason : null,
		publishedAt: iso(b.publishedAt),
		updatedAt: iso(b.updatedAt),
		maker: { name: m.name, handle: m.handle },
		cover: coverPhoto ? serializePhoto(coverPhoto) : null,
		steps: content.steps.map((s, i) => ({
			id: s.id,
			number: i + 1,
			title: s.title,
			bodyMd: s.bodyMd,
			bodyHtml: s.bodyHtml,
			photos: s.photos.map(serializePhoto)
		})),
		specBlocks: content.specBlocks.map(snapshotSpecBlock),
		parts: content.parts.map((p) => {
			// The line as a revision keeps it (one field list: snapshot.ts), with the substitution fields grouped.
			const { designValueText, designValue, substitutionReason, deviationPct, ...line } = snapshotPart(p);
			return {
				...line,
				position: p.position,
				substitution:
					designValueText != null && designValueText !== '' ? { designValueText, designValue, reason: substitutionReason, deviationPct } : null
			};
		}),
		review: reviewStateJson(review),
		lineage: {
			derivedFrom: lineage.derivedFrom ? serializeLink(lineage.derivedFrom) : null,
			derivedBuilds: lineage.derivedBuilds.map(serializeLink)
		}
	};
}
