/**
 * How the planner prints its numbers. Two or three figures throughout: the
 * inputs (a hand-drilled hole, a paced-out throw) are known no better.
 */

import type { Blur } from "./types";
import { formatLength, type UnitSystem } from "./units";

export function formatArcsec({ arcsec }: { arcsec: number }): string {
  if (arcsec >= 60) {
    const minutes = Math.floor(arcsec / 60);
    const seconds = Math.round(arcsec - minutes * 60);
    return seconds === 60 ? `${minutes + 1}′ 0″` : `${minutes}′ ${seconds}″`;
  }
  return `${arcsec < 10 ? arcsec.toFixed(1) : Math.round(arcsec)}″`;
}

/** 0.0654 → "6.5 %"; 0.0012 → "0.12 %". */
export function formatFraction({ fraction }: { fraction: number }): string {
  const percent = fraction * 100;
  return `${percent < 1 ? percent.toFixed(2) : percent.toFixed(1)} %`;
}

export function formatBlur({ blur }: { blur: Blur }): string {
  // Telescopes in focus have no geometric blur at all; "0.0″" would read as a rounding.
  if (blur.arcsec === 0) return "none (in focus)";
  return `${formatArcsec({ arcsec: blur.arcsec })} · ${formatFraction({ fraction: blur.fractionOfDisk })} of the disk`;
}

/** Kilometres on the Sun, to the nearest 100 km (a spot's size is no better known). */
export function formatKm({ km }: { km: number }): string {
  return `${(Math.round(km / 100) * 100).toLocaleString("en")} km`;
}

const NUMBER_WITH_UNIT = /(\d+(?:\.\d+)?) (mm|m)(?![A-Za-z²])/g;

/**
 * The planner's warnings quote lengths in mm and m; an imperial observer
 * reads them in inches and feet like the rest of the page. Kilometres on
 * the Sun and arcseconds are left as they are.
 */
export function localisePlanMessage({
  message,
  unitSystem,
}: {
  message: string;
  unitSystem: UnitSystem;
}): string {
  if (unitSystem === "metric") return message;
  return message.replace(NUMBER_WITH_UNIT, (_, number: string, unit: "mm" | "m") => {
    const valueMm = Number(number) * (unit === "m" ? 1000 : 1);
    return formatLength({ valueMm, unitSystem, significantDigits: 3 });
  });
}
