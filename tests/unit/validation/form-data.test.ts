import { describe, expect, it } from "vitest";

import { formFields } from "@/lib/validation/form-data";

describe("formFields", () => {
  it("drops the hidden inputs React adds to server-action forms", () => {
    const form = new FormData();
    form.set("$ACTION_REF_1", "");
    form.set("$ACTION_1:0", "{}");
    form.set("$ACTION_KEY", "k0");
    form.set("email", "a@example.test");
    expect(formFields(form)).toEqual({ email: "a@example.test" });
  });
});
