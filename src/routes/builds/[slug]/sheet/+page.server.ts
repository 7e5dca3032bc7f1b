import { actorOf } from '$lib/server/actor';
import { loadBenchSheet } from '$lib/server/bench-sheet';
import type { PageServerLoad } from './$types';

/** The printable bench sheet: the same content as the PDF, laid out for a print stylesheet. */
export const load: PageServerLoad = async ({ params, locals, url }) => ({ sheet: await loadBenchSheet(params.slug, actorOf(locals.user), url.origin) });
