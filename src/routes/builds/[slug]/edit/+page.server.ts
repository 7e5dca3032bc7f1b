import { error, fail, redirect } from '@sveltejs/kit';
import { superValidate, message } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { z } from 'zod';
import { requireUser } from '$lib/server/auth';
import {
	addStep,
	archive,
	assertCanEdit,
	deleteStep,
	getBuildBySlug,
	loadBuildContent,
	moveStep,
	publish,
	requireVisibleBuild,
	runAction,
	updateBuild,
	updateStep
} from '$lib/server/builds';
import { buildSchema, stepSchema, type BuildInput } from '$lib/schemas/build';
import type { Actions, PageServerLoad } from './$types';

/**
 * The build at this address if the signed-in member may change it. Viewing the editor of someone
 * else's draft is a 404 (drafts look absent); any change they attempt is a 403.
 */
async function editable(slug: string, { forView = false } = {}) {
	const user = requireUser();
	const b = forView ? await requireVisibleBuild(slug, user) : await getBuildBySlug(slug);
	if (!b) error(404, 'Not found');
	assertCanEdit(user, b);
	return { user, b };
}

export const load: PageServerLoad = async ({ params, url }) => {
	const { b } = await editable(params.slug, { forView: true });
	const content = await loadBuildContent(b);
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
			revision: b.revision,
			locked: b.locked,
			derivedFromId: b.derivedFromId
		},
		cover: content.cover,
		steps: content.steps.map((s) => ({ id: s.id, title: s.title, bodyMd: s.bodyMd, photos: s.photos })),
		counts: { specBlocks: content.specBlocks.length, parts: content.parts.length },
		notice: url.searchParams.has('derived')
			? 'Your derived draft is ready: it starts with the parts list and spec blocks of the original. Write your own steps, then publish.'
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

function stepFailure(status: number, stepId: string, values: { title: string; bodyMd: string }, errors: Record<string, string[] | undefined>, error?: string) {
	return fail(status, { step: { id: stepId, values, errors, error: error ?? null } });
}

export const actions: Actions = {
	update: async ({ request, params }) => {
		const { user, b } = await editable(params.slug);
		const form = await superValidate(request, zod4(buildSchema));
		if (!form.valid) return fail(400, { form });
		const r = await runAction(() => updateBuild(user, b.id, form.data));
		if ('status' in r) return message(form, r.data.error, { status: r.status as 403 });
		if (r.slug !== b.slug) redirect(303, `/builds/${r.slug}/edit`);
		return message(form, r.revision ? `Saved as r${r.revision}.` : 'Saved.');
	},

	addStep: async ({ request, params }) => {
		const { user, b } = await editable(params.slug);
		const values = stepForm(await request.formData());
		const parsed = stepSchema.safeParse(values);
		if (!parsed.success) return stepFailure(400, 'new', values, z.flattenError(parsed.error).fieldErrors);
		const r = await runAction(() => addStep(user, b.id, parsed.data));
		if ('status' in r) return stepFailure(r.status, 'new', values, {}, r.data.error);
		return { stepSaved: r.id, ok: 'Step added.' };
	},

	updateStep: async ({ request, params }) => {
		const { user, b } = await editable(params.slug);
		const data = await request.formData();
		const id = stepIdSchema.safeParse({ stepId: data.get('stepId') });
		if (!id.success) return fail(400, { error: 'That step does not exist.' });
		const values = stepForm(data);
		const parsed = stepSchema.safeParse(values);
		if (!parsed.success) return stepFailure(400, id.data.stepId, values, z.flattenError(parsed.error).fieldErrors);
		const r = await runAction(() => updateStep(user, id.data.stepId, parsed.data, undefined, b.id));
		if (r && 'status' in r) return stepFailure(r.status, id.data.stepId, values, {}, r.data.error);
		return { stepSaved: id.data.stepId, ok: 'Step saved.' };
	},

	deleteStep: async ({ request, params }) => {
		const { user, b } = await editable(params.slug);
		const id = stepIdSchema.safeParse({ stepId: (await request.formData()).get('stepId') });
		if (!id.success) return fail(400, { error: 'That step does not exist.' });
		const r = await runAction(() => deleteStep(user, id.data.stepId, undefined, b.id));
		if (r) return r;
		return { ok: 'Step deleted.' };
	},

	moveStep: async ({ request, params }) => {
		const { user, b } = await editable(params.slug);
		const data = await request.formData();
		const parsed = moveSchema.safeParse({ stepId: data.get('stepId'), direction: data.get('direction') });
		if (!parsed.success) return fail(400, { error: 'That step cannot be moved.' });
		const r = await runAction(() => moveStep(user, parsed.data.stepId, parsed.data.direction, undefined, b.id));
		if (typeof r !== 'number') return r;
		return { moved: { id: parsed.data.stepId, direction: parsed.data.direction, position: r } };
	},

	publish: async ({ params }) => {
		const { user, b } = await editable(params.slug);
		const r = await runAction(() => publish(user, b.id));
		if (typeof r !== 'number') return r;
		redirect(303, `/builds/${b.slug}`);
	},

	archive: async ({ params }) => {
		const { user, b } = await editable(params.slug);
		const r = await runAction(() => archive(user, b.id));
		if (r) return r;
		return { ok: 'Archived.' };
	}
};
