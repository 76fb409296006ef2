import { describe, expect, it } from "vitest";

import { makeObserverCode, OBSERVER_CODE_PATTERN } from "@/lib/observers/observer-code";

describe("observer codes", () => {
  it("have our own format and avoid look-alike characters", () => {
    for (let i = 0; i < 200; i++) {
      const code = makeObserverCode();
      expect(code).toMatch(OBSERVER_CODE_PATTERN);
      expect(code.slice(3)).not.toMatch(/[01OILSZB8UV25]/);
    }
  });
});
