/**
 * Gives the event loop a turn: resolves after the I/O waiting now (new requests, finished
 * reads) has been handled (`setImmediate` runs after the poll phase; Node.js docs, "The Node.js
 * Event Loop"). A long computation on the request thread that awaits this between its steps
 * lets a panelist's answer through between them instead of after the whole computation
 * (issue 13). Promises that resolve at once (the SQLite driver answers synchronously) never do this.
 */
export function nextTurn(): Promise<void> {
  return new Promise((resolve) => setImmediate(resolve));
}
