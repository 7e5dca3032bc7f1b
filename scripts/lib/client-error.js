// What the app's HTTP server answers when Node cannot read a request at all, before SvelteKit sees it: an address
// or headers larger than Node's header limit (`http.maxHeaderSize`, 16 KB unless `--max-http-header-size` raises
// it), a request that is not HTTP, or one that took too long to arrive. Node's own answer is a bare status line with
// an empty body; ours says what happened in a sentence (a JSON error envelope, API.md, for /api/ addresses), with
// the same status codes Node uses (431, 408, 400). Attached to adapter-node's server by server.js.
import http from 'node:http';

const REASONS = { 400: 'Bad Request', 408: 'Request Timeout', 431: 'Request Header Fields Too Large' };

/** The status and sentence for a parse error of Node's HTTP server (`err.code` from llhttp or the server). */
export function clientErrorReply(code, maxHeaderBytes = http.maxHeaderSize) {
	if (code === 'HPE_HEADER_OVERFLOW') {
		const kb = Math.round(maxHeaderBytes / 1024);
		return {
			status: 431,
			message: `This request's address or headers are too long: the server reads at most ${kb} KB of them. Shorten the search or the link (or the query string) and try again.`
		};
	}
	if (code === 'ERR_HTTP_REQUEST_TIMEOUT') return { status: 408, message: 'The request took too long to arrive. Try again.' };
	return { status: 400, message: 'The server could not read this request: it is not well-formed HTTP.' };
}

/** The envelope code for a status this listener answers with: the same as `codeForStatus` in src/lib/server/http/envelope.ts. */
export function apiCodeFor(status) {
	return status === 431 ? 'too_large' : 'invalid';
}

/** True when the raw bytes received so far start a request for an /api/ address (it then gets the JSON envelope). */
function isApiRequest(raw) {
	if (!raw || !raw.length) return false;
	const line = Buffer.from(raw.subarray(0, 64)).toString('latin1');
	return /^[A-Z]{3,7} \/api\//.test(line);
}

/** The whole HTTP/1.1 response for a client error: status line, plain headers, the sentence; the connection closes. */
export function clientErrorResponse(err) {
	const { status, message } = clientErrorReply(err?.code);
	const api = isApiRequest(err?.rawPacket);
	// The API's error envelope, with the code http/envelope.ts's status table gives (431 → too_large, else invalid).
	const body = api ? JSON.stringify({ error: { code: apiCodeFor(status), message, issues: [] } }) : `${message}\n`;
	const type = api ? 'application/json' : 'text/plain; charset=utf-8';
	return (
		`HTTP/1.1 ${status} ${REASONS[status]}\r\n` +
		`Content-Type: ${type}\r\n` +
		`Content-Length: ${Buffer.byteLength(body)}\r\n` +
		'Cache-Control: no-store\r\n' +
		'X-Content-Type-Options: nosniff\r\n' +
		'Connection: close\r\n\r\n' +
		body
	);
}

/** Sockets already answered: Node calls the listener again for every later chunk of a request its parser refused. */
const answered = new WeakSet();

/**
 * The `clientError` listener (Node's HTTP server docs): answer with a sentence (Node's default answers with an empty
 * body), then close the connection; a reset connection is just closed.
 * The close lingers: the rest of what the client is still sending (a long request arrives in chunks, and Node calls
 * this listener again for each) is read and dropped until the client closes or 5 s pass, because closing a socket with
 * unread data makes the kernel reset the connection, and the client would lose the answer ("socket hang up").
 */
export function onClientError(err, socket) {
	if (answered.has(socket)) return;
	// As Node's default: answer unless an answer to an earlier request on this (kept-alive) connection is under way
	// (`socket._httpMessage`, the response the server is writing; earlier, finished answers do not count).
	const inFlight = socket._httpMessage;
	if (err?.code === 'ECONNRESET' || !socket.writable || (inFlight && inFlight.headersSent)) {
		socket.destroy();
		return;
	}
	answered.add(socket);
	socket.end(clientErrorResponse(err));
	socket.once('end', () => socket.destroy());
	socket.once('error', () => socket.destroy());
	setTimeout(() => socket.destroy(), 5000).unref();
}
