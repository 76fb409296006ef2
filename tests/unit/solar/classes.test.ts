import { describe, expect, it } from "vitest";

import {
  checkGroupClasses,
  explainMcIntoshClass,
  isValidMcIntoshClass,
  listValidCompactness,
  listValidMcIntoshClasses,
  listValidPenumbras,
  MCINTOSH_COMPACTNESS,
  MCINTOSH_PENUMBRA,
  MCINTOSH_ZURICH,
  ZURICH_CLASSES,
} from "@/lib/solar/classes";

describe("McIntosh classes (McIntosh 1990, Solar Physics 125, 251; rules recalled from memory)", () => {
  it("generates the 60 valid classes the paper lists", () => {
    // McIntosh 1990 states that 60 of the 7 × 6 × 4 = 168 letter triples are valid (from memory).
    const all = listValidMcIntoshClasses();
    expect(all).toHaveLength(60);
    expect(new Set(all).size).toBe(60);
  });

  it("matches the class list class by class", () => {
    // The list as it appears in flare-forecast tables keyed by McIntosh class (from memory).
    const expected = [
      "Axx",
      "Bxo",
      "Bxi",
      "Hrx",
      "Hsx",
      "Hax",
      "Hhx",
      "Hkx",
      "Cro",
      "Cri",
      "Cso",
      "Csi",
      "Cao",
      "Cai",
      "Cho",
      "Chi",
      "Cko",
      "Cki",
      ...["D", "E", "F"].flatMap((z) => [
        `${z}ro`,
        `${z}ri`,
        `${z}so`,
        `${z}si`,
        `${z}sc`,
        `${z}ao`,
        `${z}ai`,
        `${z}ac`,
        `${z}ho`,
        `${z}hi`,
        `${z}hc`,
        `${z}ko`,
        `${z}ki`,
        `${z}kc`,
      ]),
    ];
    expect(listValidMcIntoshClasses().sort()).toEqual(expected.sort());
  });

  it("gives A and B the penumbra x only, and every other class a real penumbra", () => {
    expect(listValidPenumbras({ zurich: "A" })).toEqual(["x"]);
    expect(listValidPenumbras({ zurich: "B" })).toEqual(["x"]);
    for (const zurich of ["C", "D", "E", "F", "H"] as const) {
      expect(listValidPenumbras({ zurich })).not.toContain("x");
    }
  });

  it("keeps compactness x for the unipolar classes A and H, and only for them", () => {
    expect(listValidCompactness({ zurich: "A", penumbra: "x" })).toEqual(["x"]);
    expect(listValidCompactness({ zurich: "H", penumbra: "s" })).toEqual(["x"]);
    for (const zurich of ["B", "C", "D", "E", "F"] as const) {
      for (const penumbra of MCINTOSH_PENUMBRA)
        expect(listValidCompactness({ zurich, penumbra })).not.toContain("x");
    }
  });

  it("allows compact (c) only for D, E, F with a penumbra better than rudimentary", () => {
    expect(listValidCompactness({ zurich: "B", penumbra: "x" })).toEqual(["o", "i"]);
    expect(listValidCompactness({ zurich: "C", penumbra: "k" })).toEqual(["o", "i"]);
    expect(listValidCompactness({ zurich: "D", penumbra: "r" })).toEqual(["o", "i"]);
    expect(listValidCompactness({ zurich: "E", penumbra: "a" })).toEqual(["o", "i", "c"]);
  });

  it("explains each kind of invalid class in words", () => {
    expect(explainMcIntoshClass("Axo")).toMatch(/unipolar.*third letter must be x/);
    expect(explainMcIntoshClass("Asx")).toMatch(/no penumbra.*second letter must be x/);
    expect(explainMcIntoshClass("Dxo")).toMatch(/cannot be x/);
    expect(explainMcIntoshClass("Hso")).toMatch(/unipolar/);
    expect(explainMcIntoshClass("Dsx")).toMatch(/only for unipolar/);
    expect(explainMcIntoshClass("Cac")).toMatch(/compact/);
    expect(explainMcIntoshClass("Erc")).toMatch(/rudimentary/);
    expect(explainMcIntoshClass("Gxx")).toMatch(/not a McIntosh class/);
    expect(explainMcIntoshClass("dai")).toMatch(/not a McIntosh class/);
    expect(explainMcIntoshClass("Da")).toMatch(/not a McIntosh class/);
    expect(explainMcIntoshClass("Dai")).toBeNull();
  });

  it("agrees with listValidMcIntoshClasses over every letter triple", () => {
    const valid = new Set(listValidMcIntoshClasses());
    for (const z of MCINTOSH_ZURICH)
      for (const p of MCINTOSH_PENUMBRA)
        for (const c of MCINTOSH_COMPACTNESS)
          expect(isValidMcIntoshClass(`${z}${p}${c}`)).toBe(valid.has(`${z}${p}${c}`));
  });
});

describe("Zurich classes (Waldmeier; from memory: nine classes, no I)", () => {
  it("has A to J without I", () => {
    expect(ZURICH_CLASSES).toEqual(["A", "B", "C", "D", "E", "F", "G", "H", "J"]);
  });
});

describe("checkGroupClasses", () => {
  it("accepts a group with no class yet", () => {
    expect(checkGroupClasses({ zurichClass: null, mcintoshClass: null, spotCount: 1 })).toEqual([]);
  });

  it("refuses a bipolar class on a single spot", () => {
    expect(checkGroupClasses({ zurichClass: "C", mcintoshClass: null, spotCount: 1 })[0]).toMatch(
      /at least two spots/,
    );
    expect(checkGroupClasses({ zurichClass: null, mcintoshClass: "Dai", spotCount: 1 })[0]).toMatch(
      /at least two spots/,
    );
    expect(checkGroupClasses({ zurichClass: "J", mcintoshClass: "Hsx", spotCount: 1 })).toEqual([]);
  });

  it("requires the McIntosh first letter to agree with the Zurich class (G → E/F, J → H)", () => {
    expect(checkGroupClasses({ zurichClass: "D", mcintoshClass: "Dai", spotCount: 4 })).toEqual([]);
    expect(checkGroupClasses({ zurichClass: "G", mcintoshClass: "Fkc", spotCount: 9 })).toEqual([]);
    expect(checkGroupClasses({ zurichClass: "C", mcintoshClass: "Dai", spotCount: 4 })[0]).toMatch(
      /does not match Zurich C/,
    );
  });

  it("refuses unknown classes with a clear message", () => {
    expect(checkGroupClasses({ zurichClass: "I", mcintoshClass: null, spotCount: 2 })[0]).toMatch(
      /not a Zurich class/,
    );
    expect(checkGroupClasses({ zurichClass: null, mcintoshClass: "Bxc", spotCount: 2 })[0]).toMatch(
      /compact/,
    );
  });
});
