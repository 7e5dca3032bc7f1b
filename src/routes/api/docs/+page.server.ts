import { openApiDocument } from '$lib/server/openapi';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = ({ url }) => ({ doc: openApiDocument(url.origin) });
