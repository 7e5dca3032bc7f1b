// Authorization matrix, asserted over real HTTP against the running app: every mutating form action and API
// route × {signed out, maker (owner), maker (other), reviewer, moderator, admin, suspended} → allowed or
// denied. Form actions are posted as a browser without JavaScript posts them (urlencoded, Accept: text/html,
// same Origin). "Denied" means: redirected to sign-in, 401, 403 or 404 — and never a 5xx. "Allowed" means
// 2xx or a redirect elsewhere. Anything else (409, 422, 500…) fails the case, so a denial can never hide
// behind a validation error. Throwaway members and builds are made in the test; it can run repeatedly.
import { test, expect, request as playwrightRequest, type APIRequestContext, type APIResponse } from '@playwright/test';
import sharp from 'sharp';
import { DEMO_PASSWORD } from './helpers/auth';
import { waitForMail, linkIn } from './helpers/mail';
import { throwawayMember } from './helpers/members';
import { origin, uniqueTitle, SUPPLY_FORM } from './helpers/builds';

const ACTORS = ['anon', 'owner', 'other', 'reviewer', 'moderator', 'admin', 'suspended'] as const;
type Actor = (typeof ACTORS)[number];
type Outcome = 'allow' | 'deny' | `other ${number}`;

const ctx = {} as Record<Actor, APIRequestContext>;
const ids = {} as Record<'other' | 'suspended', { id: string; handle: string; email: string }>;

// ---- HTTP helpers -----------------------------------------------------------------------------------

const formHeaders = () => ({ origin: origin(), accept: 'text/html' });
const jsonHeaders = () => ({ origin: origin(), accept: 'application/json' });

function postForm(c: APIRequestContext, path: string, form: Record<string, string>) {
	return c.post(path, { form, headers: formHeaders(), maxRedirects: 0 });
}

function classify(res: APIResponse): Outcome {
	const s = res.status();
	if (s === 303 || s === 302 || s === 307) {
		const loc = res.headers()['location'] ?? '';
		return loc.startsWith('/sign-in') || loc.includes('/sign-in?') ? 'deny' : 'allow';
	}
	if (s === 401 || s === 403 || s === 404) return 'deny';
	if (s >= 200 && s < 300) return 'allow';
	return `other ${s}`;
}

async function newContext(): Promise<APIRequestContext> {
	return playwrightRequest.newContext({ baseURL: origin() });
}

async function signIn(c: APIRequestContext, email: string, password = DEMO_PASSWORD) {
	const res = await postForm(c, '/sign-in', { email, password });
	expect(res.status(), `sign in ${email}`).toBe(303);
}

/** A member's id, read from the members page as a moderator sees it. */
async function memberId(handle: string): Promise<string> {
	const html = await (await ctx.moderator.get(`/admin/members?q=${encodeURIComponent(handle)}`)).text();
	const row = html.split(`data-member="${handle}"`)[1];
	const m = row?.match(/name="userId" value="([^"]+)"/);
	if (!m) throw new Error(`no member id for ${handle}`);
	return m[1];
}

/** A draft build of the owner (joss) with one step; → slug. */
async function draftBuild(title = uniqueTitle('Matrix draft')): Promise<string> {
	const res = await postForm(ctx.owner, '/builds/new', {
		title,
		summary: 'Authorization matrix fixture.',
		category: 'power-amp',
		topology: 'class-ab-chip',
		mainsPowered: 'on',
		licence: 'CC-BY-SA-4.0'
	});
	expect(res.status()).toBe(303);
	const slug = res.headers()['location'].split('/')[2];
	const step = await postForm(ctx.owner, `/builds/${slug}/edit?/addStep`, { title: 'Heatsink and mounting', bodyMd: 'Tab at V−.' });
	expect(step.status()).toBe(200);
	return slug;
}


async function publishedBuild(title?: string): Promise<{ slug: string; stepId: string }> {
	const slug = await draftBuild(title);
	const pub = await postForm(ctx.owner, `/builds/${slug}/edit?/publish`, {});
	expect([200, 303]).toContain(pub.status());
	const html = await (await ctx.reviewer.get(`/builds/${slug}/review`)).text();
	const stepId = html.match(/data-review-target="step" data-target-id="([^"]+)"/)?.[1];
	if (!stepId) throw new Error('no step id in review mode');
	return { slug, stepId };
}

/** Raise an open flag on the build's step (as maren) and return its id. */
async function openFlag(slug: string, stepId: string): Promise<string> {
	const res = await postForm(ctx.reviewer, `/builds/${slug}/review?/raiseFlag`, {
		targetKind: 'step',
		targetId: stepId,
		category: 'heat',
		severity: 'check',
		note: 'Matrix fixture flag: check the insulator.'
	});
	expect(res.status()).toBe(200);
	const api = await ctx.owner.get(`/builds/${slug}`);
	const ids = [...(await api.text()).matchAll(/data-flag="([0-9a-f-]{36})"/g)].map((m) => m[1]);
	const known = flagsSeen.get(slug) ?? new Set<string>();
	const fresh = ids.find((i) => !known.has(i));
	if (!fresh) throw new Error('flag not found on the build page');
	known.add(fresh);
	flagsSeen.set(slug, known);
	return fresh;
}
const flagsSeen = new Map<string, Set<string>>();

async function postComment(c: APIRequestContext, slug: string, body: string): Promise<string> {
	const res = await c.post(`/api/v1/builds/${slug}/comments`, { data: { body }, headers: jsonHeaders() });
	expect(res.status(), await res.text()).toBe(201);
	return (await res.json()).id;
}

// ---- fixtures ---------------------------------------------------------------------------------------

let B: { slug: string; stepId: string }; // the owner's published build most cases act on
let buildId: string;
let commentByOther: string;
let photo: Buffer;

test.describe.configure({ mode: 'serial' });

test.beforeAll(async () => {
	test.setTimeout(180_000);
	for (const a of ACTORS) ctx[a] = await newContext();
	await signIn(ctx.owner, 'joss@starground.test');
	await signIn(ctx.reviewer, 'maren@starground.test');
	await signIn(ctx.moderator, 'tomas@starground.test');
	await signIn(ctx.admin, 'ilse@starground.test');
	const other = await throwawayMember(ctx.other, 'mxo');
	const susp = await throwawayMember(ctx.suspended, 'mxs');
	ids.other = { ...other, id: await memberId(other.handle) };
	ids.suspended = { ...susp, id: await memberId(susp.handle) };
	// The suspended member still holds a session cookie from before the suspension.
	const s = await postForm(ctx.moderator, '/moderation?/suspendMember', { userId: ids.suspended.id, reason: 'Authorization matrix fixture' });
	expect(s.status()).toBe(200);

	B = await publishedBuild(uniqueTitle('Matrix build'));
	const html = await (await ctx.moderator.get(`/builds/${B.slug}`)).text();
	buildId = html.match(/name="buildId" value="([0-9a-f-]{36})"/)?.[1] ?? (await idFromModeration(B.slug));
	commentByOther = await postComment(ctx.other, B.slug, 'Matrix fixture comment by another maker.');
	photo = await sharp({ create: { width: 800, height: 600, channels: 3, background: { r: 176, g: 89, b: 43 } } }).jpeg().toBuffer();
});

/** The build's id, from a report about it on the moderation desk (the public page does not print ids). */
async function idFromModeration(slug: string): Promise<string> {
	await ctx.other.post('/api/v1/reports', { data: { targetKind: 'build', targetId: slug, reason: 'Matrix fixture report' }, headers: jsonHeaders() });
	const html = await (await ctx.moderator.get('/moderation')).text();
	const card = html.split(`href="/builds/${slug}"`)[1];
	const m = card?.match(/name="buildId" value="([0-9a-f-]{36})"/);
	if (!m) throw new Error('no build id');
	return m[1];
}

test.afterAll(async () => {
	for (const a of ACTORS) await ctx[a]?.dispose();
});

// ---- the matrix -------------------------------------------------------------------------------------

interface Case {
	name: string;
	allowed: Actor[];
	/** Statuses that count as a denial for this case besides 401/403/404 (e.g. 400 for a forged link). */
	alsoDenied?: number[];
	/** Perform the request as `actor`. Per-actor fixtures are made inside when the action consumes state. */
	run: (actor: Actor) => Promise<APIResponse>;
}

const SIGNED_IN: Actor[] = ['owner', 'other', 'reviewer', 'moderator', 'admin'];
const OWNER_ADMIN: Actor[] = ['owner', 'admin'];
const REVIEWERS: Actor[] = ['reviewer', 'moderator', 'admin'];
const MODS: Actor[] = ['moderator', 'admin'];

const results: Record<string, Record<Actor, Outcome>> = {};

const cases: Case[] = [
	{
		name: 'create build (POST /builds/new)',
		allowed: SIGNED_IN,
		run: (a) =>
			postForm(ctx[a], '/builds/new', {
				title: uniqueTitle('Matrix new'),
				category: 'preamp',
				topology: 'passive',
				licence: 'CC0-1.0'
			})
	},
	{
		name: 'edit build (edit?/update)',
		allowed: OWNER_ADMIN,
		run: (a) =>
			postForm(ctx[a], `/builds/${B.slug}/edit?/update`, {
				title: 'Matrix build (edited)',
				summary: 'Authorization matrix fixture.',
				category: 'power-amp',
				topology: 'class-ab-chip',
				mainsPowered: 'on',
				licence: 'CC-BY-SA-4.0'
			})
	},
	{
		name: 'add step (edit?/addStep)',
		allowed: OWNER_ADMIN,
		run: (a) => postForm(ctx[a], `/builds/${B.slug}/edit?/addStep`, { title: `Step by ${a}`, bodyMd: 'Matrix step.' })
	},
	{
		name: 'save parts list (edit/parts?/save)',
		allowed: OWNER_ADMIN,
		run: (a) =>
			postForm(ctx[a], `/builds/${B.slug}/edit/parts?/save`, {
				designators: 'R1',
				quantity: '1',
				kind: 'resistor',
				value: '22k',
				tolerance: '',
				ratingV: '',
				ratingW: '',
				package: '',
				notes: '',
				designValue: '',
				reason: ''
			})
	},
	{
		name: 'save spec block (edit/specs?/save)',
		allowed: OWNER_ADMIN,
		run: (a) => postForm(ctx[a], `/builds/${B.slug}/edit/specs?/save`, SUPPLY_FORM)
	},
	{
		name: 'upload photo (POST /builds/[slug]/photos)',
		allowed: OWNER_ADMIN,
		run: (a) =>
			ctx[a].post(`/builds/${B.slug}/photos`, {
				multipart: { purpose: 'cover', alt: 'Matrix photo', file: { name: 'm.jpg', mimeType: 'image/jpeg', buffer: photo } },
				headers: jsonHeaders(),
				maxRedirects: 0
			})
	},
	{
		name: 'publish (edit?/publish on a draft)',
		allowed: OWNER_ADMIN,
		run: async (a) => postForm(ctx[a], `/builds/${await draftBuild()}/edit?/publish`, {})
	},
	{
		name: 'derive (builds/[slug]?/derive)',
		allowed: SIGNED_IN,
		run: (a) => postForm(ctx[a], `/builds/${B.slug}?/derive`, {})
	},
	{
		name: 'request review (request-review)',
		allowed: ['owner'],
		run: (a) => postForm(ctx[a], `/builds/${B.slug}/request-review`, {})
	},
	{
		name: 'tag a hazard (review?/raiseFlag)',
		allowed: REVIEWERS,
		run: (a) =>
			postForm(ctx[a], `/builds/${B.slug}/review?/raiseFlag`, {
				targetKind: 'step',
				targetId: B.stepId,
				category: 'wiring',
				severity: 'check',
				note: `Matrix flag by ${a}.`
			})
	},
	{
		name: 'mark hazard tag fixed (hazards/[id]?/address)',
		allowed: ['owner'],
		run: async (a) =>
			postForm(ctx[a], `/builds/${B.slug}/hazards/${await openFlag(B.slug, B.stepId)}?/address`, { note: 'Fitted the insulator.' })
	},
	{
		name: 'clear hazard tag (hazards/[id]?/resolve)',
		allowed: REVIEWERS,
		run: async (a) => postForm(ctx[a], `/builds/${B.slug}/hazards/${await openFlag(B.slug, B.stepId)}?/resolve`, {})
	},
	{
		name: 'submit review (review?/submitReview)',
		allowed: REVIEWERS,
		run: (a) => postForm(ctx[a], `/builds/${B.slug}/review?/submitReview`, { verdict: 'rework', summary: `Matrix review by ${a}: rework.` })
	},
	{
		name: 'post comment (POST /api/v1/builds/[slug]/comments)',
		allowed: SIGNED_IN,
		run: (a) => ctx[a].post(`/api/v1/builds/${B.slug}/comments`, { data: { body: `Matrix comment by ${a}` }, headers: jsonHeaders() })
	},
	{
		name: 'edit comment (PATCH …/comments/[id]; author = maker other)',
		allowed: ['other'],
		run: (a) =>
			ctx[a].patch(`/api/v1/builds/${B.slug}/comments/${commentByOther}`, { data: { body: `Edited by ${a}` }, headers: jsonHeaders() })
	},
	{
		name: 'delete comment (DELETE …/comments/[id]; author = maker other)',
		allowed: ['other'],
		run: async (a) => {
			// The author deletes a comment of their own; everybody else tries the author's standing comment.
			const id = a === 'other' ? await postComment(ctx.other, B.slug, 'Matrix comment to delete.') : commentByOther;
			return ctx[a].delete(`/api/v1/builds/${B.slug}/comments/${id}`, { headers: jsonHeaders() });
		}
	},
	{
		name: 'report (POST /api/v1/reports)',
		allowed: SIGNED_IN,
		run: (a) =>
			ctx[a].post('/api/v1/reports', { data: { targetKind: 'comment', targetId: commentByOther, reason: `Matrix report by ${a}` }, headers: jsonHeaders() })
	},
	{
		name: 'hide comment (moderation?/hideComment)',
		allowed: MODS,
		run: async (a) => {
			const id = MODS.includes(a) ? await postComment(ctx.other, B.slug, `Matrix comment to hide by ${a}.`) : commentByOther;
			return postForm(ctx[a], '/moderation?/hideComment', { commentId: id, reason: 'Matrix: hide' });
		}
	},
	{
		name: 'lock build (moderation?/lockBuild)',
		allowed: MODS,
		run: async (a) => {
			const target = MODS.includes(a) ? await lockableBuildId() : buildId;
			return postForm(ctx[a], '/moderation?/lockBuild', { buildId: target, reason: 'Matrix: lock' });
		}
	},
	{
		name: 'lock build (builds/[slug]?/lock)',
		allowed: MODS,
		run: async (a) => {
			const slug = MODS.includes(a) ? (await publishedBuild()).slug : B.slug;
			return postForm(ctx[a], `/builds/${slug}?/lock`, { locked: 'true', reason: 'Matrix: lock from the build page' });
		}
	},
	{
		name: 'suspend member (moderation?/suspendMember)',
		allowed: MODS,
		run: (a) => postForm(ctx[a], '/moderation?/suspendMember', { userId: ids.suspended.id, reason: `Matrix: suspend again by ${a}` })
	},
	{
		name: 'suspend member (admin/members?/suspend)',
		allowed: MODS,
		run: (a) => postForm(ctx[a], '/admin/members?/suspend', { userId: ids.suspended.id, reason: `Matrix: suspend again by ${a}` })
	},
	{
		name: 'set role (admin/members?/setRole, maker → maker)',
		allowed: MODS,
		run: (a) => postForm(ctx[a], '/admin/members?/setRole', { userId: ids.other.id, role: 'maker', reason: 'Matrix: no change' })
	},
	{
		name: 'appoint reviewer (moderation?/setReviewer, maker → maker)',
		allowed: MODS,
		run: (a) => postForm(ctx[a], '/moderation?/setReviewer', { userId: ids.other.id, role: 'maker', reason: 'Matrix: no change' })
	},
	{
		name: 'close report (moderation?/closeReport)',
		allowed: MODS,
		run: async (a) => {
			// A fresh open report for each actor (by the throwaway maker, about the throwaway suspended member).
			const about = { targetKind: 'member', targetId: ids.suspended.handle };
			let r = await ctx.other.post('/api/v1/reports', { data: { ...about, reason: `Matrix report to close (${a})` }, headers: jsonHeaders() });
			if (r.status() === 200) {
				// Still open from an actor who may not close it: close it as admin, then report afresh.
				await postForm(ctx.admin, '/moderation?/closeReport', { reportId: (await r.json()).id, reason: 'Matrix: reset' });
				r = await ctx.other.post('/api/v1/reports', { data: { ...about, reason: `Matrix report to close (${a})` }, headers: jsonHeaders() });
			}
			expect(r.status()).toBe(201);
			return postForm(ctx[a], '/moderation?/closeReport', { reportId: (await r.json()).id, reason: 'Matrix: closed' });
		}
	},
	{
		name: 'read audit log (GET /admin/audit)',
		allowed: ['admin'],
		run: (a) => ctx[a].get('/admin/audit', { headers: { accept: 'text/html' }, maxRedirects: 0 })
	},
	{
		name: 'read review desk (GET /review-desk)',
		allowed: REVIEWERS,
		run: (a) => ctx[a].get('/review-desk', { headers: { accept: 'text/html' }, maxRedirects: 0 })
	},
	{
		name: 'read moderation desk (GET /moderation)',
		allowed: MODS,
		run: (a) => ctx[a].get('/moderation', { headers: { accept: 'text/html' }, maxRedirects: 0 })
	},
	{
		name: 'save account settings (POST /account)',
		allowed: SIGNED_IN,
		run: async (a) => {
			// Each member saves their own current settings back unchanged, so demo members keep their profiles.
			const html = a === 'anon' || a === 'suspended' ? '' : await (await ctx[a].get('/account')).text();
			const unescape = (v: string) =>
				v.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&amp;/g, '&');
			const name = html.match(/name="name"[^>]*value="([^"]*)"/)?.[1] ?? html.match(/value="([^"]*)"[^>]*name="name"/)?.[1] ?? 'Nobody';
			const bio = html.match(/<textarea[^>]*name="bio"[^>]*>([\s\S]*?)<\/textarea>/)?.[1] ?? '';
			const on = (k: string) => (new RegExp(`name="${k}"[^>]*checked`).test(html) ? { [k]: 'on' } : {});
			return postForm(ctx[a], '/account', {
				name: unescape(name),
				bio: unescape(bio),
				...on('notifyReview'),
				...on('notifyFlag'),
				...on('notifyReply')
			});
		}
	},
	{
		name: 'save to bench (bench?/toggle)',
		allowed: SIGNED_IN,
		run: (a) => postForm(ctx[a], '/bench?/toggle', { slug: B.slug, save: '1' })
	},
	{
		name: 'delete step (edit?/deleteStep)',
		allowed: OWNER_ADMIN,
		run: async (a) => {
			// Allowed actors delete a step made for them; everybody else tries the build's first step.
			const stepId = OWNER_ADMIN.includes(a) ? await freshStep(B.slug) : B.stepId;
			return postForm(ctx[a], `/builds/${B.slug}/edit?/deleteStep`, { stepId });
		}
	},
	{
		name: 'move step (edit?/moveStep)',
		allowed: OWNER_ADMIN,
		run: (a) => postForm(ctx[a], `/builds/${B.slug}/edit?/moveStep`, { stepId: B.stepId, direction: a === 'admin' ? 'up' : 'down' })
	},
	{
		name: 'delete spec block (edit/specs?/delete)',
		allowed: OWNER_ADMIN,
		run: async (a) => {
			const blockId = OWNER_ADMIN.includes(a) ? await freshSpecBlock(B.slug) : await standingSpecBlock();
			return postForm(ctx[a], `/builds/${B.slug}/edit/specs?/delete`, { blockId });
		}
	},
	{
		name: 'move spec block (edit/specs?/move)',
		allowed: OWNER_ADMIN,
		run: async (a) => postForm(ctx[a], `/builds/${B.slug}/edit/specs?/move`, { blockId: await standingSpecBlock(), direction: 'down' })
	},
	{
		name: 'parts rows without JavaScript (edit/parts?/rows)',
		allowed: OWNER_ADMIN,
		run: (a) => postForm(ctx[a], `/builds/${B.slug}/edit/parts?/rows`, { ...PART_ROW, op: 'add' })
	},
	{
		name: 'parts CSV preview (edit/parts?/preview)',
		allowed: OWNER_ADMIN,
		run: (a) => postForm(ctx[a], `/builds/${B.slug}/edit/parts?/preview`, { csvText: PARTS_CSV, mode: 'replace' })
	},
	{
		name: 'parts CSV import (edit/parts?/import)',
		allowed: OWNER_ADMIN,
		run: (a) => postForm(ctx[a], `/builds/${B.slug}/edit/parts?/import`, { csvText: PARTS_CSV, mode: 'replace' })
	},
	{
		name: 'parts CSV to the editor (edit/parts?/toEditor)',
		allowed: OWNER_ADMIN,
		run: (a) => postForm(ctx[a], `/builds/${B.slug}/edit/parts?/toEditor`, { csvText: PARTS_CSV, mode: 'append' })
	},
	{
		name: 'delete photo (DELETE /builds/[slug]/photos/[id])',
		allowed: OWNER_ADMIN,
		run: async (a) => {
			const id = OWNER_ADMIN.includes(a) ? await freshPhoto(B.slug) : await standingPhoto();
			return ctx[a].delete(`/builds/${B.slug}/photos/${id}`, { headers: jsonHeaders(), maxRedirects: 0 });
		}
	},
	{
		name: 'delete photo (POST /builds/[slug]/photos/[id]/delete)',
		allowed: OWNER_ADMIN,
		run: async (a) => {
			const id = OWNER_ADMIN.includes(a) ? await freshPhoto(B.slug) : await standingPhoto();
			return postForm(ctx[a], `/builds/${B.slug}/photos/${id}/delete`, {});
		}
	},
	{
		name: 'archive (edit?/archive)',
		allowed: OWNER_ADMIN,
		run: async (a) => {
			const slug = OWNER_ADMIN.includes(a) ? (await publishedBuild()).slug : B.slug;
			return postForm(ctx[a], `/builds/${slug}/edit?/archive`, {});
		}
	},
	{
		name: 'archive (builds/[slug]?/archive)',
		allowed: OWNER_ADMIN,
		run: async (a) => {
			const slug = OWNER_ADMIN.includes(a) ? (await publishedBuild()).slug : B.slug;
			return postForm(ctx[a], `/builds/${slug}?/archive`, {});
		}
	},
	{
		name: 'publish (builds/[slug]?/publish on a draft)',
		allowed: OWNER_ADMIN,
		run: async (a) => postForm(ctx[a], `/builds/${await draftBuild()}?/publish`, {})
	},
	{
		name: 'save to bench (POST /api/v1/bench/[slug])',
		allowed: SIGNED_IN,
		run: (a) => ctx[a].post(`/api/v1/bench/${B.slug}`, { headers: jsonHeaders() })
	},
	{
		name: 'take off bench (DELETE /api/v1/bench/[slug])',
		allowed: SIGNED_IN,
		run: (a) => ctx[a].delete(`/api/v1/bench/${B.slug}`, { headers: jsonHeaders() })
	},
	{
		name: 'restore comment (moderation?/restoreComment)',
		allowed: MODS,
		run: async (a) => postForm(ctx[a], '/moderation?/restoreComment', { commentId: await hiddenComment(), reason: `Matrix: restore by ${a}` })
	},
	{
		name: 'unlock build (moderation?/unlockBuild)',
		allowed: MODS,
		run: async (a) => {
			const { id } = await lockedBuild();
			return postForm(ctx[a], '/moderation?/unlockBuild', { buildId: id, reason: `Matrix: unlock by ${a}` });
		}
	},
	{
		name: 'unlock build (builds/[slug]?/lock, locked=false)',
		allowed: MODS,
		run: async (a) => {
			const { slug } = await lockedBuild();
			return postForm(ctx[a], `/builds/${slug}?/lock`, { locked: 'false', reason: `Matrix: unlock by ${a}` });
		}
	},
	{
		name: 'restore member (moderation?/restoreMember)',
		allowed: MODS,
		run: async (a) => {
			const res = await postForm(ctx[a], '/moderation?/restoreMember', { userId: ids.suspended.id, reason: `Matrix: restore by ${a}` });
			await resuspend();
			return res;
		}
	},
	{
		name: 'restore member (admin/members?/restore)',
		allowed: MODS,
		run: async (a) => {
			const res = await postForm(ctx[a], '/admin/members?/restore', { userId: ids.suspended.id, reason: `Matrix: restore by ${a}` });
			await resuspend();
			return res;
		}
	},
	{
		// The signed token in the mail is the only credential: whoever holds the link may turn the mail back on.
		name: 're-subscribe (unsubscribe?/resubscribe, valid token)',
		allowed: [...ACTORS],
		run: async (a) => postForm(ctx[a], '/unsubscribe?/resubscribe', { token: await unsubscribeToken() })
	},
	{
		// A token whose signature does not match is refused (400: the link is not valid) for everyone.
		name: 're-subscribe (unsubscribe?/resubscribe, forged token)',
		allowed: [],
		alsoDenied: [400],
		run: async (a) => {
			const [payload] = (await unsubscribeToken()).split('.');
			return postForm(ctx[a], '/unsubscribe?/resubscribe', { token: `${payload}.${'A'.repeat(43)}` });
		}
	}
];

// ---- fixtures for the cases above (made lazily, once or per allowed actor) ------------------------------

const PART_ROW = {
	designators: 'R1',
	quantity: '1',
	kind: 'resistor',
	value: '22k',
	tolerance: '',
	ratingV: '',
	ratingW: '',
	package: '',
	notes: '',
	designValue: '',
	reason: ''
};
const PARTS_CSV = 'designators,quantity,kind,value\r\nR1,1,resistor,22k\r\nC1,1,capacitor,100n\r\n';

/** Ids of the build's steps in page order, as its maker's editor lists them. */
async function stepIds(slug: string): Promise<string[]> {
	const html = await (await ctx.owner.get(`/builds/${slug}/edit`)).text();
	return [...new Set([...html.matchAll(/name="stepId" value="([0-9a-f-]{36})"/g)].map((m) => m[1]))];
}

/** A new last step on the build, by its maker; → its id. */
async function freshStep(slug: string): Promise<string> {
	const before = new Set(await stepIds(slug));
	const res = await postForm(ctx.owner, `/builds/${slug}/edit?/addStep`, { title: 'Matrix step to delete', bodyMd: 'Gone soon.' });
	expect(res.status()).toBe(200);
	const fresh = (await stepIds(slug)).find((i) => !before.has(i));
	if (!fresh) throw new Error('new step not found in the editor');
	return fresh;
}

/** A new supply block on the build, by its maker; → its id (from the redirect after saving). */
async function freshSpecBlock(slug: string): Promise<string> {
	const res = await postForm(ctx.owner, `/builds/${slug}/edit/specs?/save`, SUPPLY_FORM);
	expect(res.status()).toBe(303);
	const id = res.headers()['location'].match(/saved=([0-9a-f-]{36})/)?.[1];
	if (!id) throw new Error('no spec block id after saving');
	return id;
}
let standingBlock: string | undefined;
const standingSpecBlock = async () => (standingBlock ??= await freshSpecBlock(B.slug));

/** A new cover photo on the build, uploaded by its maker; → its id. */
async function freshPhoto(slug: string): Promise<string> {
	const res = await ctx.owner.post(`/builds/${slug}/photos`, {
		multipart: { purpose: 'cover', alt: 'Matrix photo to delete', file: { name: 'd.jpg', mimeType: 'image/jpeg', buffer: photo } },
		headers: jsonHeaders()
	});
	expect(res.status(), await res.text()).toBe(201);
	return (await res.json()).photo.id;
}
let standingPhotoId: string | undefined;
const standingPhoto = async () => (standingPhotoId ??= await freshPhoto(B.slug));

/** A comment by the other maker, hidden by the admin (hiding is idempotent, so it can be reused). */
let hiddenId: string | undefined;
async function hiddenComment(): Promise<string> {
	hiddenId ??= await postComment(ctx.other, B.slug, 'Matrix comment to hide and restore.');
	const res = await postForm(ctx.admin, '/moderation?/hideComment', { commentId: hiddenId, reason: 'Matrix: hide before restore' });
	expect(res.status()).toBe(200);
	return hiddenId;
}

/** A published build of the owner, locked by the admin (locking is idempotent, so it is reused). */
let lockedOne: { slug: string; id: string } | undefined;
async function lockedBuild(): Promise<{ slug: string; id: string }> {
	if (!lockedOne) {
		const { slug } = await publishedBuild();
		lockedOne = { slug, id: await idFromModeration(slug) };
	}
	const res = await postForm(ctx.admin, '/moderation?/lockBuild', { buildId: lockedOne.id, reason: 'Matrix: lock before unlock' });
	expect(res.status()).toBe(200);
	return lockedOne;
}

/** Put the throwaway member back under suspension after a restore (suspending is idempotent). */
async function resuspend() {
	const res = await postForm(ctx.admin, '/moderation?/suspendMember', { userId: ids.suspended.id, reason: 'Matrix: suspend again' });
	expect(res.status()).toBe(200);
}

/** An unsubscribe token of the other maker, from the reply notification the owner's reply to their comment sends. */
let token: string | undefined;
async function unsubscribeToken(): Promise<string> {
	if (token) return token;
	const reply = await ctx.owner.post(`/api/v1/builds/${B.slug}/comments`, {
		data: { body: 'Matrix reply to send a notification.', parentId: commentByOther },
		headers: jsonHeaders()
	});
	expect(reply.status(), await reply.text()).toBe(201);
	const mail = await waitForMail(ids.other.email, /replied to your comment/);
	const link = new URL(linkIn(mail, '/unsubscribe?token='));
	token = link.searchParams.get('token') ?? '';
	expect(token).toContain('.');
	return token;
}

/** A published build of the owner that is not locked yet, by id. */
async function lockableBuildId(): Promise<string> {
	const { slug } = await publishedBuild();
	return idFromModeration(slug);
}

for (const c of cases) {
	test(c.name, async () => {
		test.setTimeout(120_000);
		const row = {} as Record<Actor, Outcome>;
		for (const a of ACTORS) {
			const res = await c.run(a);
			row[a] = c.alsoDenied?.includes(res.status()) ? 'deny' : classify(res);
		}
		results[c.name] = row;
		const expected = Object.fromEntries(ACTORS.map((a) => [a, c.allowed.includes(a) ? 'allow' : 'deny'])) as Record<Actor, Outcome>;
		expect(row).toEqual(expected);
	});
}

test('re-subscribing from the mail link turns the mail back on, and it stays on', async () => {
	const t = await unsubscribeToken();
	const replyOn = async () => /name="notifyReply"[^>]*checked/.test(await (await ctx.other.get('/account')).text());
	// Opening the link changes nothing (mail scanners open links); the confirming POST turns replies off…
	expect((await ctx.anon.get(`/unsubscribe?token=${encodeURIComponent(t)}`)).status()).toBe(200);
	expect(await replyOn()).toBe(true);
	const off = await ctx.anon.post('/unsubscribe?/unsubscribe', { form: { token: t }, headers: formHeaders() });
	expect(off.status()).toBe(200);
	expect(await replyOn()).toBe(false);
	// …and the button turns them on again: the page it lands on must not switch them off a second time.
	const res = await ctx.anon.post('/unsubscribe?/resubscribe', { form: { token: t }, headers: formHeaders() });
	expect(res.status()).toBe(200);
	expect(await res.text()).toContain('Turned back on');
	expect(await replyOn()).toBe(true);
});

test('the matrix as a table', async () => {
	const pad = (s: string, n: number) => s.padEnd(n);
	const lines = [
		`${pad('action', 62)}${ACTORS.map((a) => pad(a, 10)).join('')}`,
		...Object.entries(results).map(([name, row]) => `${pad(name, 62)}${ACTORS.map((a) => pad(row[a], 10)).join('')}`)
	];
	console.log(lines.join('\n'));
	expect(Object.keys(results)).toHaveLength(cases.length);
});
