/** What a build card shows (home, browse, search, profiles, bench). Client-safe: plain data. */
import type { PhotoView } from '$lib/media';
import type { ReviewState } from '$lib/reviews';

export interface BuildCardData {
	id: string;
	slug: string;
	title: string;
	summary: string;
	category: string;
	categoryLabel: string;
	topology: string;
	topologyLabel: string;
	mainsPowered: boolean;
	/** The maker's build status: in-progress, working, abandoned. */
	progress: string;
	derivedCount: number;
	/** ISO 8601, UTC. */
	publishedAt: string | null;
	maker: { name: string; handle: string | null };
	cover: PhotoView | null;
	/** null when the review state was not loaded. */
	review: ReviewState | null;
	/** Search only: the title with hits in <mark>, escaped by the server (only <mark> tags). */
	titleHtml?: string;
	/** Search only: fragments around the hits, escaped by the server (only <mark> tags). */
	snippetHtml?: string;
}
