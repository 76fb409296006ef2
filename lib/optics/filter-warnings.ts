import type { PlanWarning } from "./types";

/**
 * Direct viewing and imaging need a certified full-aperture filter. The
 * schema already insists on a filter name; the planner checks again because
 * it can be called with profiles stored before that rule, and because a
 * filter that screws into the eyepiece is a known way to get hurt (it sits
 * at the focus, heats up and can crack).
 */
export function describeFilterWarnings({ filter }: { filter: string }): PlanWarning[] {
  const text = filter.trim();
  if (text === "") {
    return [
      {
        code: "filter-not-named",
        message:
          "No solar filter is named. Never point a camera or telescope at the Sun without a certified full-aperture solar filter over the front.",
      },
    ];
  }
  if (/eye\s*-?piece/i.test(text)) {
    return [
      {
        code: "filter-at-eyepiece",
        message:
          "The filter is described as an eyepiece filter. Filters at the eyepiece sit in concentrated sunlight and can crack without warning; use only a certified filter over the front of the telescope.",
      },
    ];
  }
  return [];
}
