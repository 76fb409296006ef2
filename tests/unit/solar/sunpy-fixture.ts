/**
 * Typed access to the committed sunpy reference values
 * (tests/fixtures/solar/sunpy-orientation.json, made by make-solar-fixture.py
 * beside it with Debian's python3-sunpy 4.1.2). Read the script header for
 * exactly what sunpy computed.
 */
import raw from "@/tests/fixtures/solar/sunpy-orientation.json";

export type SunpyOrientationRow = {
  at: string;
  p: number;
  b0: number;
  l0: number;
  carringtonRotation: number;
  /** sunpy's angular radius, from the IAU 2015 radius 695 700 km (959.23″ at 1 au). */
  sunpySemidiameterArcsec: number;
  earthDistanceAu: number;
  /** TT − UTC that astropy used: 32.184 s before 1960, leap seconds from 1972. */
  ttMinusUtcSeconds: number;
};

export type SunpyPointRow = {
  at: string;
  x: number;
  y: number;
  lat: number;
  lon: number;
  carringtonLon: number;
};

export const sunpyFixture: {
  sunpyVersion: string;
  orientations: SunpyOrientationRow[];
  points: SunpyPointRow[];
} = raw;
