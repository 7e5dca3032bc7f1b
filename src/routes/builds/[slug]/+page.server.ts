import { error, fail, redirect } from '@sveltejs/kit';
import { lockSchema } from '$lib/schemas/build';
import { commentEditSchema, commentSchema, reportSchema } from '$lib/schemas/review';
import type { CommentFailure } from '$lib/comments';
import { requireUser } from '$lib/server/auth';
import {
	archive,
	canDerive,
	canEdit,
	canLock,
	derive,
	getBuildPage,
	isOwner,
	publish,
	getBuildBySlug
} from '$lib/server/builds';
import { getFlagMarkers, getReviewPanel } from '$lib/server/reviews';
import { deleteComment, editComment, listComments, postComment, requireCommentableBuild } from '$lib/server/comments';
import { isOnBench } from '$lib/server/bench';
import { builtItPanel } from '$lib/server/built-it';
import { revisionLabel } from '$lib/revision-label';
import { fileReport, setBuildLocked } from '$lib/server/moderation';
import type { Actions, PageServerLoad } from './$types';
import { actorOf } from '$lib/server/actor';
import { attempt } from '$lib/server/http';
import { cachedReaderData, readerCacheable } from '$lib/server/builds/reader-cache';
import type { Build } from '$lib/server/db/schema';
import { attachmentsFor, toAttachmentView } from '$lib/server/attachments';
import { isWatching } from '$lib/server/watching';

export const load: PageServerLoad = async ({ params, locals, url }) => {
	const extra = {
		origin: url.origin,
		/** Set by the editor's redirect after publishing: the revision number it became. */
		justPublished: /^[1-9]\d{0,5}$/.test(url.searchParams.get('published') ?? '') ? Number(url.searchParams.get('published')) : null
	};
	if (!locals.user) {
		// Not signed in: the same for everyone, cached per build version ($lib/server/builds/reader-cache).
		const row = locals.readerBuild ?? (await getBuildBySlug(params.slug));
		if (readerCacheable(row)) return { ...(await cachedReaderData(row, () => pageData(params.slug, locals, row))), ...extra };
	}
	return { ...(await pageData(params.slug, locals)), ...extra };
};

/** What the page shows `locals.user` (null: an anonymous reader) of the build; `row` when already read. */
async function pageData(slug: string, locals: App.Locals, row?: Build) {
	const viewer = actorOf(locals.user);
	const user = locals.user;
	const page = await getBuildPage(slug, viewer, row);
	const b = page.build;
	const [review, flagMarkers, comments, saved, builtIt, attachments, watching] = await Promise.all([
		getReviewPanel(b.id, viewer),
		getFlagMarkers(b.id),
		b.status === 'draft' ? Promise.resolve([]) : listComments(b.id, viewer),
		viewer && b.status === 'published' ? isOnBench(viewer.id, b.id) : Promise.resolve(false),
		b.status === 'published' ? builtItPanel(b, viewer, page.specBlocks) : Promise.resolve(null),
		attachmentsFor(b, viewer),
		// Member-only state (server/watching); an anonymous reader's cached page always says false.
		viewer && !isOwner(viewer, b) ? isWatching(viewer.id, b.id) : Promise.resolve(false)
	]);
	return {
		watching,
		builtIt,
		review,
		saved,
		flagMarkers: Object.fromEntries(flagMarkers) as Record<string, number>,
		comments,
		viewer: user && viewer ? { id: user.id, name: user.name, handle: user.handle ?? null, role: viewer.role } : null,
		build: {
			id: b.id,
			slug: b.slug,
			title: b.title,
			summary: b.summary,
			category: b.category,
			topology: b.topology,
			mainsPowered: b.mainsPowered,
			licence: b.licence,
			status: b.status,
			progress: b.progress,
			locked: b.locked,
			lockedReason: b.lockedReason,
			revision: b.revision,
			pendingChangesAt: b.pendingChangesAt,
			derivedCount: b.derivedCount,
			derivedFromId: b.derivedFromId,
			publishedAt: b.publishedAt,
			updatedAt: b.updatedAt
		},
		maker: { name: page.maker.name, handle: page.maker.handle },
		cover: page.cover,
		steps: page.steps.map((s) => ({ id: s.id, title: s.title, bodyHtml: s.bodyHtml, photos: s.photos })),
		specBlocks: page.specBlocks,
		parts: page.parts,
		attachments: attachments.map((a) => toAttachmentView(a, b.slug)),
		lineage: page.lineage,
		can: {
			edit: canEdit(viewer, b),
			own: isOwner(viewer, b),
			derive: canDerive(viewer, b),
			lock: canLock(viewer)
		}
	};
}

/** A comment form's refusal: its status and what the page needs to show the sentence beside that form, text kept. */
function commentFailed(status: number, failure: CommentFailure) {
	return fail(status, { comment: failure });
}

/** The text of a form field ('' when missing or a file). */
function text(form: FormData, name: string): string {
	const v = form.get(name);
	return typeof v === 'string' ? v : '';
}

/** The build for an action; the domain call then decides (403 for someone who may not change it). */
async function found(slug: string) {
	const b = await getBuildBySlug(slug);
	if (!b) error(404, 'Not found');
	return b;
}

export const actions: Actions = {
	publish: async ({ params, request }) => {
		const actor = actorOf(requireUser());
		const b = await found(params.slug);
		const note = String((await request.formData()).get('note') ?? '');
		const r = await attempt(() => publish(actor, b.id, undefined, note));
		if (!r.ok) return r.failure;
		return { ok: `Published as ${revisionLabel(r.value)}: everyone can read it now.` };
	},
	archive: async ({ params }) => {
		const actor = actorOf(requireUser());
		const b = await found(params.slug);
		const r = await attempt(() => archive(actor, b.id));
		if (!r.ok) return r.failure;
		return { ok: 'Archived: it has left the lists but stays readable here.' };
	},
	derive: async ({ params }) => {
		const actor = actorOf(requireUser());
		const b = await found(params.slug);
		const r = await attempt(() => derive(actor, b.id));
		if (!r.ok) return r.failure;
		redirect(303, `/builds/${r.value.slug}/edit?started=1`);
	},
	// Comments are plain forms (the page ships no JavaScript): each success goes back to the comment it changed
	// (post/redirect/get), each refusal comes back to the same form with the sentence and the member's text.
	comment: async ({ params, request }) => {
		const actor = actorOf(requireUser());
		const form = await request.formData();
		const body = text(form, 'body');
		const parentId = text(form, 'parentId') || null;
		const kind = parentId ? 'reply' : 'post';
		const b = await requireCommentableBuild(params.slug, actor);
		const parsed = commentSchema.safeParse({ body, parentId });
		if (!parsed.success) return commentFailed(400, { kind, id: parentId, text: body, error: parsed.error.issues[0].message });
		const r = await attempt(() => postComment(actor, b, parsed.data));
		if (!r.ok) return commentFailed(r.status, { kind, id: parentId, text: body, error: r.error });
		redirect(303, `/builds/${b.slug}#comment-${r.value.id}`);
	},
	editComment: async ({ params, request }) => {
		const actor = actorOf(requireUser());
		const form = await request.formData();
		const id = text(form, 'commentId');
		const body = text(form, 'body');
		const b = await requireCommentableBuild(params.slug, actor);
		const parsed = commentEditSchema.safeParse({ body });
		if (!parsed.success) return commentFailed(400, { kind: 'edit', id, text: body, error: parsed.error.issues[0].message });
		const r = await attempt(() => editComment(actor, b, id, parsed.data.body));
		if (!r.ok) return commentFailed(r.status, { kind: 'edit', id, text: body, error: r.error });
		redirect(303, `/builds/${b.slug}#comment-${r.value.id}`);
	},
	deleteComment: async ({ params, request }) => {
		const actor = actorOf(requireUser());
		const id = text(await request.formData(), 'commentId');
		const b = await requireCommentableBuild(params.slug, actor);
		const r = await attempt(() => deleteComment(actor, b, id));
		if (!r.ok) return commentFailed(r.status, { kind: 'delete', id, text: '', error: r.error });
		redirect(303, `/builds/${b.slug}?comment=deleted#comments`);
	},
	reportComment: async ({ params, request }) => {
		const actor = actorOf(requireUser());
		const form = await request.formData();
		const id = text(form, 'commentId');
		const reason = text(form, 'reason');
		const b = await requireCommentableBuild(params.slug, actor);
		const parsed = reportSchema.safeParse({ targetKind: 'comment', targetId: id, reason });
		if (!parsed.success) return commentFailed(400, { kind: 'report', id, text: reason, error: parsed.error.issues[0].message });
		const r = await attempt(() => fileReport(actor, parsed.data));
		if (!r.ok) return commentFailed(r.status, { kind: 'report', id, text: reason, error: r.error });
		redirect(303, `/builds/${b.slug}?comment=reported&id=${encodeURIComponent(id)}#comment-${encodeURIComponent(id)}`);
	},
	lock: async ({ params, request }) => {
		const actor = actorOf(requireUser());
		const b = await found(params.slug);
		const form = await request.formData();
		const parsed = lockSchema.safeParse({ locked: form.get('locked') === 'true', reason: form.get('reason') ?? '' });
		if (!parsed.success) return fail(400, { error: parsed.error.issues[0].message });
		const r = await attempt(() => setBuildLocked(actor, b.id, parsed.data.locked, parsed.data.reason));
		if (!r.ok) return r.failure;
		return { ok: parsed.data.locked ? 'Build locked. Its maker sees your reason.' : 'Build unlocked.' };
	}
};
