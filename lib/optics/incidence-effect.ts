/**
 * What turning a mirror does: the same set-up planned at a row of incidence
 * angles, so an observer can see how fast a glancing reflection costs
 * sharpness before moving the mirror.
 */

import { planMirror } from "./mirror";
import type { MirrorOptics, PlanOptions } from "./types";

export const INCIDENCE_STEPS_DEG = [0, 15, 30, 45, 60, 75] as const;

export interface IncidenceRow {
  incidenceAngleDeg: number;
  elongation: number;
  /** Worse-axis combined blur, as a fraction of the disk. */
  combinedBlurFraction: number;
  /** Along-plane blur as it lands on a card parallel to the mirror, in mm. */
  blurOnCardMm: number;
  ghostRelativeBrightness: number | null;
  isCurrent: boolean;
}

export function describeIncidenceEffect({
  instrument,
  options,
  anglesDeg = INCIDENCE_STEPS_DEG,
}: {
  instrument: MirrorOptics;
  options?: PlanOptions;
  anglesDeg?: readonly number[];
}): IncidenceRow[] {
  const angles = [...new Set([...anglesDeg, instrument.incidenceAngleDeg])].sort((a, b) => a - b);
  return angles.map((incidenceAngleDeg) => {
    const plan = planMirror({ instrument: { ...instrument, incidenceAngleDeg }, options });
    return {
      incidenceAngleDeg,
      elongation: plan.elongation,
      combinedBlurFraction: plan.combinedBlur.fractionOfDisk,
      blurOnCardMm: plan.alongPlane.blurOnCardMm,
      ghostRelativeBrightness: plan.ghost?.relativeBrightness ?? null,
      isCurrent: incidenceAngleDeg === instrument.incidenceAngleDeg,
    };
  });
}
