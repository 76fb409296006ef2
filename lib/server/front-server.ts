/**
 * The production server's front door (`npm start`). It listens on the public
 * port and passes every request on to Next.js, which listens on a loopback
 * port behind it, except a few hot, read-only API routes it answers itself
 * by calling the same route handler Next would call.
 *
 * Why: the Archive table pages through /api/v1/series/… as people sort,
 * filter and scroll, many requests a second per reader. The handler needs
 * about 0.4 ms of the server's thread per page; Next's own routing, request
 * objects and response streaming add about 1 ms more to every request, so
 * under load the queue, not the work, set the latency (measured in
 * tests/bench/series.bench.ts). Everything else (pages, server actions,
 * uploads, auth) goes to Next untouched, so the front only ever adds one
 * loopback hop to it.
 *
 * The front and Next run the same handler code against the same database;
 * the handler checks the caller's role and validates its query itself, so
 * answering here skips no check.
 */
import {
  Agent,
  createServer,
  request as forward,
  type IncomingMessage,
  type ServerResponse,
} from "node:http";
import type { AddressInfo } from "node:net";

type RouteHandler = (
  request: Request,
  context: { params: Promise<Record<string, string>> },
) => Promise<Response>;

export type FastRoute = {
  /** Matches a request path; named groups become the handler's params. */
  pattern: RegExp;
  /** The route's GET handler (HEAD is answered by it too, without the body). */
  handler: RouteHandler;
};

/** Headers that belong to one connection, never passed on. */
const HOP_BY_HOP = new Set([
  "connection",
  "keep-alive",
  "proxy-connection",
  "transfer-encoding",
  "upgrade",
  "te",
  "trailer",
]);

export type FrontServer = { port: number; close: () => Promise<void> };

export async function startFrontServer({
  port,
  host,
  upstream,
  fastRoutes,
  log = () => undefined,
}: {
  /** 0 picks a free port (tests). */
  port: number;
  /** Undefined listens on every interface, as `next start` does. */
  host?: string;
  upstream: { host: string; port: number };
  fastRoutes: readonly FastRoute[];
  log?: (message: string) => void;
}): Promise<FrontServer> {
  const agent = new Agent({ keepAlive: true, maxSockets: 256 });

  const server = createServer((req, res) => {
    const fast = matchFastRoute({ req, fastRoutes });
    if (fast) {
      answer({ req, res, ...fast }).catch((error: unknown) => {
        log(`Front: ${req.method} ${req.url} failed: ${(error as Error).message}`);
        if (!res.headersSent) res.writeHead(500, { "content-type": "text/plain" });
        res.end();
      });
      return;
    }
    passOn({ req, res, upstream, agent });
  });
  // Longer than a browser's idle keep-alive, so the front never closes first.
  server.keepAliveTimeout = 65_000;
  // Next serves no WebSocket in production; refuse upgrades plainly.
  server.on("upgrade", (_req, socket) => socket.destroy());

  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => resolve());
  });
  return {
    port: (server.address() as AddressInfo).port,
    close: () =>
      new Promise<void>((resolve) => {
        agent.destroy();
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}

function matchFastRoute({
  req,
  fastRoutes,
}: {
  req: IncomingMessage;
  fastRoutes: readonly FastRoute[];
}): { handler: RouteHandler; params: Record<string, string> } | null {
  if (req.method !== "GET" && req.method !== "HEAD") return null;
  const url = req.url ?? "/";
  const query = url.indexOf("?");
  const pathname = query === -1 ? url : url.slice(0, query);
  for (const route of fastRoutes) {
    const match = route.pattern.exec(pathname);
    if (!match) continue;
    const params: Record<string, string> = {};
    for (const [name, value] of Object.entries(match.groups ?? {})) {
      try {
        params[name] = decodeURIComponent(value);
      } catch {
        return null; // Malformed escapes: let Next answer as it would.
      }
    }
    return { handler: route.handler, params };
  }
  return null;
}

/** Calls the route handler with a web Request built from the node request, and writes its Response. */
async function answer({
  req,
  res,
  handler,
  params,
}: {
  req: IncomingMessage;
  res: ServerResponse;
  handler: RouteHandler;
  params: Record<string, string>;
}): Promise<void> {
  const headers = new Headers();
  const raw = req.rawHeaders;
  for (let i = 0; i + 1 < raw.length; i += 2) {
    const name = raw[i]!;
    if (!HOP_BY_HOP.has(name.toLowerCase())) headers.append(name, raw[i + 1]!);
  }
  const url = new URL(req.url ?? "/", `http://${req.headers.host ?? "localhost"}`);
  const response = await handler(new Request(url, { method: "GET", headers }), {
    params: Promise.resolve(params),
  });
  const body = req.method === "HEAD" ? null : Buffer.from(await response.arrayBuffer());
  const out: Record<string, string | string[]> = {};
  response.headers.forEach((value, name) => {
    if (name !== "set-cookie" && !HOP_BY_HOP.has(name)) out[name] = value;
  });
  const cookies = response.headers.getSetCookie();
  if (cookies.length > 0) out["set-cookie"] = cookies;
  if (body) out["content-length"] = String(body.length);
  res.writeHead(response.status, out);
  res.end(body ?? undefined);
}

/** Streams the request to Next and Next's answer back, both ways unbuffered. */
function passOn({
  req,
  res,
  upstream,
  agent,
}: {
  req: IncomingMessage;
  res: ServerResponse;
  upstream: { host: string; port: number };
  agent: Agent;
}): void {
  const headers: Record<string, string | string[]> = {};
  for (const [name, value] of Object.entries(req.headers)) {
    if (value !== undefined && !HOP_BY_HOP.has(name)) headers[name] = value;
  }
  const client = req.socket.remoteAddress ?? "";
  const forwardedFor = req.headers["x-forwarded-for"];
  headers["x-forwarded-for"] = forwardedFor ? `${String(forwardedFor)}, ${client}` : client;
  headers["x-forwarded-proto"] ??= "http";
  if (req.headers.host) headers["x-forwarded-host"] ??= req.headers.host;

  const outgoing = forward(
    { host: upstream.host, port: upstream.port, method: req.method, path: req.url, headers, agent },
    (incoming) => {
      const back: Record<string, string | string[]> = {};
      for (const [name, value] of Object.entries(incoming.headers)) {
        if (value !== undefined && !HOP_BY_HOP.has(name)) back[name] = value;
      }
      res.writeHead(incoming.statusCode ?? 502, incoming.statusMessage, back);
      incoming.pipe(res);
      incoming.on("error", () => res.destroy());
    },
  );
  // Small writes go out at once (no Nagle delay) on the hop to Next too.
  outgoing.on("socket", (socket) => socket.setNoDelay(true));
  outgoing.on("error", () => {
    if (res.headersSent) {
      res.destroy();
      return;
    }
    res.writeHead(502, { "content-type": "text/plain; charset=utf-8", "retry-after": "2" });
    res.end("Heliotally is starting or restarting; try again in a moment.\n");
  });
  // A client that goes away stops the work behind it.
  res.on("close", () => {
    if (!res.writableFinished) outgoing.destroy();
  });
  req.pipe(outgoing);
}
