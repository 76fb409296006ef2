"use client";

import dynamic from "next/dynamic";

import type { DiskTracerProps } from "./disk-tracer";

// Konva needs the browser's canvas: load the tracer on the client only.
const DiskTracer = dynamic(() => import("./disk-tracer").then((m) => m.DiskTracer), {
  ssr: false,
  loading: () => (
    <p className="rounded-lg border border-ink-100 bg-white p-6 text-sm text-ink-600" role="status">
      Loading the Disk tracer…
    </p>
  ),
});

export function TracerLoader(props: DiskTracerProps) {
  return <DiskTracer {...props} />;
}
