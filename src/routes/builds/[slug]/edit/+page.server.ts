import { notifyRevision } from '$lib/server/notifications';
import { fail, redirect } from '@sveltejs/kit';
import { superValidate, message } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { z } from 'zod';
import {
	addStep,
	archive,
	deleteStep,
	loadBuildContent,
	loadLineage,
	moveStep,
	pendingChanges,
	publish,
	publishRevision,
	REVISION_NOTE_MAX,
	wasSignedOff,
	requireEditableBuild,
	setBuildProgress,
	stepVersion,
	updateBuild,
	updateStep
} from '$lib/server/builds';
import { attempt } from '$lib/server/http';
import { buildSchema, stepSchema, type BuildInput, type BuildProgress } from '$lib/schemas/build';
import { revisionLabel } from '$lib/revision-label';
import { allowedLicencesFor, isShareAlike, needsAttribution } from '$lib/licences';
import { LICENCE_LABELS, PROGRESS_LABELS, labelOf } from '$lib/labels';
import { actorOf } from '$lib/server/actor';
import { attachmentMaxBytes, listAttachments, toAttachmentView } from '$lib/server/attachments';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, url, locals }) => {
	const { build: b } = await requireEditableBuild(params.slug, { forView: true });
	const [content, pending, signedOff, lineage, attachments] = await Promise.all([
		loadBuildContent(b),
		b.revision > 0 ? pendingChanges(b.id) : null,
		b.revision > 0 ? wasSignedOff(b.id) : false,
		b.derivedFromId ? loadLineage(b, actorOf(locals.user)) : null,
		listAttachments(b.id)
	]);
	const origin = lineage?.derivedFrom ?? null;
	const licences = allowedLicencesFor(origin?.licence);
	const fields: BuildInput = {
		title: b.title,
		summary: b.summary,
		category: b.category as BuildInput['category'],
		topology: b.topology as BuildInput['topology'],
		mainsPowered: b.mainsPowered,
		licence: b.licence as BuildInput['licence']
	};
	return {
		form: await superValidate(fields, zod4(buildSchema), { errors: false }),
		build: {
			id: b.id,
			slug: b.slug,
			title: b.title,
			status: b.status,
			progress: b.progress as BuildProgress,
			revision: b.revision,
			locked: b.locked,
			derivedFromId: b.derivedFromId,
			mainsPowered: b.mainsPowered
		},
		cover: content.cover,
		attachments: attachments.map((a) => toAttachmentView(a, b.slug)),
		attachmentMaxBytes: attachmentMaxBytes(),
		steps: content.steps.map((s) => ({ id: s.id, title: s.title, bodyMd: s.bodyMd, version: stepVersion(s), photos: s.photos })),
		counts: { specBlocks: content.specBlocks.length, parts: content.parts.length },
		/** Changes since the latest revision, not yet published as one (published and archived builds). */
		pending: pending ? { changes: pending.changes, since: pending.since } : null,
		/** A reviewer signed it off once: a change note is then required. */
		noteRequired: signedOff,
		noteMax: REVISION_NOTE_MAX,
		licences,
		licenceNote: origin
			? isShareAlike(origin.licence)
				? `Based on “${origin.title}” by ${origin.makerName}, shared under ${labelOf(LICENCE_LABELS, origin.licence)}: a build based on it keeps that licence (share alike), and credits it.`
				: `Based on “${origin.title}” by ${origin.makerName} (${labelOf(LICENCE_LABELS, origin.licence)}): choose any licence${needsAttribution(origin.licence) ? '; the build page credits the original' : ''}.`
			: null,
		notice: url.searchParams.has('started')
			? 'Your draft is ready, based on the original: it starts with its parts list and spec blocks. Write your own steps, then publish.'
			: url.searchParams.has('created')
				? 'Draft created. Add steps, photos, spec blocks and the parts list; publish when it is ready.'
				: null
	};
};

const stepIdSchema = z.object({ stepId: z.uuid() });
const moveSchema = stepIdSchema.extend({ direction: z.enum(['up', 'down']) });

/** The submitted step fields, echoed back with errors so nothing typed is lost. */
function stepForm(data: FormData) {
	return { title: String(data.get('title') ?? ''), bodyMd: String(data.get('bodyMd') ?? '') };
}

function stepFailure(
	status: number,
	stepId: string,
	values: { title: string; bodyMd: string },
	errors: Record<string, string[] | undefined>,
	error?: string,
	extra: { version?: string | null; theirs?: { title: string; bodyMd: string } | null } = {}
) {
	return fail(status, { step: { id: stepId, values, errors, error: error ?? null, version: extra.version ?? null, theirs: extra.theirs ?? null } });
}

export const actions: Actions = {
	update: async ({ request, params }) => {
		const { actor, build: b } = await requireEditableBuild(params.slug);
		const form = await superValidate(request, zod4(buildSchema));
		if (!form.valid) return fail(400, { form });
		const r = await attempt(() => updateBuild(actor, b.id, form.data));
		if (!r.ok) return message(form, r.error, { status: r.status as 403 });
		if (r.value.slug !== b.slug) redirect(303, `/builds/${r.value.slug}/edit`);
		return message(form, b.status === 'draft' ? 'Saved.' : 'Saved. It joins the pending changes: publish them as a revision when you are ready.');
	},

	addStep: async ({ request, params }) => {
		const { actor, build: b } = await requireEditableBuild(params.slug);
		const values = stepForm(await request.formData());
		const parsed = stepSchema.safeParse(values);
		if (!parsed.success) return stepFailure(400, 'new', values, z.flattenError(parsed.error).fieldErrors);
		const r = await attempt(() => addStep(actor, b.id, parsed.data));
		if (!r.ok) return stepFailure(r.status, 'new', values, {}, r.error);
		return { stepSaved: r.value.id, ok: 'Step added.' };
	},

	updateStep: async ({ request, params }) => {
		const { actor, build: b } = await requireEditableBuild(params.slug);
		const data = await request.formData();
		const id = stepIdSchema.safeParse({ stepId: data.get('stepId') });
		if (!id.success) return fail(400, { error: 'That step does not exist.' });
		const values = stepForm(data);
		const posted = data.get('version');
		const version = typeof posted === 'string' && posted !== '' ? posted : null;
		const parsed = stepSchema.safeParse(values);
		if (!parsed.success) return stepFailure(400, id.data.stepId, values, z.flattenError(parsed.error).fieldErrors, undefined, { version });
		const r = await attempt(() => updateStep(actor, id.data.stepId, parsed.data, undefined, b.id, version));
		if (!r.ok) return stepFailure(r.status, id.data.stepId, values, {}, r.error, { version });
		if (r.value.conflict) {
			// Keep the maker's text in the form; show the stored step beside it. Saving again replaces it on purpose.
			const { version: theirVersion, ...theirs } = r.value.conflict;
			return stepFailure(409, id.data.stepId, values, {}, 'Not saved: this step was changed elsewhere (another tab or an admin) since you opened it. Your text is below; the stored text is shown beside it. Save again to replace the stored text with yours.', { version: theirVersion, theirs });
		}
		return { stepSaved: id.data.stepId, ok: 'Step saved.' };
	},

	deleteStep: async ({ request, params }) => {
		const { actor, build: b } = await requireEditableBuild(params.slug);
		const id = stepIdSchema.safeParse({ stepId: (await request.formData()).get('stepId') });
		if (!id.success) return fail(400, { error: 'That step does not exist.' });
		const r = await attempt(() => deleteStep(actor, id.data.stepId, undefined, b.id));
		if (!r.ok) return r.failure;
		return { ok: 'Step deleted.' };
	},

	moveStep: async ({ request, params }) => {
		const { actor, build: b } = await requireEditableBuild(params.slug);
		const data = await request.formData();
		const parsed = moveSchema.safeParse({ stepId: data.get('stepId'), direction: data.get('direction') });
		if (!parsed.success) return fail(400, { error: 'That step cannot be moved.' });
		const r = await attempt(() => moveStep(actor, parsed.data.stepId, parsed.data.direction, undefined, b.id));
		if (!r.ok) return r.failure;
		return { moved: { id: parsed.data.stepId, direction: parsed.data.direction, position: r.value } };
	},

	publish: async ({ request, params }) => {
		const { actor, build: b } = await requireEditableBuild(params.slug);
		const note = String((await request.formData()).get('note') ?? '');
		const r = await attempt(() => publish(actor, b.id, undefined, note));
		if (!r.ok) return r.failure;
		redirect(303, `/builds/${b.slug}?published=${r.value}`);
	},

	/** Publish the pending changes of a published build as one revision with the maker's change note. */
	publishChanges: async ({ request, params }) => {
		const { actor, build: b } = await requireEditableBuild(params.slug);
		const note = String((await request.formData()).get('note') ?? '');
		const r = await attempt(() => publishRevision(actor, b.id, note));
		if (!r.ok) return fail(r.status, { error: r.error, note });
		await notifyRevision({ actorId: actor.id, makerName: actor.name ?? 'The maker', build: b, revision: r.value.number, summary: r.value.summary, note });
		return { ok: `Published as ${revisionLabel(r.value.number)}: ${r.value.summary}.`, published: r.value.number };
	},

	/** The maker's build status (in progress / working / abandoned): takes effect at once, no revision. */
	setProgress: async ({ request, params }) => {
		const { actor, build: b } = await requireEditableBuild(params.slug);
		const progress = (await request.formData()).get('progress');
		const r = await attempt(() => setBuildProgress(actor, b.id, progress));
		if (!r.ok) return r.failure;
		return { ok: `Build status set to “${PROGRESS_LABELS[r.value]}”.` };
	},

	archive: async ({ params }) => {
		const { actor, build: b } = await requireEditableBuild(params.slug);
		const r = await attempt(() => archive(actor, b.id));
		if (!r.ok) return r.failure;
		return { ok: 'Archived.' };
	}
};
