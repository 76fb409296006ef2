"use client";

import { useCallback, useRef, useState } from "react";

import type { RowProblem } from "@/lib/import/convert-row";

export type ImportResult = {
  batchId: string;
  rowsRead: number;
  imported: number;
  skipped: number;
  firstDay: string | null;
  lastDay: string | null;
  flags: { status: "done" | "running" };
};
export type ImportFailure = {
  message: string;
  problems: RowProblem[];
  problemCount: number;
  rowsRead: number;
  /** Problems with the options or the whole file come back as issues with a path. */
  issues: Array<{ path: string; message: string }>;
};

export type UploadState =
  | { phase: "idle" }
  | { phase: "uploading"; fraction: number }
  | { phase: "reading" | "checking" | "storing" | "flagging"; fraction: number; rowsRead: number }
  | { phase: "done"; result: ImportResult }
  | { phase: "failed"; failure: ImportFailure };

type Event =
  | {
      type: "progress";
      phase: "reading" | "checking" | "storing" | "flagging";
      bytesRead: number;
      totalBytes: number;
      rowsRead: number;
    }
  | { type: "done"; result: ImportResult }
  | {
      type: "failed";
      error: { message: string; issues?: Array<{ path: string; message: string }> };
      report?: { problems: RowProblem[]; problemCount: number; rowsRead: number };
    };

function toFailure(event: Extract<Event, { type: "failed" }>): ImportFailure {
  return {
    message: event.error.message,
    problems: event.report?.problems ?? [],
    problemCount: event.report?.problemCount ?? 0,
    rowsRead: event.report?.rowsRead ?? 0,
    issues: event.report ? [] : (event.error.issues ?? []),
  };
}

/**
 * Sends the file with XMLHttpRequest rather than fetch: it reports upload
 * progress, and its response text grows as the server streams its progress
 * lines (application/x-ndjson), which drives the second half of the bar.
 */
export function useImportUpload() {
  const [state, setState] = useState<UploadState>({ phase: "idle" });
  const current = useRef<XMLHttpRequest | null>(null);

  const start = useCallback(({ file, query }: { file: File; query: string }) => {
    const xhr = new XMLHttpRequest();
    current.current = xhr;
    let seen = 0;
    let finished = false;
    const handle = (event: Event) => {
      if (event.type === "progress") {
        setState({
          phase: event.phase,
          fraction: event.totalBytes ? event.bytesRead / event.totalBytes : 0,
          rowsRead: event.rowsRead,
        });
      } else if (event.type === "done") {
        finished = true;
        setState({ phase: "done", result: event.result });
      } else {
        finished = true;
        setState({ phase: "failed", failure: toFailure(event) });
      }
    };
    const readLines = () => {
      const text = xhr.responseText;
      let end = text.indexOf("\n", seen);
      while (end >= 0) {
        const line = text.slice(seen, end).trim();
        seen = end + 1;
        if (line) handle(JSON.parse(line) as Event);
        end = text.indexOf("\n", seen);
      }
    };
    xhr.open("POST", `/api/v1/imports?${query}`);
    xhr.setRequestHeader("Content-Type", "text/csv");
    xhr.setRequestHeader("Accept", "application/x-ndjson");
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) setState({ phase: "uploading", fraction: e.loaded / e.total });
    };
    xhr.onprogress = () => {
      if (xhr.status === 200) readLines();
    };
    xhr.onload = () => {
      if (xhr.status === 200) {
        readLines();
        if (!finished)
          setState({
            phase: "failed",
            failure: {
              message: "The server stopped before the import finished. Nothing was imported; try again.",
              problems: [],
              problemCount: 0,
              rowsRead: 0,
              issues: [],
            },
          });
        return;
      }
      let body: { error?: { message?: string; issues?: Array<{ path: string; message: string }> } } = {};
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        // not JSON: keep the generic message below
      }
      setState({
        phase: "failed",
        failure: {
          message: body.error?.message ?? `The import failed (HTTP ${xhr.status}). Nothing was imported.`,
          problems: [],
          problemCount: 0,
          rowsRead: 0,
          issues: body.error?.issues ?? [],
        },
      });
    };
    xhr.onerror = () =>
      setState({
        phase: "failed",
        failure: {
          message: "The connection was lost. Nothing was imported; try again.",
          problems: [],
          problemCount: 0,
          rowsRead: 0,
          issues: [],
        },
      });
    setState({ phase: "uploading", fraction: 0 });
    xhr.send(file);
  }, []);

  const reset = useCallback(() => {
    current.current?.abort();
    current.current = null;
    setState({ phase: "idle" });
  }, []);

  return { state, start, reset };
}
