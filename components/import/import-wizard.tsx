"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useEffect, useMemo, useState } from "react";

import { Button, ButtonLink } from "@/components/ui/button";
import { Field, FormMessage, Input, Select } from "@/components/ui/field";
import { FIELD_LABELS, IMPORT_FIELDS, type ImportField } from "@/lib/import/columns";
import { makeRowConverter } from "@/lib/import/convert-row";
import { DATE_FORMATS, type DateFormatId } from "@/lib/import/dates";
import { describeTooLarge, parseSample, SAMPLE_BYTES, trimToWholeLines } from "@/lib/import/sample";
import {
  DELIMITER_LABELS,
  DELIMITER_NAMES,
  detectDelimiter,
  inspectFileHead,
  suggestMapping,
  type ColumnMapping,
  type DelimiterName,
  type Suggestion,
} from "@/lib/import/sniff";
import { formatRelativeNumber, formatUt } from "@/lib/format/time";
import { fieldErrorsFromZod } from "@/lib/validation/form-state";
import { importOptionsSchema } from "@/lib/validation/import";

import { ImportProgress } from "./import-progress";
import { ImportReport } from "./import-report";
import { useImportUpload } from "./use-import-upload";

export type WizardInstrument = { id: string; name: string; k: number };

const PREVIEW_ROWS = 10;

type Setup = {
  fileName: string;
  sampleText: string;
  delimiter: DelimiterName;
  hasHeader: boolean;
  mapping: ColumnMapping;
  dateFormat: DateFormatId;
  timeZone: string;
  defaultTime: string;
  defaultSeeing: string;
  instrumentId: string;
  suggestion: Suggestion;
};

function listTimeZones(current: string): string[] {
  const zones = typeof Intl.supportedValuesOf === "function" ? Intl.supportedValuesOf("timeZone") : [];
  return Array.from(new Set(["UTC", current, ...zones]));
}

/**
 * Choose a CSV logbook, check how it will be read, preview the first rows
 * with their relative numbers, then import it in one go. Observers import
 * their own; coordinators pass `observerId` to import for someone else.
 */
export function ImportWizard({
  observerId,
  instruments,
  defaultTimeZone,
  maxBytes,
  logbookHref,
}: {
  observerId?: string;
  instruments: WizardInstrument[];
  defaultTimeZone: string;
  maxBytes: number;
  logbookHref: string;
}) {
  const [file, setFile] = useState<File | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [setup, setSetup] = useState<Setup | null>(null);
  const upload = useImportUpload();
  const router = useRouter();
  const done = upload.state.phase === "done";
  useEffect(() => {
    // The list of earlier imports beside the form is server-rendered.
    if (done) router.refresh();
  }, [done, router]);
  const busy =
    upload.state.phase !== "idle" && upload.state.phase !== "done" && upload.state.phase !== "failed";
  const instrumentNames = useMemo(() => instruments.map((i) => i.name), [instruments]);

  async function chooseFile(chosen: File | null) {
    upload.reset();
    setSetup(null);
    setFileError(null);
    setFile(chosen);
    if (!chosen) return;
    if (chosen.size > maxBytes) return setFileError(describeTooLarge({ bytes: chosen.size, maxBytes }));
    const head = new Uint8Array(await chosen.slice(0, SAMPLE_BYTES).arrayBuffer());
    const problem = inspectFileHead(head, { totalBytes: chosen.size });
    if (problem) return setFileError(problem.message);
    const sampleText = trimToWholeLines({
      text: new TextDecoder().decode(head),
      complete: chosen.size <= SAMPLE_BYTES,
    });
    const delimiter = detectDelimiter(sampleText);
    setSetup({
      fileName: chosen.name,
      sampleText,
      timeZone: defaultTimeZone,
      defaultTime: "12:00",
      defaultSeeing: "",
      instrumentId: instruments.length === 1 ? instruments[0]!.id : "",
      ...suggestFor({ sampleText, delimiter, instrumentNames }),
    });
  }

  const sample = useMemo(
    () => (setup ? parseSample({ text: setup.sampleText, delimiter: setup.delimiter }) : null),
    [setup],
  );
  const header = setup?.hasHeader ? (sample?.records[0]?.cells ?? []) : [];
  const dataRecords = (setup?.hasHeader ? sample?.records.slice(1) : sample?.records) ?? [];
  const width = Math.max(0, ...(sample?.records ?? []).map((r) => r.cells.length));

  const optionsInput = setup
    ? {
        ...(observerId ? { observerId } : {}),
        fileName: setup.fileName.slice(0, 200),
        delimiter: setup.delimiter,
        header: String(setup.hasHeader),
        ...Object.fromEntries(
          IMPORT_FIELDS.filter((f) => setup.mapping[f] !== undefined).map((f) => [
            f,
            String(setup.mapping[f]),
          ]),
        ),
        dateFormat: setup.dateFormat,
        timeZone: setup.timeZone,
        defaultTime: setup.defaultTime,
        ...(setup.mapping.seeing === undefined && setup.defaultSeeing
          ? { defaultSeeing: setup.defaultSeeing }
          : {}),
        ...(setup.mapping.instrument === undefined && setup.instrumentId
          ? { instrumentId: setup.instrumentId }
          : {}),
      }
    : null;
  const parsedOptions = optionsInput ? importOptionsSchema.safeParse(optionsInput) : null;
  const fieldErrors = parsedOptions && !parsedOptions.success ? fieldErrorsFromZod(parsedOptions.error) : {};

  // Ten rows through the same converter as the server: cheap enough to redo on every change.
  const convert = parsedOptions?.success
    ? makeRowConverter({ options: parsedOptions.data, instruments })
    : null;
  const preview = convert
    ? dataRecords
        .slice(0, PREVIEW_ROWS)
        .map((record) => ({ record, result: convert(record.cells, record.line) }))
    : [];
  const previewProblems = preview.filter((p) => !p.result.ok).length;

  const update = (patch: Partial<Setup>) => setSetup((s) => (s ? { ...s, ...patch } : s));
  const setColumn = (field: ImportField, value: string) =>
    setSetup((s) => {
      if (!s) return s;
      const mapping = { ...s.mapping };
      if (value === "") delete mapping[field];
      else mapping[field] = Number(value);
      return { ...s, mapping };
    });

  const columnLabel = (n: number) => {
    const name = header[n - 1]?.trim();
    const example = dataRecords[0]?.cells[n - 1]?.trim();
    return `Column ${n}${name ? ` · ${name}` : example ? ` · e.g. ${example.slice(0, 24)}` : ""}`;
  };

  return (
    <div className="flex flex-col gap-8">
      <section
        aria-labelledby="step-file"
        className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
      >
        <h2 id="step-file" className="mb-3 text-base font-semibold text-ink-900">
          1. Choose the file
        </h2>
        <Field
          id="logbook-file"
          label="CSV logbook"
          hint={`A .csv or .txt file saved as UTF-8 text, up to ${Math.round(maxBytes / (1024 * 1024))} MB. One line per count: a date, g and s at least.`}
          error={fileError ?? undefined}
        >
          <Input
            id="logbook-file"
            type="file"
            accept=".csv,.txt,.tsv,text/csv,text/plain"
            disabled={busy}
            aria-invalid={Boolean(fileError)}
            onChange={(e) => void chooseFile(e.target.files?.[0] ?? null)}
          />
        </Field>
        {file && !fileError && setup ? (
          <p className="mt-2 text-sm text-ink-600">
            {file.name}: {setup.suggestion.hasHeader ? "a header line was found; " : "no header line; "}
            {Object.keys(setup.suggestion.recognisedBy).length} columns recognised. Check them below.
          </p>
        ) : null}
        {sample?.error ? (
          <p role="alert" className="mt-2 text-sm font-medium text-caution-700">
            {sample.error} Check the separator below, or fix the file.
          </p>
        ) : null}
      </section>

      {setup && !fileError ? (
        <section
          aria-labelledby="step-columns"
          className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
        >
          <h2 id="step-columns" className="mb-1 text-base font-semibold text-ink-900">
            2. How to read it
          </h2>
          <p className="mb-4 text-sm text-ink-600">
            Chosen once for the whole file. Columns marked “—” are not in the file.
          </p>
          <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
            <Field id="import-delimiter" label="Values are separated by">
              <Select
                id="import-delimiter"
                value={setup.delimiter}
                disabled={busy}
                onChange={(e) =>
                  update(
                    suggestFor({
                      sampleText: setup.sampleText,
                      delimiter: e.target.value as DelimiterName,
                      instrumentNames,
                    }),
                  )
                }
              >
                {DELIMITER_NAMES.map((d) => (
                  <option key={d} value={d}>
                    {DELIMITER_LABELS[d]}
                  </option>
                ))}
              </Select>
            </Field>
            <label className="flex items-center gap-2 self-end pb-2 text-sm text-ink-800">
              <input
                type="checkbox"
                checked={setup.hasHeader}
                disabled={busy}
                onChange={(e) => update({ hasHeader: e.target.checked })}
                className="size-4 accent-corona-500"
              />
              The first line names the columns
            </label>
          </div>

          <div className="mt-5 grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
            {IMPORT_FIELDS.map((field) => (
              <Field
                key={field}
                id={`column-${field}`}
                label={FIELD_LABELS[field]}
                error={fieldErrors[field]}
                hint={
                  setup.suggestion.recognisedBy[field] === "header"
                    ? "Found by its header."
                    : setup.suggestion.recognisedBy[field] === "values"
                      ? "Guessed from the values: check it."
                      : undefined
                }
              >
                <Select
                  id={`column-${field}`}
                  value={setup.mapping[field] ?? ""}
                  disabled={busy}
                  aria-invalid={Boolean(fieldErrors[field])}
                  onChange={(e) => setColumn(field, e.target.value)}
                >
                  <option value="">—</option>
                  {Array.from({ length: width }, (_, i) => i + 1).map((n) => (
                    <option key={n} value={n}>
                      {columnLabel(n)}
                    </option>
                  ))}
                </Select>
              </Field>
            ))}
          </div>

          <div className="mt-5 grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
            <Field
              id="import-date-format"
              label="Dates are written"
              error={fieldErrors.dateFormat}
              hint={
                setup.suggestion.dateOrderAmbiguous
                  ? "No day in the first rows is above 12, so day/month and month/day both fit: make sure."
                  : setup.suggestion.dateFormats.length > 0
                    ? "Suggested from the first rows."
                    : undefined
              }
            >
              <Select
                id="import-date-format"
                value={setup.dateFormat}
                disabled={busy}
                onChange={(e) => update({ dateFormat: e.target.value as DateFormatId })}
              >
                {DATE_FORMATS.map((f) => (
                  <option key={f.id} value={f.id}>
                    {f.label}
                    {setup.suggestion.dateFormats.includes(f.id) ? " ✓" : ""}
                  </option>
                ))}
              </Select>
            </Field>
            <Field
              id="import-time-zone"
              label="Time zone of the dates and times"
              error={fieldErrors.timeZone}
            >
              <Select
                id="import-time-zone"
                value={setup.timeZone}
                disabled={busy}
                onChange={(e) => update({ timeZone: e.target.value })}
              >
                {listTimeZones(defaultTimeZone).map((zone) => (
                  <option key={zone} value={zone}>
                    {zone}
                  </option>
                ))}
              </Select>
            </Field>
            {setup.mapping.time === undefined ? (
              <Field
                id="import-default-time"
                label="Usual time of day"
                hint="Used for lines that give only a date."
                error={fieldErrors.defaultTime}
              >
                <Input
                  id="import-default-time"
                  type="time"
                  value={setup.defaultTime}
                  disabled={busy}
                  onChange={(e) => update({ defaultTime: e.target.value })}
                />
              </Field>
            ) : null}
            {setup.mapping.seeing === undefined ? (
              <Field
                id="import-default-seeing"
                label="Seeing to record"
                hint="The file has no seeing column."
                error={fieldErrors.defaultSeeing}
              >
                <Select
                  id="import-default-seeing"
                  value={setup.defaultSeeing}
                  disabled={busy}
                  aria-invalid={Boolean(fieldErrors.defaultSeeing)}
                  onChange={(e) => update({ defaultSeeing: e.target.value })}
                >
                  <option value="">Choose…</option>
                  {["1 — excellent", "2 — good", "3 — fair", "4 — poor", "5 — very poor"].map((label, i) => (
                    <option key={label} value={String(i + 1)}>
                      {label}
                    </option>
                  ))}
                </Select>
              </Field>
            ) : null}
            {setup.mapping.instrument === undefined ? (
              <Field
                id="import-instrument"
                label="Instrument used"
                hint="The file has no instrument column."
                error={fieldErrors.instrumentId}
              >
                <Select
                  id="import-instrument"
                  value={setup.instrumentId}
                  disabled={busy}
                  aria-invalid={Boolean(fieldErrors.instrumentId)}
                  onChange={(e) => update({ instrumentId: e.target.value })}
                >
                  <option value="">Choose…</option>
                  {instruments.map((i) => (
                    <option key={i.id} value={i.id}>
                      {i.name}
                    </option>
                  ))}
                </Select>
              </Field>
            ) : null}
          </div>
        </section>
      ) : null}

      {setup && !fileError && parsedOptions?.success ? (
        <section
          aria-labelledby="step-preview"
          className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
        >
          <h2 id="step-preview" className="mb-1 text-base font-semibold text-ink-900">
            3. Preview
          </h2>
          <p className="mb-3 text-sm text-ink-600">
            The first {Math.min(PREVIEW_ROWS, dataRecords.length)} rows as they will be stored, with R = k(10g
            + s) at the current k.
            {previewProblems > 0
              ? ` ${previewProblems} of them need attention: fix the file or the choices above.`
              : ""}
          </p>
          <div className="overflow-x-auto rounded-lg border border-ink-100">
            <table className="min-w-full text-sm" data-testid="import-preview">
              <caption className="sr-only">Preview of the first rows</caption>
              <thead className="bg-ink-50 text-left text-xs tracking-wide text-ink-600 uppercase">
                <tr>
                  {["Line", "Observed (UT)", "Instrument", "Seeing", "g", "s", "N g/s", "S g/s", "R", ""].map(
                    (h, i) => (
                      <th key={`${h}${i}`} scope="col" className="px-3 py-2 font-semibold">
                        {h}
                      </th>
                    ),
                  )}
                </tr>
              </thead>
              <tbody>
                {preview.map(({ record, result }) => {
                  if (!result.ok) {
                    return (
                      <tr
                        key={record.line}
                        className="border-t border-ink-100 bg-caution-50 align-top text-caution-800"
                      >
                        <td className="px-3 py-2 font-semibold tabular-nums">{record.line}</td>
                        <td colSpan={9} className="px-3 py-2">
                          {result.problems
                            .map((p) => `${p.field ? `${FIELD_LABELS[p.field]}: ` : ""}${p.reason}`)
                            .join(" · ")}
                        </td>
                      </tr>
                    );
                  }
                  const input = result.input;
                  const instrument = instruments.find((i) => i.id === input.instrumentId);
                  const r = (instrument?.k ?? 1) * (10 * input.groups + input.spots);
                  return (
                    <tr key={record.line} className="border-t border-ink-100">
                      <td className="px-3 py-2 text-ink-500 tabular-nums">{record.line}</td>
                      <td className="px-3 py-2 whitespace-nowrap">{formatUt(input.observedAt)}</td>
                      <td className="px-3 py-2">{instrument?.name}</td>
                      <td className="px-3 py-2 tabular-nums">{input.seeing}</td>
                      <td className="px-3 py-2 tabular-nums">{input.groups}</td>
                      <td className="px-3 py-2 tabular-nums">{input.spots}</td>
                      <td className="px-3 py-2 tabular-nums">
                        {input.northGroups === undefined ? "—" : `${input.northGroups}/${input.northSpots}`}
                      </td>
                      <td className="px-3 py-2 tabular-nums">
                        {input.southGroups === undefined ? "—" : `${input.southGroups}/${input.southSpots}`}
                      </td>
                      <td className="px-3 py-2 font-semibold tabular-nums">{formatRelativeNumber(r)}</td>
                      <td className="px-3 py-2 text-xs text-ink-500">{input.notes}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
          {dataRecords.length === 0 ? (
            <p className="mt-3 text-sm text-caution-700">
              No rows of counts were found in the first part of the file.
            </p>
          ) : null}
        </section>
      ) : null}

      {setup && !fileError ? (
        <section aria-labelledby="step-import" className="flex flex-col gap-4">
          <h2 id="step-import" className="sr-only">
            4. Import
          </h2>
          {upload.state.phase === "done" ? (
            <FormMessage tone="success">
              <p className="font-semibold" data-testid="import-done">
                {upload.state.result.imported.toLocaleString("en-GB")} counts imported
                {upload.state.result.skipped > 0
                  ? `, ${upload.state.result.skipped.toLocaleString("en-GB")} already in the Logbook (left as they were)`
                  : ""}
                .
              </p>
              <p className="mt-1">
                {upload.state.result.firstDay
                  ? `From ${upload.state.result.firstDay} to ${upload.state.result.lastDay}. They await review on the coordinator's Review desk like any new count${upload.state.result.flags.status === "running" ? " (their automatic checks finish in the background over the next minutes)" : ""}. `
                  : "Nothing new was in the file. "}
                <Link href={logbookHref} className="font-semibold underline">
                  Open the Logbook
                </Link>
              </p>
            </FormMessage>
          ) : null}
          {upload.state.phase === "failed" ? <ImportReport failure={upload.state.failure} /> : null}
          {"fraction" in upload.state ? <ImportProgress state={upload.state} /> : null}
          <div className="flex flex-wrap items-center gap-3">
            <Button
              type="button"
              disabled={!parsedOptions?.success || !file || busy || upload.state.phase === "done"}
              onClick={() =>
                file &&
                upload.start({
                  file,
                  query: new URLSearchParams(optionsInput as Record<string, string>).toString(),
                })
              }
            >
              {busy ? "Importing…" : upload.state.phase === "failed" ? "Try again" : "Import the whole file"}
            </Button>
            {upload.state.phase === "done" ? (
              <ButtonLink href={logbookHref} variant="secondary">
                Open the Logbook
              </ButtonLink>
            ) : (
              <p className="text-sm text-ink-600">
                Every row is stored, or none is: a file with a bad row changes nothing.
              </p>
            )}
          </div>
        </section>
      ) : null}
    </div>
  );
}

function suggestFor({
  sampleText,
  delimiter,
  instrumentNames,
}: {
  sampleText: string;
  delimiter: DelimiterName;
  instrumentNames: string[];
}): Pick<Setup, "delimiter" | "hasHeader" | "mapping" | "dateFormat" | "suggestion"> {
  const parsed = parseSample({ text: sampleText, delimiter });
  const suggestion = suggestMapping({ rows: parsed.records.map((r) => r.cells), instrumentNames });
  return {
    delimiter,
    hasHeader: suggestion.hasHeader,
    mapping: suggestion.mapping,
    dateFormat: suggestion.dateFormats[0] ?? "yyyy-mm-dd",
    suggestion,
  };
}
