import { describe, expect, it } from "vitest";
import { z } from "zod";

import { fieldErrorsFromIssues, fieldErrorsFromZod } from "@/lib/validation/form-state";

describe("fieldErrorsFromIssues", () => {
  it("keeps the first message of each field, from zod's issues or an API's", () => {
    const schema = z.object({
      groups: z.number().int().min(0),
      hemisphere: z.object({ north: z.number().min(0) }),
    });
    const parsed = schema.safeParse({ groups: -1.5, hemisphere: { north: -2 } });
    expect(parsed.success).toBe(false);
    const fromZod = fieldErrorsFromZod(parsed.error!);
    expect(Object.keys(fromZod).sort()).toEqual(["groups", "hemisphere.north"]);
    // Two issues on "groups" (not whole, below 0): the first one stands.
    expect(fromZod.groups).toBe(parsed.error!.issues.find((i) => i.path[0] === "groups")!.message);

    // An API answers with dotted paths as text, and "" for the whole form.
    expect(
      fieldErrorsFromIssues([
        { path: "hemisphere.north", message: "Too few" },
        { path: "hemisphere.north", message: "Ignored" },
        { path: "", message: "Something else went wrong" },
        { path: ["spots"], message: "Needs a number" },
      ]),
    ).toEqual({
      "hemisphere.north": "Too few",
      _form: "Something else went wrong",
      spots: "Needs a number",
    });
  });
});
