// The hot pages' server code, bundled by scripts/explain.js (through scripts/lib/app-module.js): the
// real load functions and request handlers, called with a bare event, so the queries EXPLAINed are the
// ones the app sends.
export { client } from '$lib/server/db';
export { load as homeLoad } from '../../src/routes/+page.server';
export { load as browseLoad } from '../../src/routes/builds/+page.server';
export { load as buildLoad } from '../../src/routes/builds/[slug]/+page.server';
export { load as searchLoad } from '../../src/routes/search/+page.server';
export { GET as apiListGet } from '../../src/routes/api/v1/builds/+server';
export { clearReaderCache } from '$lib/server/builds/reader-cache';
export { homeLists } from '$lib/server/discover';
export { getBuildHead } from '$lib/server/builds/queries';
export { currentReaderVersion } from '$lib/server/builds/reader-version';
export { listPublishedBuilds } from '$lib/server/builds/list';
