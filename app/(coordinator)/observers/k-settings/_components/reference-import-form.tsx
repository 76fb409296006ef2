"use client";

import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";

import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input } from "@/components/ui/field";
import { MAX_REFERENCE_CSV_BYTES, referenceImportSchema } from "@/lib/validation/reference-import";

type Problem = { path: string; message: string };

/**
 * Imports a reference series from a CSV file. The file is read and checked
 * in the browser with the schema the server uses, so a bad file is reported
 * row by row before anything is sent; the server checks it again.
 */
export function ReferenceImportForm() {
  const router = useRouter();
  const [problems, setProblems] = useState<Problem[]>([]);
  const [message, setMessage] = useState<{ tone: "success" | "error"; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setMessage(null);
    const form = event.currentTarget;
    const data = new FormData(form);
    const file = data.get("file");
    if (file instanceof File && file.size > MAX_REFERENCE_CSV_BYTES) {
      setProblems([{ path: "csv", message: "The file is larger than 5 MB; split it or remove columns." }]);
      return;
    }
    const payload = {
      name: String(data.get("name") ?? ""),
      licence: String(data.get("licence") ?? ""),
      source: String(data.get("source") ?? ""),
      csv: file instanceof File && file.size > 0 ? await file.text() : "",
    };
    const parsed = referenceImportSchema.safeParse(payload);
    if (!parsed.success) {
      setProblems(
        parsed.error.issues.map((i) => ({ path: i.path.map(String).join("."), message: i.message })),
      );
      setMessage({
        tone: "error",
        text: "Nothing was imported. Fix what is listed and choose the file again.",
      });
      return;
    }
    setProblems([]);
    setBusy(true);
    try {
      const res = await fetch("/api/v1/reference-series", {
        method: "POST",
        headers: {
          "content-type": "application/json",
          "idempotency-key": `reference-${crypto.randomUUID()}`,
        },
        body: JSON.stringify(payload),
      });
      const body = await res.json();
      if (!res.ok) {
        setProblems((body?.error?.issues ?? []) as Problem[]);
        setMessage({ tone: "error", text: body?.error?.message ?? "Nothing was imported." });
        return;
      }
      form.reset();
      setMessage({
        tone: "success",
        text: `Imported “${body.name}”: ${body.days} days from ${body.firstDay} to ${body.lastDay}. Choose it as the reference below to fit k against it.`,
      });
      router.refresh();
    } catch {
      setMessage({ tone: "error", text: "The file could not be sent. Check the connection and try again." });
    } finally {
      setBusy(false);
    }
  }

  const fieldError = (name: string) => problems.find((p) => p.path === name)?.message;
  const rowProblems = problems.filter((p) => p.path === "csv" || p.path.startsWith("csv."));

  return (
    <section
      aria-labelledby="import-heading"
      className="flex flex-col gap-4 rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
    >
      <h2 id="import-heading" className="text-lg font-semibold text-ink-900">
        Import a reference series
      </h2>
      <p className="text-sm text-ink-600">
        A CSV file with a header row naming the columns <code>date</code> and <code>value</code>, then one row
        per UT day (<code>2024-03-14,112.5</code>). A file with any bad row is refused whole; the rows and
        reasons are listed here.
      </p>
      <form onSubmit={submit} noValidate className="flex flex-col gap-4">
        <Field id="name" label="Name" error={fieldError("name")}>
          <Input id="name" name="name" maxLength={120} aria-invalid={Boolean(fieldError("name"))} />
        </Field>
        <Field
          id="licence"
          label="Licence"
          error={fieldError("licence")}
          hint="The terms the values are published under, as their publisher states them."
        >
          <Input id="licence" name="licence" maxLength={200} aria-invalid={Boolean(fieldError("licence"))} />
        </Field>
        <Field
          id="source"
          label="Source (optional)"
          error={fieldError("source")}
          hint="Where the values come from: a publisher, a web page, a citation."
        >
          <Input id="source" name="source" maxLength={300} />
        </Field>
        <Field
          id="file"
          label="CSV file"
          error={rowProblems.length === 1 ? rowProblems[0]!.message : undefined}
        >
          <Input
            id="file"
            name="file"
            type="file"
            accept=".csv,text/csv"
            aria-invalid={rowProblems.length > 0}
          />
        </Field>
        {rowProblems.length > 1 ? (
          <div
            role="alert"
            className="rounded-md border border-caution-200 bg-caution-50 px-4 py-3 text-sm text-caution-800"
          >
            <p className="font-semibold">The file was refused ({rowProblems.length} problems):</p>
            <ul className="mt-1 max-h-64 list-disc overflow-y-auto pl-5" data-testid="csv-problems">
              {rowProblems.map((p, i) => (
                <li key={`${p.path}-${i}`}>{p.message}</li>
              ))}
            </ul>
          </div>
        ) : null}
        {message ? <FormMessage tone={message.tone}>{message.text}</FormMessage> : null}
        <div>
          <Button type="submit" disabled={busy}>
            {busy ? "Importing…" : "Import"}
          </Button>
        </div>
      </form>
    </section>
  );
}
