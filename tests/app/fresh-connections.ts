/**
 * Vitest setup file of the app projects: every fetch of a test opens its own connection
 * (`Connection: close`). A test that blocks in a synchronous admin-CLI call (createAccount) for
 * longer than the server's 5-second keep-alive would otherwise send its next request on a pooled
 * socket the server is closing, and get "other side closed" instead of a response.
 */
const pooledFetch = globalThis.fetch;

globalThis.fetch = (input: string | URL | Request, init?: RequestInit) => {
  const headers = new Headers(init?.headers ?? (input instanceof Request ? input.headers : undefined));
  headers.set("connection", "close");
  return pooledFetch(input, { ...init, headers });
};
