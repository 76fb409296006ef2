/**
 * Sunspot group classes: the Zurich classes and the McIntosh three-letter
 * classes, with the rules for which combinations exist.
 *
 * Sources (all from memory, not checked against the papers here):
 * - Zurich classes: M. Waldmeier's classification (1938, 1955): nine classes
 *   A B C D E F G H J. There is no class I, so that it cannot be confused
 *   with J.
 * - McIntosh classes: P. S. McIntosh 1990, "The classification of sunspot
 *   groups", Solar Physics 125, 251–267. Three letters: the modified Zurich
 *   class (A B C D E F H: Waldmeier's G folded into E/F and J into H), the
 *   penumbra of the largest spot (x r s a h k) and the distribution of spots
 *   inside the group (x o i c). The paper lists 60 valid classes; the rules
 *   below generate exactly those 60 (checked by a unit test that counts them).
 *
 * Rules, with the reason each follows from the definitions:
 * 1. A and B have no penumbra anywhere, so their penumbra letter is x; every
 *    other class has penumbra on some spot, so its penumbra letter is not x.
 * 2. Compactness x ("undefined") belongs to unipolar groups, A and H, and
 *    only to them: a unipolar group has no interior between two ends.
 * 3. Compactness c (compact: many strong spots between leader and follower,
 *    at least one interior spot with penumbra) needs penumbra on interior
 *    spots, so it is impossible for B (no penumbra) and C (penumbra at one
 *    end only), and impossible when the largest spot's penumbra is only
 *    rudimentary (r): an interior penumbral spot would then be the largest.
 * 4. Bipolar classes (Zurich B–G, McIntosh B–F) need at least two spots.
 */

export const ZURICH_CLASSES = ["A", "B", "C", "D", "E", "F", "G", "H", "J"] as const;
export type ZurichClass = (typeof ZURICH_CLASSES)[number];

export const MCINTOSH_ZURICH = ["A", "B", "C", "D", "E", "F", "H"] as const;
export type McIntoshZurich = (typeof MCINTOSH_ZURICH)[number];
export const MCINTOSH_PENUMBRA = ["x", "r", "s", "a", "h", "k"] as const;
export type McIntoshPenumbra = (typeof MCINTOSH_PENUMBRA)[number];
export const MCINTOSH_COMPACTNESS = ["x", "o", "i", "c"] as const;
export type McIntoshCompactness = (typeof MCINTOSH_COMPACTNESS)[number];

export const ZURICH_DESCRIPTIONS: Record<ZurichClass, string> = {
  A: "A single spot or a small unipolar cluster, no penumbra",
  B: "Bipolar, no penumbra",
  C: "Bipolar, penumbra on one end",
  D: "Bipolar, penumbra on both ends, under 10° long",
  E: "Large bipolar, penumbra on both ends, 10°–15° long",
  F: "Very large bipolar, over 15° long",
  G: "Large bipolar, only the big spots left, over 10° long",
  H: "Unipolar with penumbra, over 2.5° across",
  J: "Unipolar with penumbra, under 2.5° across",
};

export const MCINTOSH_ZURICH_DESCRIPTIONS: Record<McIntoshZurich, string> = {
  A: "Unipolar, no penumbra",
  B: "Bipolar, no penumbra",
  C: "Bipolar, penumbra on one end",
  D: "Bipolar, penumbra on both ends, up to 10° long",
  E: "Bipolar, penumbra on both ends, 10°–15° long",
  F: "Bipolar, penumbra on both ends, over 15° long",
  H: "Unipolar with penumbra",
};

export const MCINTOSH_PENUMBRA_DESCRIPTIONS: Record<McIntoshPenumbra, string> = {
  x: "No penumbra",
  r: "Rudimentary",
  s: "Small, symmetric",
  a: "Small, asymmetric",
  h: "Large, symmetric (over 2.5° north–south)",
  k: "Large, asymmetric (over 2.5° north–south)",
};

export const MCINTOSH_COMPACTNESS_DESCRIPTIONS: Record<McIntoshCompactness, string> = {
  x: "Undefined (unipolar)",
  o: "Open: few or no spots between the ends",
  i: "Intermediate: some spots between, none with penumbra",
  c: "Compact: many spots between, at least one with penumbra",
};

const UNIPOLAR_MCINTOSH = new Set<McIntoshZurich>(["A", "H"]);
const UNIPOLAR_ZURICH = new Set<ZurichClass>(["A", "H", "J"]);

/** Valid penumbra letters for a modified Zurich class (rule 1). */
export function listValidPenumbras({ zurich }: { zurich: McIntoshZurich }): McIntoshPenumbra[] {
  return zurich === "A" || zurich === "B" ? ["x"] : ["r", "s", "a", "h", "k"];
}

/** Valid compactness letters for a class and penumbra (rules 2 and 3). */
export function listValidCompactness({
  zurich,
  penumbra,
}: {
  zurich: McIntoshZurich;
  penumbra: McIntoshPenumbra;
}): McIntoshCompactness[] {
  if (!listValidPenumbras({ zurich }).includes(penumbra)) return [];
  if (UNIPOLAR_MCINTOSH.has(zurich)) return ["x"];
  if (zurich === "B" || zurich === "C" || penumbra === "r") return ["o", "i"];
  return ["o", "i", "c"];
}

/** Every valid McIntosh class, e.g. "Axx", "Dkc" (McIntosh 1990 lists 60). */
export function listValidMcIntoshClasses(): string[] {
  const out: string[] = [];
  for (const zurich of MCINTOSH_ZURICH) {
    for (const penumbra of listValidPenumbras({ zurich })) {
      for (const compactness of listValidCompactness({ zurich, penumbra }))
        out.push(`${zurich}${penumbra}${compactness}`);
    }
  }
  return out;
}

export type ParsedMcIntosh = {
  zurich: McIntoshZurich;
  penumbra: McIntoshPenumbra;
  compactness: McIntoshCompactness;
};

/** Splits "Dai" into its letters; case matters (upper, lower, lower), as the class is written. */
export function parseMcIntoshClass(text: string): ParsedMcIntosh | null {
  if (text.length !== 3) return null;
  const [z, p, c] = text as unknown as [string, string, string];
  if (!(MCINTOSH_ZURICH as readonly string[]).includes(z)) return null;
  if (!(MCINTOSH_PENUMBRA as readonly string[]).includes(p)) return null;
  if (!(MCINTOSH_COMPACTNESS as readonly string[]).includes(c)) return null;
  return {
    zurich: z as McIntoshZurich,
    penumbra: p as McIntoshPenumbra,
    compactness: c as McIntoshCompactness,
  };
}

/** Why a McIntosh class is not valid, or null when it is. */
export function explainMcIntoshClass(text: string): string | null {
  const parsed = parseMcIntoshClass(text);
  if (!parsed) {
    return `"${text}" is not a McIntosh class: write three letters, the class (A B C D E F H), the penumbra (x r s a h k) and the compactness (x o i c), e.g. Dai.`;
  }
  const { zurich, penumbra, compactness } = parsed;
  const penumbras = listValidPenumbras({ zurich });
  if (!penumbras.includes(penumbra)) {
    return zurich === "A" || zurich === "B"
      ? `${zurich} groups have no penumbra, so the second letter must be x (${zurich}x…).`
      : `${zurich} groups have penumbra, so the second letter cannot be x: choose r, s, a, h or k.`;
  }
  const compacts = listValidCompactness({ zurich, penumbra });
  if (!compacts.includes(compactness)) {
    if (UNIPOLAR_MCINTOSH.has(zurich))
      return `${zurich} groups are unipolar, so the third letter must be x (${zurich}${penumbra}x).`;
    if (compactness === "x")
      return `Compactness x is only for unipolar groups (A, H); a ${zurich} group is o, i${compacts.includes("c") ? " or c" : ""}.`;
    if (zurich === "B" || zurich === "C")
      return `A compact (c) group needs penumbral spots between its ends, which a ${zurich} group does not have: use o or i.`;
    return "A compact (c) group has a penumbral spot inside it, so its largest spot cannot have a merely rudimentary (r) penumbra: use o or i.";
  }
  return null;
}

export function isValidMcIntoshClass(text: string): boolean {
  return explainMcIntoshClass(text) === null;
}

export function isZurichClass(text: string): text is ZurichClass {
  return (ZURICH_CLASSES as readonly string[]).includes(text);
}

/**
 * The McIntosh first letters that agree with a Zurich class: the modified
 * Zurich class keeps A–F and H, sends G to E or F (by length) and J to H.
 */
export function listMcIntoshLettersForZurich({ zurich }: { zurich: ZurichClass }): McIntoshZurich[] {
  if (zurich === "G") return ["E", "F"];
  if (zurich === "J") return ["H"];
  return [zurich];
}

/**
 * Problems with a group's classes, given how many spots it has. Both classes
 * are optional; when both are given they must agree.
 */
export function checkGroupClasses({
  zurichClass,
  mcintoshClass,
  spotCount,
}: {
  zurichClass: string | null;
  mcintoshClass: string | null;
  spotCount: number;
}): string[] {
  const problems: string[] = [];
  if (zurichClass !== null) {
    if (!isZurichClass(zurichClass)) {
      problems.push(`"${zurichClass}" is not a Zurich class: choose one of ${ZURICH_CLASSES.join(", ")}.`);
    } else if (!UNIPOLAR_ZURICH.has(zurichClass) && spotCount < 2) {
      problems.push(
        `Zurich class ${zurichClass} is bipolar and needs at least two spots; this group has ${spotCount}.`,
      );
    }
  }
  if (mcintoshClass !== null) {
    const why = explainMcIntoshClass(mcintoshClass);
    if (why) problems.push(why);
    else {
      const zurich = mcintoshClass.charAt(0) as McIntoshZurich;
      if (!UNIPOLAR_MCINTOSH.has(zurich) && spotCount < 2) {
        problems.push(
          `McIntosh class ${mcintoshClass} is bipolar and needs at least two spots; this group has ${spotCount}.`,
        );
      }
      if (zurichClass !== null && isZurichClass(zurichClass)) {
        const agreeing = listMcIntoshLettersForZurich({ zurich: zurichClass });
        if (!agreeing.includes(zurich)) {
          problems.push(
            `McIntosh ${mcintoshClass} does not match Zurich ${zurichClass}: its first letter should be ${agreeing.join(" or ")}.`,
          );
        }
      }
    }
  }
  return problems;
}
