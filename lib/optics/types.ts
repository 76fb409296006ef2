/**
 * Shapes shared by the projection planner. The instrument types are the
 * optical fields only, so a profile parsed by instrumentInputSchema (which
 * also carries name, notes and unit system) can be passed straight in.
 * All lengths are millimetres.
 */

export interface PinholeOptics {
  kind: "pinhole";
  holeDiameterMm: number;
  /** Hole to screen. */
  boxLengthMm: number;
}

export interface MirrorOptics {
  kind: "mirror";
  /** Largest dimension of the mirror; it is the aperture when there is no mask. */
  mirrorSizeMm: number;
  maskDiameterMm?: number;
  /** Mirror to card. */
  throwDistanceMm: number;
  /** Angle between the sunlight and the mirror's normal. */
  incidenceAngleDeg: number;
  /** "first": coating on the front (no ghost); "second": ordinary glass mirror. */
  surface: "first" | "second";
}

export interface EyepieceProjectionOptics {
  kind: "eyepiece-projection";
  apertureMm: number;
  focalLengthMm: number;
  eyepieceFocalLengthMm: number;
  eyepieceToScreenMm: number;
}

export interface CameraOptics {
  kind: "camera";
  focalLengthMm: number;
  pixelSizeUm: number;
  filter: string;
  /** Optional: without it the diffraction blur cannot be estimated. */
  apertureMm?: number;
}

export interface FilteredTelescopeOptics {
  kind: "filtered-telescope";
  apertureMm: number;
  magnification: number;
  filter: string;
}

export type InstrumentOptics =
  PinholeOptics | MirrorOptics | EyepieceProjectionOptics | CameraOptics | FilteredTelescopeOptics;

export type InstrumentKind = InstrumentOptics["kind"];

export const INSTRUMENT_KINDS = [
  "pinhole",
  "mirror",
  "eyepiece-projection",
  "camera",
  "filtered-telescope",
] as const satisfies readonly InstrumentKind[];

export interface PlanOptions {
  /** Date of observation; sets the Sun's size through the Earth–Sun distance. */
  at?: Date;
  /** Precise value from the ephemeris; wins over `at`. */
  semidiameterArcsec?: number;
  /** Defaults to 550 nm, where the eye is most sensitive. */
  wavelengthNm?: number;
  /** Atmospheric blur; defaults to DEFAULT_SEEING_ARCSEC. */
  seeingArcsec?: number;
  /** Mirror planning: blur, as a fraction of the disk, the suggested mask aims for. */
  targetBlurFraction?: number;
  /** Second-surface mirrors: glass thickness used for the ghost offset. */
  mirrorGlassThicknessMm?: number;
}

/** A blur expressed both ways observers think about it. */
export interface Blur {
  arcsec: number;
  /** Blur width over the Sun's apparent diameter (0.05 = 5 % of the disk). */
  fractionOfDisk: number;
}

export interface SmallestSpot {
  arcsec: number;
  /** Size on the Sun for the day's distance. */
  km: number;
  /** What sets the limit: the optics' blur, the eye reading the card or eyepiece, or the camera's pixels. */
  limitedBy: "blur" | "eye" | "pixels";
}

export type PlanWarningCode =
  | "blur-hides-small-groups"
  | "blur-hides-most-spots"
  | "disk-too-small-for-eye"
  | "pinhole-over-one-percent"
  | "pinhole-larger-than-best"
  | "pinhole-smaller-than-best"
  | "mask-larger-than-mirror"
  | "throw-too-short-for-aperture"
  | "glancing-incidence"
  | "second-surface-ghost"
  | "aperture-heats-eyepiece"
  | "pixels-limit-detail"
  | "filter-not-named"
  | "filter-at-eyepiece"
  | "magnification-over-useful";

export interface PlanWarning {
  code: PlanWarningCode;
  message: string;
}

export interface PlanBase {
  sunDiameterArcsec: number;
  kmPerArcsec: number;
  wavelengthNm: number;
  geometricBlur: Blur;
  diffractionBlur: Blur | null;
  seeingBlur: Blur;
  /** Root-sum-square of the blurs above: an approximation, see blur.ts. */
  combinedBlur: Blur;
  smallestSpot: SmallestSpot;
  warnings: PlanWarning[];
}

export interface PinholePlan extends PlanBase {
  kind: "pinhole";
  diskDiameterMm: number;
  bestHoleDiameterMm: number;
  /** Present hole over Rayleigh's best; 1 is ideal. */
  holeToBestRatio: number;
  holeFractionOfBoxLength: number;
}

export interface MirrorAxisBlur {
  geometricBlur: Blur;
  diffractionBlur: Blur;
  combinedBlur: Blur;
  /** Width of the combined blur as it lands on the card. */
  blurOnCardMm: number;
}

/** The base blur figures (geometricBlur, diffractionBlur, combinedBlur) are those of the worse axis. */
export interface MirrorPlan extends PlanBase {
  kind: "mirror";
  /** The mask if there is one (capped at the mirror), else the mirror. */
  apertureMm: number;
  /** Across the plane of incidence: the true round size. */
  diskDiameterMm: number;
  /** Along the plane of incidence, stretched by `elongation`. */
  diskLengthAlongPlaneMm: number;
  /** 1 / cos(incidence). */
  elongation: number;
  acrossPlane: MirrorAxisBlur;
  alongPlane: MirrorAxisBlur;
  /** Second-surface mirrors only. */
  ghost: { offsetMm: number; relativeBrightness: number } | null;
  targetBlurFraction: number;
  /** Largest mask that keeps the blur within the target at this throw; null if none can. */
  maskForTargetBlurMm: number | null;
  /** Throw at which the present aperture meets the target; null if diffraction alone exceeds it. */
  throwForTargetBlurMm: number | null;
}

export interface EyepieceProjectionPlan extends PlanBase {
  kind: "eyepiece-projection";
  projectionMagnification: number;
  effectiveFocalLengthMm: number;
  primeFocusDiskDiameterMm: number;
  diskDiameterMm: number;
}

export interface CameraPlan extends PlanBase {
  kind: "camera";
  diskDiameterOnSensorMm: number;
  diskDiameterPx: number;
  pixelScaleArcsec: number;
}

export interface FilteredTelescopePlan extends PlanBase {
  kind: "filtered-telescope";
  /** How wide the disk looks in the eyepiece. */
  apparentDiskDiameterDeg: number;
  /** Dawes' empirical limit, 116″ / D(mm). */
  dawesLimitArcsec: number;
  /** Rayleigh's criterion 1.22 λ / D (138″ / D(mm) at 550 nm). */
  rayleighLimitArcsec: number;
}

export type ProjectionPlan =
  PinholePlan | MirrorPlan | EyepieceProjectionPlan | CameraPlan | FilteredTelescopePlan;
