/**
 * Builds the OpenAPI 3.1 document from lib/api/routes.ts. Request schemas are
 * converted as their input side (what a client sends: text is fine where the
 * route coerces), response schemas as their output side. OpenAPI 3.1 uses
 * JSON Schema 2020-12, which is what zod's toJSONSchema writes.
 */
import { z } from "zod";

import { getEnv } from "@/lib/env";

import { API_ROUTES, API_TAG_ORDER, FIELD_NOTES, type ApiRoute } from "./routes";
import { NAMED_RESPONSE_SCHEMAS } from "./schemas";

type JsonSchema = Record<string, unknown>;

export type OpenApiParameter = {
  name: string;
  in: "query" | "path" | "header";
  required: boolean;
  description?: string;
  schema: JsonSchema;
};

const COMPONENT_REF = (id: string) => `#/components/schemas/${id}`;
const SAFE_INTEGER = Number.MAX_SAFE_INTEGER;

/** Drops what only clutters a document: per-schema $schema/$id and ±2^53 integer bounds. */
function tidy(schema: unknown): unknown {
  if (Array.isArray(schema)) return schema.map(tidy);
  if (schema === null || typeof schema !== "object") return schema;
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(schema)) {
    if (key === "$schema" || key === "$id") continue;
    if (key === "minimum" && value === -SAFE_INTEGER) continue;
    if (key === "maximum" && value === SAFE_INTEGER) continue;
    out[key] = tidy(value);
  }
  return out;
}

function convert(schema: z.ZodType, io: "input" | "output"): JsonSchema {
  return tidy(
    z.toJSONSchema(schema, {
      io,
      unrepresentable: "any",
      reused: "inline",
      override: describeCheckedUnknown,
    }),
  ) as JsonSchema;
}

/**
 * Form fields that must tell "missing" from "not a number" take anything
 * (z.unknown) and pipe it into a number; their input side alone would read
 * as "any value". What they accept is what the pipe's far end accepts.
 */
function describeCheckedUnknown({ zodSchema, jsonSchema }: { zodSchema: unknown; jsonSchema: JsonSchema }) {
  const def = (zodSchema as z.ZodType)._zod.def as { type: string; in?: z.ZodType; out?: z.ZodType };
  if (def.type !== "pipe" || !def.in || !def.out || Object.keys(jsonSchema).length > 0) return;
  const inner = (def.in._zod.def as { type: string }).type;
  if (inner === "unknown" || inner === "any") Object.assign(jsonSchema, convert(def.out, "input"));
}

/** Response schemas named in components, so each is written once and referenced. */
function collectResponseSchemas() {
  const registry = z.registry<{ id: string }>();
  const ids = new Map<z.ZodType, string>();
  for (const [id, schema] of NAMED_RESPONSE_SCHEMAS) {
    ids.set(schema, id);
    registry.add(schema, { id });
  }
  const generated = z.toJSONSchema(registry, {
    io: "output",
    unrepresentable: "any",
    uri: COMPONENT_REF,
  }) as {
    schemas: Record<string, JsonSchema>;
  };
  const schemas = tidy(generated.schemas) as Record<string, JsonSchema>;
  return { schemas, refFor: (schema: z.ZodType) => ids.get(schema) };
}

/** Query or path parameters from an object schema's properties. */
export function describeParameters(
  schema: z.ZodType,
  where: "query" | "path",
  notes: Record<string, string> = {},
  alsoRequired: string[] = [],
  alsoOptional: string[] = [],
): OpenApiParameter[] {
  const json = convert(schema, "input") as { properties?: Record<string, JsonSchema>; required?: string[] };
  const required = new Set([...(json.required ?? []), ...alsoRequired]);
  for (const name of alsoOptional) required.delete(name);
  return Object.entries(json.properties ?? {}).map(([name, property]) => {
    const { description: own, ...rest } = property as { description?: string };
    const description = notes[name] ?? own ?? FIELD_NOTES[name];
    return {
      name,
      in: where,
      required: where === "path" || (required.has(name) && !("default" in rest)),
      ...(description ? { description } : {}),
      schema: rest,
    };
  });
}

/** A JSON body's schema with each field's meaning (and ISO instants marked as such). */
export function describeBody(schema: z.ZodType, notes: Record<string, string> = {}): JsonSchema {
  const json = convert(schema, "input") as JsonSchema & { properties?: Record<string, JsonSchema> };
  for (const [name, property] of Object.entries(json.properties ?? {})) {
    const description = notes[name] ?? FIELD_NOTES[name];
    if (description && !property.description) property.description = description;
    if (name === "observedAt" && property.type === "string") property.format = "date-time";
  }
  return json;
}

const COMMON_ERRORS: Record<number, string> = {
  400: "The input needs attention: see error.issues.",
  401: "Not signed in, or the API token is unknown or revoked.",
  403: "The role or the token's scope does not allow this.",
  404: "No such thing that you may see.",
  429: "Too many requests with this API token; wait for Retry-After seconds.",
};

function buildOperation(
  route: ApiRoute,
  refFor: (schema: z.ZodType) => string | undefined,
  rateLimit: number,
) {
  const parameters: OpenApiParameter[] = [
    ...(route.pathParams ? describeParameters(route.pathParams, "path", route.notes) : []),
    ...(route.query
      ? describeParameters(route.query, "query", route.notes, route.alsoRequired, route.alsoOptional)
      : []),
  ];
  if (route.idempotent) {
    parameters.push({
      name: "Idempotency-Key",
      in: "header",
      required: false,
      description:
        "8–128 letters, digits, '-', '_', ':' or '.'. A retry with the same key and body gets the first answer again.",
      schema: { type: "string", pattern: "^[A-Za-z0-9_\\-:.]{8,128}$" },
    });
  }
  const errorContent = { "application/json": { schema: { $ref: COMPONENT_REF("Error") } } };
  const responses: Record<string, unknown> = {};
  for (const [status, response] of Object.entries(route.responses)) {
    const content: Record<string, unknown> = {};
    if (response.schema) {
      const id = refFor(response.schema);
      content["application/json"] = {
        schema: id ? { $ref: COMPONENT_REF(id) } : convert(response.schema, "output"),
      };
    }
    for (const other of response.otherTypes ?? [])
      content[other.contentType] = { schema: {}, description: other.description };
    const headers = Object.entries(response.headers ?? {}).map(([name, description]) => [
      name,
      { description, schema: { type: "string" } },
    ]);
    responses[status] = {
      description: response.description,
      ...(headers.length ? { headers: Object.fromEntries(headers) } : {}),
      ...(Object.keys(content).length ? { content } : {}),
    };
  }
  // A reused Idempotency-Key answers 409 on any write that accepts one.
  if (route.idempotent && !responses["409"]) {
    responses["409"] = {
      description:
        "This Idempotency-Key was used for a different request, or its first request is still running.",
      content: errorContent,
    };
  }
  const errors = route.scope === "none" ? [] : [400, 401, 403, 404, 429];
  if (route.body) errors.push(413, 415);
  for (const status of errors.sort()) {
    responses[String(status)] = {
      description:
        COMMON_ERRORS[status] ??
        (status === 413 ? "The body is over the size limit." : "Send the body with the stated Content-Type."),
      content: errorContent,
      ...(status === 429
        ? {
            headers: {
              "Retry-After": { description: "Seconds until the next window.", schema: { type: "integer" } },
            },
          }
        : {}),
    };
  }
  const who = route.roles.length === 0 ? "Anyone." : `Roles: ${route.roles.join(", ")}.`;
  const scope =
    route.scope === "session"
      ? " Signed-in browser session only; API tokens are refused."
      : route.scope === "none"
        ? ""
        : ` API token scope: ${route.scope === "read" ? "read (or read-submit)" : "read-submit"}. At most ${rateLimit} requests a minute per token.`;
  return {
    operationId: route.operationId,
    tags: [route.tag],
    summary: route.summary,
    description: `${route.description}\n\n${who}${scope}`,
    ...(parameters.length ? { parameters } : {}),
    ...(route.body
      ? {
          requestBody: {
            required: true,
            description: route.body.description,
            content: {
              [route.body.contentType]: {
                schema: route.body.schema ? describeBody(route.body.schema, route.notes) : { type: "string" },
              },
            },
          },
        }
      : {}),
    responses,
    security:
      route.scope === "none"
        ? []
        : route.scope === "session"
          ? [{ sessionCookie: [] }]
          : [{ bearerToken: [] }, { sessionCookie: [] }],
  };
}

let cached: { origin: string; document: Record<string, unknown> } | undefined;

/** The whole document; `origin` is where this server answers (for the servers list). */
export function buildOpenApiDocument({ origin }: { origin: string }): Record<string, unknown> {
  if (cached?.origin === origin) return cached.document;
  const rateLimit = getEnv().API_RATE_LIMIT_PER_MINUTE;
  const { schemas, refFor } = collectResponseSchemas();
  const paths: Record<string, Record<string, unknown>> = {};
  for (const route of API_ROUTES) {
    paths[route.path] ??= {};
    paths[route.path]![route.method] = buildOperation(route, refFor, rateLimit);
  }
  const document = {
    openapi: "3.1.0",
    info: {
      title: "Heliotally API",
      version: "1",
      description:
        "Submit and list sunspot counts, import and export logbooks, and read the network's published series, k coefficients and the Sun's orientation. Authenticate with a personal API token (Account → API tokens) sent as `Authorization: Bearer <token>`, or with the browser session. Errors always answer `{ error: { code, message, issues? } }`.",
    },
    servers: [{ url: origin }],
    tags: API_TAG_ORDER.map((name) => ({ name })),
    paths,
    components: {
      schemas,
      securitySchemes: {
        bearerToken: {
          type: "http",
          scheme: "bearer",
          description:
            "A personal API token (htk_…), created under Account → API tokens. Read tokens may only use GET.",
        },
        sessionCookie: {
          type: "apiKey",
          in: "cookie",
          name: "next-auth.session-token",
          description: "The signed-in browser session.",
        },
      },
    },
  };
  cached = { origin, document };
  return document;
}

/** A curl command for a route, with the token in an environment variable. */
export function formatCurlExample({ route, origin }: { route: ApiRoute; origin: string }): string {
  let path = route.path;
  for (const [name, value] of Object.entries(route.example.pathParams ?? {}))
    path = path.replace(`{${name}}`, value);
  const query = route.example.query ? `?${new URLSearchParams(route.example.query).toString()}` : "";
  const lines = [
    `curl${route.method === "get" ? "" : ` -X ${route.method.toUpperCase()}`} "${origin}${path}${query}"`,
  ];
  if (route.scope === "session") lines.push(`  -b "next-auth.session-token=<your session cookie>"`);
  else if (route.scope !== "none") lines.push(`  -H "Authorization: Bearer $HELIOTALLY_TOKEN"`);
  if (route.idempotent) lines.push(`  -H "Idempotency-Key: $(uuidgen)"`);
  if (route.body?.contentType === "text/csv") {
    lines.push(`  -H "Content-Type: text/csv"`, `  --data-binary @logbook.csv`);
  } else if (route.example.body !== undefined) {
    lines.push(`  -H "Content-Type: application/json"`, `  -d '${JSON.stringify(route.example.body)}'`);
  }
  if (route.curlSave) lines.push(`  ${route.curlSave}`);
  return lines.join(" \\\n");
}
