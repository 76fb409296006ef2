import { describe, expect, it } from "vitest";

import { credentialsSchema, signUpSchema } from "@/lib/validation/account";

describe("account schemas", () => {
  it("normalises e-mail addresses", () => {
    expect(credentialsSchema.parse({ email: "  Wren@Example.TEST ", password: "x" }).email).toBe(
      "wren@example.test",
    );
  });

  const ok = {
    name: "Wren",
    email: "wren@example.test",
    password: "long enough pw",
    confirmPassword: "long enough pw",
    country: "gb",
    timeZone: "Europe/London",
  };

  it("accepts a complete sign-up and upper-cases the country", () => {
    expect(signUpSchema.parse(ok).country).toBe("GB");
  });

  it.each([
    [{ email: "not-an-address" }, "email"],
    [{ password: "short", confirmPassword: "short" }, "password"],
    [{ confirmPassword: "different one" }, "confirmPassword"],
    [{ country: "GBR" }, "country"],
    [{ timeZone: "Mars/Olympus" }, "timeZone"],
    [{ name: "W" }, "name"],
  ])("refuses %o", (patch, path) => {
    const result = signUpSchema.safeParse({ ...ok, ...patch });
    expect(result.success).toBe(false);
    expect(result.error?.issues.map((i) => i.path.join("."))).toContain(path);
  });
});
