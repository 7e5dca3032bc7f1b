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
import { origin, uniqueTitle, SUPPLY_FORM, PART_ROW } from './helpers/builds';

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
		run: (a) => postForm(ctx[a], `/builds/${B.slug}/edit/parts?/save`, PART_ROW)
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
		// The maker gets mail about their own build already: 409 with a sentence, counted as a refusal.
		name: 'watch build (builds/[slug]/watch?/watch)',
		allowed: ['other', 'reviewer', 'moderator', 'admin'],
		alsoDenied: [409],
		run: (a) => postForm(ctx[a], `/builds/${B.slug}/watch?/watch`, {})
	},
	{
		name: 'record "I built this too" (POST /api/v1/builds/[slug]/built-it)',
		allowed: ['other', 'reviewer', 'moderator', 'admin'],
		alsoDenied: [409],
		run: (a) => ctx[a].post(`/api/v1/builds/${B.slug}/built-it`, { data: { dcOffsetMv: [3, -2] }, headers: jsonHeaders() })
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

// ---- reads: who sees what, on builds in every state ------------------------------------------------------
//
// Builds have three states (draft, published, archived); a moderator can also lock one (there is no
// hidden state for builds: moderators hide comments, and lock builds). Each fixture is started from one
// published "Crossover" build of the owner (so the compare page applies), has a cover photo and a parts
// list, and — unless a draft — two revisions. Expected, from the rules in builds/access.ts: a build and
// everything read from it (page, API, revisions, diff, compare, parts CSV, photos) is seen by everyone
// unless it is a draft, which only its maker and admins see; lists and feeds carry published builds only
// (locked ones included), for everyone; "My builds" lists a maker's own builds in every state.

const STATES = ['draft', 'published', 'locked', 'archived'] as const;
type State = (typeof STATES)[number];
const readFixtures = {} as Record<State, { slug: string; photoId: string }>;
let readBase = '';

async function readFixture(state: State): Promise<{ slug: string; photoId: string }> {
	if (!readBase) {
		// Category "crossover" keeps the fixtures near the top of their category's feed while other tests publish.
		const res = await postForm(ctx.owner, '/builds/new', {
			title: uniqueTitle('Matrix read base'),
			summary: 'Authorization matrix fixture.',
			category: 'crossover',
			topology: 'passive',
			licence: 'CC-BY-SA-4.0'
		});
		expect(res.status()).toBe(303);
		readBase = res.headers()['location'].split('/')[2];
		expect((await postForm(ctx.owner, `/builds/${readBase}/edit?/addStep`, { title: 'Crossover board', bodyMd: 'Passive parts only.' })).status()).toBe(200);
		expect([200, 303]).toContain((await postForm(ctx.owner, `/builds/${readBase}/edit?/publish`, {})).status());
	}
	const d = await postForm(ctx.owner, `/builds/${readBase}?/derive`, {});
	expect(d.status(), 'derive').toBe(303);
	const slug = new URL(d.headers()['location'], origin()).pathname.split('/')[2];
	expect((await postForm(ctx.owner, `/builds/${slug}/edit?/addStep`, { title: 'First revision', bodyMd: 'Rev A.' })).status()).toBe(200);
	const photoId = await freshPhoto(slug);
	const parts = await postForm(ctx.owner, `/builds/${slug}/edit/parts?/save`, PART_ROW);
	expect(parts.status(), 'parts list').toBe(200);
	if (state !== 'draft') {
		expect([200, 303]).toContain((await postForm(ctx.owner, `/builds/${slug}/edit?/publish`, {})).status());
		expect((await postForm(ctx.owner, `/builds/${slug}/edit?/addStep`, { title: 'Second revision', bodyMd: 'Changed after Rev A.' })).status()).toBe(200);
		const rev = await postForm(ctx.owner, `/builds/${slug}/edit?/publishChanges`, { note: 'Added the second step.' });
		expect(rev.status(), 'publish Rev B').toBe(200);
	}
	if (state === 'locked') expect((await postForm(ctx.admin, `/builds/${slug}?/lock`, { locked: 'true', reason: 'Matrix: locked fixture' })).status()).toBe(200);
	if (state === 'archived') expect([200, 303]).toContain((await postForm(ctx.owner, `/builds/${slug}/edit?/archive`, {})).status());
	return { slug, photoId };
}

interface Read {
	name: string;
	/** 'item': the answer is the build (allow = 2xx, deny = 401/403/404); 'list': whether the build is listed. */
	kind: 'item' | 'list';
	/** Not meaningful for this state (no revisions on a draft). */
	skip?: State[];
	url: (f: { slug: string; photoId: string }) => string;
}

const READS: Read[] = [
	{ name: 'build page', kind: 'item', url: (f) => `/builds/${f.slug}` },
	{ name: 'API build detail', kind: 'item', url: (f) => `/api/v1/builds/${f.slug}` },
	{ name: 'API comments', kind: 'item', url: (f) => `/api/v1/builds/${f.slug}/comments` },
	{ name: 'revisions', kind: 'item', skip: ['draft'], url: (f) => `/builds/${f.slug}/revisions` },
	{ name: 'revision 1', kind: 'item', skip: ['draft'], url: (f) => `/builds/${f.slug}/revisions/1` },
	{ name: 'diff Rev A → Rev B', kind: 'item', skip: ['draft'], url: (f) => `/builds/${f.slug}/revisions/diff?from=1&to=2` },
	{ name: 'compare with its origin', kind: 'item', url: (f) => `/builds/${f.slug}/compare` },
	{ name: 'parts CSV', kind: 'item', url: (f) => `/api/v1/builds/${f.slug}/parts.csv` },
	{ name: 'cover photo (/media)', kind: 'item', url: (f) => `/media/photos/${f.photoId}/320.webp` },
	{ name: 'API list', kind: 'list', url: () => `/api/v1/builds?category=crossover&sort=recent&limit=50` },
	{ name: 'site feed', kind: 'list', url: () => `/feed.xml` },
	{ name: 'category feed', kind: 'list', url: () => `/categories/crossover/feed.xml` },
	{ name: 'My builds', kind: 'list', url: () => `/my-builds` }
];

function expectedRead(r: Read, state: State, a: Actor): Outcome {
	if (r.name === 'My builds') return a === 'owner' ? 'allow' : 'deny';
	if (r.kind === 'list') return state === 'published' || state === 'locked' ? 'allow' : 'deny';
	return state !== 'draft' || a === 'owner' || a === 'admin' ? 'allow' : 'deny';
}

test('reads: build page, API, revisions, diff, compare, CSV, photos, lists, feeds and My builds × actors × build states', async () => {
	test.setTimeout(300_000);
	for (const s of STATES) readFixtures[s] = await readFixture(s);
	const got: string[] = [];
	const want: string[] = [];
	const lines: string[] = [];
	for (const s of STATES) {
		const f = readFixtures[s];
		for (const r of READS) {
			if (r.skip?.includes(s)) continue;
			const row: string[] = [];
			for (const a of ACTORS) {
				const res = await ctx[a].get(r.url(f), { headers: { accept: r.url(f).startsWith('/api/') ? 'application/json' : 'text/html' }, maxRedirects: 0 });
				let outcome: Outcome;
				if (r.kind === 'list') {
					const st = res.status();
					// The exact slug (derived builds' slugs start with their origin's).
					const listed = st === 200 && new RegExp(`/builds/${f.slug}(?![\\w-])`).test(await res.text());
					outcome = st >= 500 ? `other ${st}` : listed ? 'allow' : 'deny';
				} else outcome = classify(res);
				const exp = expectedRead(r, s, a);
				got.push(`${s} · ${r.name} · ${a}: ${outcome}`);
				want.push(`${s} · ${r.name} · ${a}: ${exp}`);
				row.push(outcome.padEnd(10));
			}
			lines.push(`${`${s} · ${r.name}`.padEnd(40)}${row.join('')}`);
		}
	}
	console.log([`${'read'.padEnd(40)}${ACTORS.map((a) => a.padEnd(10)).join('')}`, ...lines].join('\n'));
	expect(got).toEqual(want);
});

test('reads: a hidden comment is gone for readers, its author and the maker; moderators and admins still see it', async () => {
	const slug = readFixtures.published?.slug ?? (await readFixture('published')).slug;
	const id = await postComment(ctx.other, slug, `Matrix comment to hide for reads ${Date.now()}`);
	expect((await postForm(ctx.admin, '/moderation?/hideComment', { commentId: id, reason: 'Matrix: hidden for the read matrix' })).status()).toBe(200);
	const seen = {} as Record<Actor, boolean>;
	for (const a of ACTORS) {
		const res = await ctx[a].get(`/api/v1/builds/${slug}/comments`, { headers: { accept: 'application/json' } });
		seen[a] = res.status() === 200 && (await res.text()).includes(id);
	}
	expect(seen).toEqual({ anon: false, owner: false, other: false, reviewer: false, moderator: true, admin: true, suspended: false });
});

// ---- role escalation ------------------------------------------------------------------------------------

test('role escalation: a moderator cannot appoint moderators or admins or change their own role; members cannot change roles at all', async () => {
	const sql = (await import('postgres')).default(process.env.DATABASE_URL!, { max: 1 });
	try {
		const roleOf = async (id: string) => (await sql<{ role: string }[]>`select role from "user" where id = ${id}`)[0].role;
		const moderatorId = (await sql<{ id: string }[]>`select id from "user" where email = 'tomas@starground.test'`)[0].id;
		const otherId = ids.other.id;
		const attempts: [Actor, string, Record<string, string>][] = [
			['moderator', '/admin/members?/setRole', { userId: otherId, role: 'moderator', reason: 'Matrix: escalate' }],
			['moderator', '/admin/members?/setRole', { userId: otherId, role: 'admin', reason: 'Matrix: escalate' }],
			['moderator', '/admin/members?/setRole', { userId: moderatorId, role: 'admin', reason: 'Matrix: escalate myself' }],
			['moderator', '/admin/members?/setRole', { userId: moderatorId, role: 'maker', reason: 'Matrix: change myself' }],
			['moderator', '/moderation?/setReviewer', { userId: otherId, role: 'moderator', reason: 'Matrix: escalate' }],
			['moderator', '/moderation?/setReviewer', { userId: otherId, role: 'admin', reason: 'Matrix: escalate' }],
			['moderator', '/moderation?/setReviewer', { userId: moderatorId, role: 'admin', reason: 'Matrix: escalate myself' }],
			['other', '/admin/members?/setRole', { userId: otherId, role: 'admin', reason: 'Matrix: escalate myself' }],
			['other', '/admin/members?/setRole', { userId: otherId, role: 'reviewer', reason: 'Matrix: escalate myself' }],
			['other', '/moderation?/setReviewer', { userId: otherId, role: 'reviewer', reason: 'Matrix: escalate myself' }],
			['reviewer', '/admin/members?/setRole', { userId: otherId, role: 'moderator', reason: 'Matrix: escalate' }],
			['other', '/account', { name: 'Matrix escalation', role: 'admin' }]
		];
		for (const [a, path, form] of attempts) {
			const res = await postForm(ctx[a], path, form);
			const label = `${a} ${path} ${form.role} for ${form.userId === moderatorId ? 'themself (moderator)' : 'the other maker'}`;
			expect(res.status(), label).toBeLessThan(500);
			// Refused: a denial, or a 4xx for a role that form does not offer at all.
			if (path !== '/account') expect(classify(res) === 'deny' || res.status() >= 400, `${label}: ${res.status()}`).toBe(true);
		}
		// The auth library's own endpoints for roles and profiles do not take a role either.
		for (const [path, data] of [
			['/api/auth/admin/set-role', { userId: otherId, role: 'admin' }],
			['/api/auth/update-user', { role: 'admin' }],
			['/api/auth/admin/update-user', { userId: otherId, data: { role: 'admin' } }]
		] as const) {
			const res = await ctx.other.post(path, { data, headers: { origin: origin(), 'content-type': 'application/json' } });
			expect(res.status(), path).toBeGreaterThanOrEqual(400);
			expect(res.status(), path).toBeLessThan(500);
		}
		expect(await roleOf(otherId)).toBe('maker');
		expect(await roleOf(moderatorId)).toBe('moderator');
		// The rule is not "nobody may": an admin may appoint a moderator (and undo it).
		expect((await postForm(ctx.admin, '/admin/members?/setRole', { userId: otherId, role: 'moderator', reason: 'Matrix: admin appoints' })).status()).toBe(200);
		expect(await roleOf(otherId)).toBe('moderator');
		expect((await postForm(ctx.admin, '/admin/members?/setRole', { userId: otherId, role: 'maker', reason: 'Matrix: admin undoes' })).status()).toBe(200);
		expect(await roleOf(otherId)).toBe('maker');
	} finally {
		await sql.end();
	}
});
