/**
 * The bench tools' one script (`/tools/live.js`): morphdom's published build followed by
 * `$lib/components/tools/live.js`, both taken as text at build time. Its address carries a hash of the
 * text, so browsers may keep it for a year and a new version is a new address.
 */
import { createHash } from 'node:crypto';
import morphdom from 'morphdom/dist/morphdom-umd.min.js?raw';
import live from '$lib/components/tools/live.js?raw';

const MORPHDOM_NOTICE = '/*! morphdom 2.7.8 | MIT licence | https://github.com/patrick-steele-idem/morphdom */';

/** The script's text: morphdom (sets `window.morphdom`), then the tools' live update. */
export const LIVE_SCRIPT_BODY = `${MORPHDOM_NOTICE}\n${morphdom.trim()}\n${live}`;

/** First 16 hex digits of the text's SHA-256: the script's version. */
export const LIVE_SCRIPT_VERSION = createHash('sha256').update(LIVE_SCRIPT_BODY).digest('hex').slice(0, 16);

/** The address pages load it from. */
export const LIVE_SCRIPT_PATH = `/tools/live.js?v=${LIVE_SCRIPT_VERSION}`;
