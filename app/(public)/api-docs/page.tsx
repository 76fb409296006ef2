import type { Metadata } from "next";
import { headers } from "next/headers";
import Link from "next/link";

import { StaticTable, type StaticColumn } from "@/components/ui/static-table";
import {
  describeBody,
  describeParameters,
  formatCurlExample,
  type OpenApiParameter,
} from "@/lib/api/openapi";
import { API_ROUTES, API_TAG_ORDER, type ApiRoute } from "@/lib/api/routes";
import { getEnv } from "@/lib/env";

export const metadata: Metadata = { title: "API reference" };

const METHOD_STYLES: Record<ApiRoute["method"], string> = {
  get: "bg-meadow-50 text-meadow-700",
  post: "bg-corona-100 text-corona-800",
  put: "bg-ink-100 text-ink-800",
  delete: "bg-caution-50 text-caution-800",
};

function typeOf(schema: Record<string, unknown>): string {
  if (Array.isArray(schema.enum)) return (schema.enum as unknown[]).map(String).join(" | ");
  const type = String(schema.type ?? "any");
  const bounds = [
    schema.minimum !== undefined ? `≥ ${schema.minimum}` : null,
    schema.maximum !== undefined ? `≤ ${schema.maximum}` : null,
    schema.maxLength !== undefined ? `≤ ${schema.maxLength} chars` : null,
  ].filter(Boolean);
  return `${type}${bounds.length ? ` (${bounds.join(", ")})` : ""}`;
}

type ParameterRow =
  | OpenApiParameter
  | { name: string; in: "body"; required: boolean; description?: string; schema: Record<string, unknown> };

const PARAMETER_COLUMNS: Array<StaticColumn<ParameterRow>> = [
  {
    key: "name",
    header: "Name",
    className: "font-mono text-xs whitespace-nowrap text-ink-900",
    cell: (p) => (
      <>
        {p.name}
        {p.required ? (
          <span className="ml-1 text-caution-700" title="required">
            *
          </span>
        ) : null}
      </>
    ),
  },
  { key: "in", header: "In", className: "text-xs text-ink-500", cell: (p) => p.in },
  {
    key: "type",
    header: "Type",
    className: "text-xs text-ink-700",
    cell: (p) => (
      <>
        {typeOf(p.schema)}
        {p.schema.default !== undefined ? (
          <span className="block text-ink-500">default {String(p.schema.default)}</span>
        ) : null}
      </>
    ),
  },
  { key: "meaning", header: "Meaning", className: "text-ink-700", cell: (p) => p.description },
];

function ParameterTable({ caption, rows }: { caption: string; rows: ParameterRow[] }) {
  return (
    <StaticTable
      caption={caption}
      columns={PARAMETER_COLUMNS}
      rows={rows}
      rowKey={(p) => `${p.in}:${p.name}`}
      rowClassName={() => "align-top"}
      density="compact"
      className="mt-2"
    />
  );
}

type BodySchema = {
  properties?: Record<string, Record<string, unknown>>;
  required?: string[];
  oneOf?: BodySchema[];
};

/** A body's fields; for a body of several shapes (an instrument, by kind), which shapes each field is in. */
function bodyRows(route: ApiRoute) {
  if (!route.body?.schema) return [];
  const json = describeBody(route.body.schema, route.notes) as BodySchema;
  const shapes = json.oneOf ?? [json];
  const labelOf = (shape: BodySchema) =>
    Object.values(shape.properties ?? {}).find((p) => typeof p.const === "string")?.const as
      string | undefined;
  const names = [...new Set(shapes.flatMap((shape) => Object.keys(shape.properties ?? {})))];
  return names.map((name) => {
    const having = shapes.filter((shape) => shape.properties?.[name]);
    const consts = having.map((shape) => shape.properties![name]!.const);
    // The field that tells the shapes apart lists every value it takes.
    const schema =
      shapes.length > 1 && consts.every((c) => typeof c === "string")
        ? { type: "string", enum: consts }
        : having[0]!.properties![name]!;
    const own = route.notes?.[name] ?? (typeof schema.description === "string" ? schema.description : "");
    const only =
      having.length < shapes.length ? `Only for ${having.map(labelOf).filter(Boolean).join(", ")}.` : "";
    return {
      name,
      in: "body" as const,
      required: having.length === shapes.length && having.every((shape) => shape.required?.includes(name)),
      description: [own, only].filter(Boolean).join(" ") || undefined,
      schema,
    };
  });
}

function Endpoint({ route, origin }: { route: ApiRoute; origin: string }) {
  const params = [
    ...(route.pathParams ? describeParameters(route.pathParams, "path", route.notes) : []),
    ...(route.query
      ? describeParameters(route.query, "query", route.notes, route.alsoRequired, route.alsoOptional)
      : []),
    ...bodyRows(route),
  ];
  const who =
    route.roles.length === 0 ? "Anyone" : route.roles.map((r) => r[0]!.toUpperCase() + r.slice(1)).join(", ");
  const scope =
    route.scope === "session"
      ? "Signed-in session only (no API tokens)"
      : route.scope === "none"
        ? "No sign-in needed"
        : route.scope === "read"
          ? "Any token (read or read and submit)"
          : "Token with read and submit";
  return (
    <article
      id={route.operationId}
      className="scroll-mt-6 rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
    >
      <header className="flex flex-wrap items-center gap-3">
        <span
          className={`rounded px-2 py-0.5 font-mono text-xs font-bold uppercase ${METHOD_STYLES[route.method]}`}
        >
          {route.method}
        </span>
        <code className="font-mono text-sm font-semibold text-ink-900">{route.path}</code>
      </header>
      <h3 className="mt-2 text-base font-semibold text-ink-900">{route.summary}</h3>
      <p className="mt-1 text-sm text-ink-700">{route.description}</p>
      <dl className="mt-3 grid gap-x-6 gap-y-1 text-xs text-ink-600 sm:grid-cols-[auto_1fr]">
        <dt className="font-semibold">Who</dt>
        <dd>{who}</dd>
        <dt className="font-semibold">Access</dt>
        <dd>{scope}</dd>
        {route.idempotent ? (
          <>
            <dt className="font-semibold">Retries</dt>
            <dd>
              Send an Idempotency-Key header; a retry with the same key and body gets the first answer again.
            </dd>
          </>
        ) : null}
        {route.body ? (
          <>
            <dt className="font-semibold">Body</dt>
            <dd>
              {route.body.contentType}: {route.body.description}
            </dd>
          </>
        ) : null}
      </dl>
      {params.length > 0 ? <ParameterTable caption={`Parameters of ${route.summary}`} rows={params} /> : null}
      <div className="mt-3 text-sm">
        <h4 className="text-xs font-semibold tracking-wide text-ink-500 uppercase">Answers</h4>
        <ul className="mt-1 flex flex-col gap-1">
          {Object.entries(route.responses).map(([status, response]) => (
            <li key={status}>
              <span className="font-mono font-semibold text-meadow-700">{status}</span> {response.description}
              {response.otherTypes?.map((t) => (
                <span key={t.contentType} className="block pl-10 text-xs text-ink-600">
                  {t.contentType}: {t.description}
                </span>
              ))}
            </li>
          ))}
          {route.scope !== "none" ? (
            <li className="text-xs text-ink-600">
              Errors: 400, 401, 403, 404{route.idempotent ? ", 409 (a reused Idempotency-Key)" : ""}
              {route.body ? ", 413, 415" : ""}, 429, each as {"{ error: { code, message, issues? } }"}.
            </li>
          ) : null}
        </ul>
      </div>
      <pre className="mt-3 overflow-x-auto rounded-md bg-ink-950 p-3 text-xs leading-relaxed text-ink-100">
        <code>{formatCurlExample({ route, origin })}</code>
      </pre>
    </article>
  );
}

export default async function ApiDocsPage() {
  const headerStore = await headers();
  const host = headerStore.get("host");
  const origin = host
    ? `${headerStore.get("x-forwarded-proto") ?? "http"}://${host}`
    : (getEnv().NEXTAUTH_URL ?? "http://localhost:3000");
  const limit = getEnv().API_RATE_LIMIT_PER_MINUTE;
  return (
    <div className="grid gap-8 lg:grid-cols-[14rem_1fr]">
      <nav aria-label="Endpoints" className="lg:sticky lg:top-6 lg:self-start">
        <p className="mb-2 text-xs font-semibold tracking-wide text-ink-500 uppercase">Endpoints</p>
        {API_TAG_ORDER.map((tag) => (
          <div key={tag} className="mb-3">
            <p className="text-sm font-semibold text-ink-900">{tag}</p>
            <ul className="mt-1 flex flex-col gap-0.5">
              {API_ROUTES.filter((r) => r.tag === tag).map((r) => (
                <li key={r.operationId}>
                  <a href={`#${r.operationId}`} className="text-sm text-ink-600 hover:text-corona-700">
                    {r.summary}
                  </a>
                </li>
              ))}
            </ul>
          </div>
        ))}
      </nav>
      <div className="flex min-w-0 flex-col gap-6">
        <header>
          <h1 className="text-2xl font-semibold tracking-tight text-ink-950">Heliotally API</h1>
          <p className="mt-2 max-w-3xl text-sm text-ink-700">
            Your own scripts can send counts, bring whole logbooks in, take everything out, and read the
            network&apos;s series, k coefficients and the Sun&apos;s orientation. Every answer is JSON (or the
            file you asked for); every error has the shape{" "}
            <code className="rounded bg-ink-100 px-1">{"{ error: { code, message, issues? } }"}</code>.
          </p>
        </header>
        <section
          aria-labelledby="auth"
          className="rounded-lg border border-corona-200 bg-corona-50 p-5 text-sm text-ink-800"
        >
          <h2 id="auth" className="text-base font-semibold text-ink-900">
            Signing your requests
          </h2>
          <ol className="mt-2 list-decimal space-y-1 pl-5">
            <li>
              Sign in and create a token under{" "}
              <Link href="/account/tokens" className="font-semibold text-corona-700 underline">
                Account → API tokens
              </Link>
              . Choose <em>read only</em> for scripts that only fetch, <em>read and submit</em> for scripts
              that send counts.
            </li>
            <li>Copy it when it is shown: Heliotally keeps only a hash and cannot show it again.</li>
            <li>
              Keep it out of your code, e.g.{" "}
              <code className="rounded bg-white px-1">export HELIOTALLY_TOKEN=htk_…</code>, and send it as{" "}
              <code className="rounded bg-white px-1">Authorization: Bearer $HELIOTALLY_TOKEN</code>.
            </li>
          </ol>
          <p className="mt-3">
            A token acts as you, with your role: an observer&apos;s token sees that observer&apos;s Logbook, a
            coordinator&apos;s sees the network. Each token may make {limit.toLocaleString("en-GB")} requests
            a minute; past that the answer is 429 with a Retry-After header. A revoked or unknown token gets
            401; a read-only token used to write gets 403.
          </p>
          <p className="mt-3">
            Machine-readable:{" "}
            <a href="/api/v1/openapi.json" className="font-semibold text-corona-700 underline">
              /api/v1/openapi.json
            </a>{" "}
            (OpenAPI 3.1, generated from the same schemas the server checks requests with).
          </p>
        </section>
        {API_TAG_ORDER.map((tag) => (
          <section key={tag} aria-labelledby={`tag-${tag}`} className="flex flex-col gap-4">
            <h2 id={`tag-${tag}`} className="text-lg font-semibold text-ink-950">
              {tag}
            </h2>
            {API_ROUTES.filter((r) => r.tag === tag).map((route) => (
              <Endpoint key={route.operationId} route={route} origin={origin} />
            ))}
          </section>
        ))}
      </div>
    </div>
  );
}
