/**
 * Reading a refused request body to its end, throwing every chunk away as it arrives (memory stays at one
 * chunk). A server that answers and closes the connection while request bytes are still unread makes the
 * kernel reset it, and a client still sending sees EPIPE / "socket hang up" instead of the answer; Node's
 * own HTTP server likewise reads and drops an unconsumed body (`req._dump()`) before it reuses a connection.
 */

/** Read and discard the rest of a body; false when it runs past `limit` bytes or breaks off (then close the connection). */
export async function discardBody(reader: ReadableStreamDefaultReader<Uint8Array> | undefined, limit: number): Promise<boolean> {
	if (!reader) return true;
	let total = 0;
	try {
		for (;;) {
			const { done, value } = await reader.read();
			if (done) return true;
			total += value.byteLength;
			// Stop reading, but do not cancel: adapter-node answers a cancel by destroying the socket at once,
			// before our answer is written. With `connection: close` Node sends the answer, then closes.
			if (total > limit) {
				reader.releaseLock();
				return false;
			}
		}
	} catch {
		return false;
	}
}
