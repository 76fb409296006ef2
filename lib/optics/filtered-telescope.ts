/**
 * Direct viewing through a telescope with a certified full-aperture solar
 * filter. The eye at the eyepiece is the detector: the disk looks
 * magnification × its true size, and the eye's ~1′ acuity, divided by the
 * magnification, is the finest detail it can take in.
 */

import {
  assessBlur,
  DEFAULT_WAVELENGTH_NM,
  diffractionBlurArcsec,
  EYE_ACUITY_ARCMIN,
  radiansToArcsec,
  requirePositive,
  resolvePlanContext,
} from "./blur";
import { describeFilterWarnings } from "./filter-warnings";
import type { FilteredTelescopePlan, FilteredTelescopeOptics, PlanOptions, PlanWarning } from "./types";

/**
 * Dawes' limit: 116″ / D(mm) (from 4.56″ / D(in); W. R. Dawes 1867,
 * Memoirs of the Royal Astronomical Society 35, from memory). Empirical,
 * found with the eye on equal double stars.
 */
export const DAWES_ARCSEC_MM = 116;

/**
 * Common rule of thumb (no published source): beyond about 2× per mm of
 * aperture the image only gets bigger, not sharper.
 */
export const MAX_USEFUL_MAGNIFICATION_PER_MM = 2;

export function dawesLimitArcsec({ apertureMm }: { apertureMm: number }): number {
  requirePositive({ value: apertureMm, name: "apertureMm" });
  return DAWES_ARCSEC_MM / apertureMm;
}

/**
 * Rayleigh's criterion, 1.22 λ / D (Lord Rayleigh 1879, Phil. Mag.): about
 * 138″ / D(mm) at 550 nm.
 */
export function rayleighLimitArcsec({
  apertureMm,
  wavelengthNm = DEFAULT_WAVELENGTH_NM,
}: {
  apertureMm: number;
  wavelengthNm?: number;
}): number {
  requirePositive({ value: apertureMm, name: "apertureMm" });
  return radiansToArcsec({ radians: (1.22 * wavelengthNm * 1e-6) / apertureMm });
}

export function planFilteredTelescope({
  instrument,
  options,
}: {
  instrument: FilteredTelescopeOptics;
  options?: PlanOptions;
}): FilteredTelescopePlan {
  const { apertureMm, magnification, filter } = instrument;
  requirePositive({ value: apertureMm, name: "apertureMm" });
  requirePositive({ value: magnification, name: "magnification" });
  const context = resolvePlanContext({ options });

  const base = assessBlur({
    context,
    geometricArcsec: 0,
    diffractionArcsec: diffractionBlurArcsec({ apertureMm, wavelengthNm: context.wavelengthNm }),
    eyeLimitArcsec: (EYE_ACUITY_ARCMIN * 60) / magnification,
  });

  const warnings: PlanWarning[] = [...base.warnings, ...describeFilterWarnings({ filter })];
  if (magnification > MAX_USEFUL_MAGNIFICATION_PER_MM * apertureMm) {
    warnings.push({
      code: "magnification-over-useful",
      message: `${Math.round(magnification)}× is more than this aperture can use (about ${Math.round(MAX_USEFUL_MAGNIFICATION_PER_MM * apertureMm)}×); a lower power will look sharper and show the whole disk.`,
    });
  }

  return {
    kind: "filtered-telescope",
    ...base,
    apparentDiskDiameterDeg: (magnification * context.sun.diameterArcsec) / 3600,
    dawesLimitArcsec: dawesLimitArcsec({ apertureMm }),
    rayleighLimitArcsec: rayleighLimitArcsec({ apertureMm, wavelengthNm: context.wavelengthNm }),
    warnings,
  };
}
