// Starground's server entry: adapter-node's own server from the build (`build/index.js`, with everything its
// environment variables set: PORT, HOST, ORIGIN, BODY_SIZE_LIMIT, ADDRESS_HEADER, graceful shutdown) plus one
// listener on its HTTP server — a request Node cannot read (an address or headers over Node's header limit, a request
// that is not HTTP) is answered with a sentence instead of Node's empty body (scripts/lib/client-error.js).
// `npm start` and `npm test` run it; by hand: `node --env-file=.env server.js` after `npm run build`.
import { server } from './build/index.js';
import { onClientError } from './scripts/lib/client-error.js';

server.server.on('clientError', onClientError);
