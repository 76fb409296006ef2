/**
 * The route handlers under app/api/v1 as the file system has them: each
 * route.ts, its URL pattern and the HTTP methods it exports. The OpenAPI
 * tests compare this with the document, so a new handler cannot stay
 * undocumented.
 */
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";

export const HTTP_METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;
export type HttpMethod = (typeof HTTP_METHODS)[number];

export type ApiRouteFile = {
  /** Path of the route.ts from the project root. */
  file: string;
  /** URL segments after the origin; "[id]" marks a dynamic one. */
  segments: string[];
  methods: HttpMethod[];
};

const API_ROOT = path.join("app", "api", "v1");

function findRouteFiles(folder: string): string[] {
  return readdirSync(path.join(process.cwd(), folder), { withFileTypes: true }).flatMap((entry) => {
    const child = path.join(folder, entry.name);
    if (entry.isDirectory()) return findRouteFiles(child);
    return entry.name === "route.ts" ? [child] : [];
  });
}

/** Methods a route module exports, read from its source (`export const GET`, `export async function POST`, `export { PUT }`). */
export function readExportedMethods(source: string): HttpMethod[] {
  const names = new Set<string>();
  for (const m of source.matchAll(/export\s+(?:const|let|(?:async\s+)?function)\s+([A-Z]+)\b/g))
    names.add(m[1]!);
  for (const m of source.matchAll(/export\s*\{([^}]*)\}/g))
    for (const part of m[1]!.split(","))
      names.add(
        part
          .trim()
          .split(/\s+as\s+/)
          .pop()!
          .trim(),
      );
  return HTTP_METHODS.filter((method) => names.has(method));
}

export function listApiRouteFiles(): ApiRouteFile[] {
  return findRouteFiles(API_ROOT)
    .sort()
    .map((file) => ({
      file,
      segments: ["api", "v1", ...path.relative(API_ROOT, path.dirname(file)).split(path.sep)].filter(Boolean),
      methods: readExportedMethods(readFileSync(path.join(process.cwd(), file), "utf8")),
    }));
}

/** "/api/v1/instruments/[id]" in the document's spelling: "/api/v1/instruments/{id}". */
export const toOpenApiPath = (segments: string[]) =>
  `/${segments.map((s) => s.replace(/^\[(\w+)\]$/, "{$1}")).join("/")}`;

/**
 * Whether a documented path is served by this file: static segments match
 * exactly, a dynamic one matches the same {name} or any concrete value (the
 * document lists /api/v1/series/daily, served by series/[kind]).
 */
export function servesPath(route: ApiRouteFile, documentedPath: string): boolean {
  const parts = documentedPath.split("/").filter(Boolean);
  return (
    parts.length === route.segments.length &&
    route.segments.every((segment, i) => {
      const dynamic = /^\[(\w+)\]$/.exec(segment);
      return dynamic ? parts[i] === `{${dynamic[1]}}` || !/^\{.*\}$/.test(parts[i]!) : parts[i] === segment;
    })
  );
}

/**
 * The file serving a concrete URL path and its dynamic params. A static
 * segment wins over a dynamic one at the same place, as in Next's router.
 */
export function resolveRouteFile(
  files: ApiRouteFile[],
  urlPath: string,
): { route: ApiRouteFile; params: Record<string, string> } | null {
  const parts = urlPath.split("/").filter(Boolean);
  const candidates = files
    .filter((f) => f.segments.length === parts.length)
    .map((route) => {
      const params: Record<string, string> = {};
      let dynamicCount = 0;
      for (const [i, segment] of route.segments.entries()) {
        const dynamic = /^\[(\w+)\]$/.exec(segment);
        if (dynamic) {
          params[dynamic[1]!] = decodeURIComponent(parts[i]!);
          dynamicCount += 1;
        } else if (segment !== parts[i]) return null;
      }
      return { route, params, dynamicCount };
    })
    .filter((c) => c !== null)
    .sort((a, b) => a.dynamicCount - b.dynamicCount);
  return candidates[0] ?? null;
}
