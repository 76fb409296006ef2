"use client";

import { useEffect, useState } from "react";

import type { DiskTracerProps } from "@/components/tracer/disk-tracer";
import { TracerLoader } from "@/components/tracer/tracer-loader";

import { clearTracerHandoff, readTracerHandoff } from "./tracer-handoff";

/**
 * The Disk tracer, started from the marks the observer accepted on the photo
 * when they come straight from the photo assist (see tracer-handoff.ts);
 * otherwise exactly the tracer as saved.
 */
export function TracerWithPhoto(props: DiskTracerProps) {
  const [initialDocument] = useState(() =>
    typeof window === "undefined"
      ? props.initialDocument
      : (readTracerHandoff({ observationId: props.observationId, base: props.initialDocument ?? null }) ??
        props.initialDocument),
  );
  // Used once: a later visit opens the tracing as saved.
  useEffect(() => clearTracerHandoff({ observationId: props.observationId }), [props.observationId]);
  return <TracerLoader {...props} initialDocument={initialDocument} />;
}
