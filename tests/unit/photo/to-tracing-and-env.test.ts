import { describe, expect, it } from "vitest";

import { getUploadthingEnv, type Env } from "@/lib/env";
import { buildTracingFromPhoto } from "@/lib/photo/to-tracing";
import { checkTracingDocument, createEmptyTracing } from "@/lib/validation/tracing";

import { LOCAL_UPLOADTHING_TOKEN } from "../../../uploads-fake/token";

describe("handing accepted photo marks to the Disk tracer", () => {
  const photo = {
    id: "photo-1",
    imageUrl: "/api/v1/photos/photo-1/image?variant=view",
    widthPx: 1600,
    heightPx: 1200,
  };
  const limb = { centreXPx: 820, centreYPx: 590, radiusPx: 520 };
  const spots = [
    { id: "c1", xPx: 700, yPx: 500, radiusPx: 14, hasUmbra: true },
    { id: "c2", xPx: 1000, yPx: 760, radiusPx: 3, hasUmbra: false },
  ];

  it("makes a valid tracing on the photo's own pixel grid, with only the accepted spots", () => {
    const doc = buildTracingFromPhoto({ photo, limb, spots, look: { brightness: 1.2, contrast: 10 } });
    expect(checkTracingDocument(doc).ok).toBe(true);
    expect(doc.canvas).toEqual({ width: 1600, height: 1200 });
    expect(doc.background).toEqual({
      imageUrl: photo.imageUrl,
      photoId: "photo-1",
      brightness: 1.2,
      contrast: 10,
    });
    expect(doc.disk).toMatchObject({ cx: 820, cy: 590, r: 520, method: "limb-points" });
    expect(doc.spots.map((s) => [s.x, s.y, s.groupId])).toEqual([
      [700, 500, null],
      [1000, 760, null],
    ]);
    expect(doc.spots[0]!.penumbraRadius).toBe(14);
    expect(doc.spots[1]!.penumbraRadius).toBeNull();
  });

  it("keeps an existing tracing's spots, gives new spots fresh ids and scales to its drawing area", () => {
    const base = { ...createEmptyTracing({ width: 800, height: 600 }) };
    base.spots = [
      { id: "photo-1", x: 10, y: 10, umbraRadius: 2, penumbraRadius: null, groupId: null, area: null },
    ];
    const doc = buildTracingFromPhoto({
      photo,
      limb: null,
      spots,
      look: { brightness: 1, contrast: 0 },
      base,
    });
    expect(doc.spots).toHaveLength(3);
    expect(new Set(doc.spots.map((s) => s.id)).size).toBe(3);
    expect(doc.spots[1]).toMatchObject({ x: 350, y: 250 });
    expect(doc.disk).toBeNull();
  });
});

describe("photo store settings from the environment", () => {
  const env = (overrides: Partial<Env>): Env =>
    ({
      PORT: 3000,
      UPLOADS_FAKE_PORT: 3100,
      UPLOADTHING_TOKEN: LOCAL_UPLOADTHING_TOKEN,
      ...overrides,
    }) as Env;

  it("with the local token points every host at the local store", () => {
    expect(getUploadthingEnv(env({}))).toEqual({
      token: LOCAL_UPLOADTHING_TOKEN,
      local: true,
      ingestUrl: "http://localhost:3100",
      apiUrl: "http://localhost:3100",
      ufsHost: "localhost:3100",
      ufsAppIdLocation: "path",
      callbackUrl: "http://localhost:3000/api/uploadthing",
    });
  });

  it("with a real token leaves the hosts to the SDK (switching is a change of environment)", () => {
    const hosted = getUploadthingEnv(
      env({ UPLOADTHING_TOKEN: "eyJyZWFsIjoidG9rZW4ifQ==", NEXTAUTH_URL: "https://ht.example.org" }),
    );
    expect(hosted).toEqual({
      token: "eyJyZWFsIjoidG9rZW4ifQ==",
      local: false,
      callbackUrl: "https://ht.example.org/api/uploadthing",
    });
  });
});
