import { describe, expect, it } from "vitest";

import { instrumentListQuerySchema } from "@/lib/validation/instrument";
import { photoImageQuerySchema } from "@/lib/validation/photo";

describe("instrumentListQuerySchema", () => {
  it("leaves observerId out when it is missing or blank", () => {
    expect(instrumentListQuerySchema.parse({})).toEqual({ observerId: undefined });
    expect(instrumentListQuerySchema.parse({ observerId: "  " })).toEqual({ observerId: undefined });
  });

  it("keeps a named observer and refuses something that cannot be an id", () => {
    expect(instrumentListQuerySchema.parse({ observerId: " obs-1 " })).toEqual({ observerId: "obs-1" });
    const result = instrumentListQuerySchema.safeParse({ observerId: "x".repeat(65) });
    expect(result.error?.issues[0]?.message).toBe("That is not an observer id.");
  });
});

describe("photoImageQuerySchema", () => {
  it("answers the viewable copy unless asked otherwise", () => {
    expect(photoImageQuerySchema.parse({})).toEqual({ variant: "view" });
    expect(photoImageQuerySchema.parse({ variant: "thumbnail" })).toEqual({ variant: "thumbnail" });
  });

  it("names the variants it knows when given another", () => {
    const result = photoImageQuerySchema.safeParse({ variant: "large" });
    expect(result.error?.issues[0]?.message).toBe("variant is original, view or thumbnail.");
  });
});
