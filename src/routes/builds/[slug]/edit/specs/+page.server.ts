import { fail, redirect } from '@sveltejs/kit';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { z } from 'zod';
import { requireEditableBuild } from '$lib/server/builds';
import { attempt } from '$lib/server/http';
import { deleteSpecBlock, listSpecBlocks, moveSpecBlock, saveSpecBlock, specBlockVersion } from '$lib/server/specs';
import { SPEC_KINDS, isSpecKind, type SpecKind } from '$lib/specs';
import { fieldName, formToSpecData, mapSpecIssues, pointsShape, specDataToForm, specFormSchemas } from '$lib/schemas/spec-forms';
import type { Actions, PageServerLoad } from './$types';

/** Largest measurements CSV accepted, bytes. */
const POINTS_MAX_BYTES = 500_000;

const adapters = Object.fromEntries(SPEC_KINDS.map((k) => [k, zod4(specFormSchemas[k])])) as Record<SpecKind, ReturnType<typeof zod4>>;
const blockAction = z.object({ blockId: z.uuid(), direction: z.enum(['up', 'down']).optional() });

/** Put an issue on its input, or on the whole form when it names none. */
function setFieldError(form: Parameters<typeof setError>[0], field: string, message: string) {
	if (field) setError(form, field as never, message);
	else setError(form, message);
}

export const load: PageServerLoad = async ({ params, url }) => {
	const { build } = await requireEditableBuild(params.slug, { forView: true });
	const blocks = await listSpecBlocks(build.id);
	const editId = url.searchParams.get('edit');
	const addKind = url.searchParams.get('add');
	let editing: { kind: SpecKind; id: string | null; version: string | null } | null = null;
	let form = null;
	const target = editId ? blocks.find((b) => b.id === editId) : undefined;
	if (target && isSpecKind(target.kind)) {
		editing = { kind: target.kind, id: target.id, version: specBlockVersion(target) };
		form = await superValidate({ id: target.id, kind: target.kind, title: target.title, ...specDataToForm(target.kind, target.data) }, adapters[target.kind], {
			errors: false,
			id: `spec-${target.id}`
		});
	} else if (isSpecKind(addKind)) {
		editing = { kind: addKind, id: null, version: null };
		form = await superValidate(adapters[addKind], { id: `spec-new-${addKind}` });
	}
	return {
		build: { id: build.id, slug: build.slug, title: build.title, status: build.status, mainsPowered: build.mainsPowered },
		blocks,
		editing,
		form,
		saved: url.searchParams.get('saved')
	};
};

export const actions: Actions = {
	/** Add or change a block: text → data, the kind's schema on the server, field-level errors; nothing stored unless valid. */
	save: async ({ request, params }) => {
		const { actor, build } = await requireEditableBuild(params.slug);
		const fd = await request.formData();
		const kind = fd.get('kind');
		if (!isSpecKind(kind)) return fail(400, { error: `Choose a block kind: ${SPEC_KINDS.join(', ')}.` });
		const id = String(fd.get('id') ?? '');
		const form = await superValidate(fd, adapters[kind], { id: id ? `spec-${id}` : `spec-new-${kind}` });
		if (!form.valid) return fail(400, { form });
		const values = form.data as Record<string, string>;

		// A measurements CSV upload fills the point list its header names.
		const file = fd.get('pointsFile');
		if (kind === 'measurements' && file instanceof File && file.size > 0) {
			const bytes = new Uint8Array(await file.arrayBuffer());
			if (file.size > POINTS_MAX_BYTES || bytes.includes(0))
				return setError(form, fieldName('points.response') as never, file.size > POINTS_MAX_BYTES ? 'The CSV is larger than 500 kB.' : 'That file is not a text CSV.');
			const text = new TextDecoder().decode(bytes);
			const shape = pointsShape(text);
			if (!shape)
				return setError(form, fieldName('points.response') as never, 'line 1 of the uploaded CSV: the header must be frequency,dB or power,THD');
			values[fieldName(`points.${shape}`)] = text.replace(/\r\n?/g, '\n').trim();
		}

		const { data, issues, lineMaps } = formToSpecData(kind, values);
		if (issues.length) {
			for (const i of issues) setFieldError(form, i.field, i.message);
			return fail(422, { form });
		}
		const posted = fd.get('version');
		const version = typeof posted === 'string' && posted !== '' ? posted : null;
		const r = await attempt(() => saveSpecBlock(actor, build.id, { id: id || null, kind, title: values.title, data }, undefined, version));
		if (!r.ok) return r.failure;
		const saved = r.value;
		if (!saved.ok && saved.conflict) {
			// Keep the maker's values in the form; show the stored block beside them. Saving again replaces it on purpose.
			setError(form, 'Not saved: this block was changed elsewhere (another tab or an admin) since you opened it. Your values are in the form; the stored ones are listed beside them. Save again to replace the stored block with yours.');
			const theirs = specDataToForm(kind, saved.conflict.data);
			return fail(409, { form, conflict: { version: saved.conflict.version, title: saved.conflict.title, values: theirs } });
		}
		if (!saved.ok) {
			for (const i of mapSpecIssues(kind, saved.issues ?? [], lineMaps)) setFieldError(form, i.field, i.message);
			return fail(422, { form });
		}
		redirect(303, `/builds/${build.slug}/edit/specs?saved=${saved.id}#block-${saved.id}`);
	},

	delete: async ({ request, params }) => {
		const { actor, build } = await requireEditableBuild(params.slug);
		const parsed = blockAction.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return fail(400, { error: 'No such spec block.' });
		const r = await attempt(() => deleteSpecBlock(actor, build.id, parsed.data.blockId));
		if (!r.ok) return r.failure;
		redirect(303, `/builds/${build.slug}/edit/specs`);
	},

	move: async ({ request, params }) => {
		const { actor, build } = await requireEditableBuild(params.slug);
		const parsed = blockAction.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success || !parsed.data.direction) return fail(400, { error: 'No such spec block.' });
		const direction = parsed.data.direction === 'up' ? -1 : 1;
		const r = await attempt(() => moveSpecBlock(actor, build.id, parsed.data.blockId, direction));
		if (!r.ok) return r.failure;
		redirect(303, `/builds/${build.slug}/edit/specs#block-${parsed.data.blockId}`);
	}
};
