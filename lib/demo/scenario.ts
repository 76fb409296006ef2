/**
 * The demo scenario: an invented amateur network, the Larkfield Solar Circle.
 * Every name, count and coefficient here is made up for demonstration and is
 * labelled as demo data wherever it is shown. Nothing here is a measurement.
 */
import type { InstrumentKind } from "@/db/schema";

import { makeRandom, type Random } from "./random";

export const DEMO_SEED = 20261202;
export const DEMO_PASSWORD = "heliotally-demo";
export const DEMO_NETWORK_NAME = "Larkfield Solar Circle";
/** Three years of daily counts, ending on a fixed day so the demo is the same everywhere. */
export const DEMO_FIRST_DAY = "2023-12-01";
export const DEMO_LAST_DAY = "2026-11-30";
/** Observations from the last days are left for the coordinator to review. */
const PENDING_DAYS = 12;

export type DemoInstrument = { name: string; kind: InstrumentKind; params: Record<string, number | string> };

export type DemoObserver = {
  key: string;
  email: string;
  displayName: string;
  country: string;
  timeZone: string;
  /** The invented personal coefficient the counts were generated with. */
  trueK: number;
  /** Mean spots the observer resolves per group (better optics, more spots). */
  spotsPerGroup: number;
  clearSkyChance: number;
  splitsHemispheres: boolean;
  localHourUt: number;
  instrument: DemoInstrument;
};

// Invented people. Any resemblance to real observers is accidental.
const OBSERVERS: Array<Omit<DemoObserver, "trueK" | "spotsPerGroup" | "clearSkyChance" | "localHourUt">> = [
  {
    key: "wren",
    email: "observer@example.test",
    displayName: "Wren Halloway",
    country: "GB",
    timeZone: "Europe/London",
    splitsHemispheres: true,
    instrument: {
      name: "80 mm refractor, projection",
      kind: "eyepiece-projection",
      params: { apertureMm: 80, focalLengthMm: 900, eyepieceFocalLengthMm: 25, eyepieceToScreenMm: 300 },
    },
  },
  {
    key: "tamsin",
    email: "tamsin.orr@example.test",
    displayName: "Tamsin Orr",
    country: "IE",
    timeZone: "Europe/Dublin",
    splitsHemispheres: false,
    instrument: {
      name: "Garden pinhole box",
      kind: "pinhole",
      params: { holeDiameterMm: 1.4, boxLengthMm: 1800 },
    },
  },
  {
    key: "jurgen",
    email: "jurgen.vell@example.test",
    displayName: "Jurgen Vell",
    country: "DE",
    timeZone: "Europe/Berlin",
    splitsHemispheres: true,
    instrument: {
      name: "102 mm refractor, projection",
      kind: "eyepiece-projection",
      params: { apertureMm: 102, focalLengthMm: 1000, eyepieceFocalLengthMm: 20, eyepieceToScreenMm: 350 },
    },
  },
  {
    key: "marit",
    email: "marit.sande@example.test",
    displayName: "Marit Sande",
    country: "NO",
    timeZone: "Europe/Oslo",
    splitsHemispheres: false,
    instrument: {
      name: "Hallway mirror",
      kind: "mirror",
      params: {
        mirrorSizeMm: 50,
        maskDiameterMm: 6,
        throwDistanceMm: 11000,
        incidenceAngleDeg: 20,
        surface: "first",
      },
    },
  },
  {
    key: "pieter",
    email: "pieter.quaade@example.test",
    displayName: "Pieter Quaade",
    country: "NL",
    timeZone: "Europe/Amsterdam",
    splitsHemispheres: true,
    instrument: {
      name: "70 mm refractor, projection",
      kind: "eyepiece-projection",
      params: { apertureMm: 70, focalLengthMm: 700, eyepieceFocalLengthMm: 25, eyepieceToScreenMm: 250 },
    },
  },
  {
    key: "lucia",
    email: "lucia.ferreol@example.test",
    displayName: "Lucia Ferreol",
    country: "ES",
    timeZone: "Europe/Madrid",
    splitsHemispheres: true,
    instrument: {
      name: "Filtered 90 mm Maksutov",
      kind: "filtered-telescope",
      params: { apertureMm: 90, magnification: 50, filter: "full-aperture film" },
    },
  },
  {
    key: "tiago",
    email: "tiago.brum@example.test",
    displayName: "Tiago Brum",
    country: "PT",
    timeZone: "Europe/Lisbon",
    splitsHemispheres: false,
    instrument: {
      name: "Shoebox pinhole",
      kind: "pinhole",
      params: { holeDiameterMm: 0.8, boxLengthMm: 600 },
    },
  },
  {
    key: "oriana",
    email: "oriana.vesco@example.test",
    displayName: "Oriana Vesco",
    country: "IT",
    timeZone: "Europe/Rome",
    splitsHemispheres: true,
    instrument: {
      name: "60 mm refractor, projection",
      kind: "eyepiece-projection",
      params: { apertureMm: 60, focalLengthMm: 700, eyepieceFocalLengthMm: 20, eyepieceToScreenMm: 200 },
    },
  },
  {
    key: "declan",
    email: "declan.mirrow@example.test",
    displayName: "Declan Mirrow",
    country: "CA",
    timeZone: "America/Toronto",
    splitsHemispheres: false,
    instrument: {
      name: "Barn mirror",
      kind: "mirror",
      params: {
        mirrorSizeMm: 75,
        maskDiameterMm: 13,
        throwDistanceMm: 19500,
        incidenceAngleDeg: 30,
        surface: "second",
      },
    },
  },
  {
    key: "hollis",
    email: "hollis.grange@example.test",
    displayName: "Hollis Grange",
    country: "US",
    timeZone: "America/Denver",
    splitsHemispheres: true,
    instrument: {
      name: "Filtered 127 mm refractor",
      kind: "filtered-telescope",
      params: { apertureMm: 127, magnification: 80, filter: "full-aperture glass" },
    },
  },
  {
    key: "amaru",
    email: "amaru.tello@example.test",
    displayName: "Amaru Tello",
    country: "PE",
    timeZone: "America/Lima",
    splitsHemispheres: false,
    instrument: {
      name: "Filtered camera",
      kind: "camera",
      params: { focalLengthMm: 600, pixelSizeUm: 3.76, filter: "white-light film" },
    },
  },
  {
    key: "nomvula",
    email: "nomvula.dlamane@example.test",
    displayName: "Nomvula Dlamane",
    country: "ZA",
    timeZone: "Africa/Johannesburg",
    splitsHemispheres: true,
    instrument: {
      name: "80 mm refractor, projection",
      kind: "eyepiece-projection",
      params: { apertureMm: 80, focalLengthMm: 400, eyepieceFocalLengthMm: 12, eyepieceToScreenMm: 200 },
    },
  },
  {
    key: "keiko",
    email: "keiko.aramune@example.test",
    displayName: "Keiko Aramune",
    country: "JP",
    timeZone: "Asia/Tokyo",
    splitsHemispheres: true,
    instrument: {
      name: "Filtered 100 mm refractor",
      kind: "filtered-telescope",
      params: { apertureMm: 100, magnification: 60, filter: "full-aperture glass" },
    },
  },
  {
    key: "rangi",
    email: "rangi.tawhero@example.test",
    displayName: "Rangi Tawhero",
    country: "NZ",
    timeZone: "Pacific/Auckland",
    splitsHemispheres: false,
    instrument: {
      name: "Veranda pinhole",
      kind: "pinhole",
      params: { holeDiameterMm: 1.0, boxLengthMm: 1000 },
    },
  },
];

export type DemoStudent = { key: string; displayName: string; trueK: number; pin: string };

export const DEMO_STAFF = {
  coordinator: { email: "coordinator@example.test", name: "Ines Calloway (demo coordinator)" },
  educator: { email: "educator@example.test", name: "Mr Oduya (demo educator)" },
  admin: { email: "admin@example.test", name: "Demo admin" },
} as const;

export const DEMO_CLASSROOM = {
  name: "Year 8 science club",
  school: "Harbour Lane School",
  joinCode: "SUN-HLS8",
  termStart: "2026-09-07",
  termEnd: "2026-12-18",
  instrument: {
    name: "Class pinhole box",
    kind: "pinhole",
    params: { holeDiameterMm: 1.2, boxLengthMm: 1500 },
  } satisfies DemoInstrument,
};

export type DemoObservation = {
  observerKey: string;
  utDate: string;
  observedAt: Date;
  seeing: number;
  groups: number;
  spots: number;
  northGroups: number | null;
  northSpots: number | null;
  southGroups: number | null;
  southSpots: number | null;
  notes: string | null;
  status: "submitted" | "accepted";
  source: "demo";
};

export type DemoScenario = {
  observers: DemoObserver[];
  students: DemoStudent[];
  observations: DemoObservation[];
  classSessions: string[];
  /** The invented "true" daily activity the counts were drawn from (raw 10g+s at k = 1). */
  activity: Map<string, number>;
};

const DAY_MS = 86_400_000;

export function listDays(first: string, last: string): string[] {
  const days: string[] = [];
  for (let t = Date.parse(`${first}T00:00:00Z`); t <= Date.parse(`${last}T00:00:00Z`); t += DAY_MS) {
    days.push(new Date(t).toISOString().slice(0, 10));
  }
  return days;
}

/**
 * A smooth invented activity curve: a slow rise and decline (a made-up cycle
 * maximum in the middle of the demo period), a 27-day rotational modulation
 * as active regions come round, and a little day-to-day wander.
 */
export function inventedActivity(dayIndex: number, totalDays: number): number {
  const phase = dayIndex / totalDays;
  const cycle = 70 + 110 * Math.exp(-((phase - 0.45) ** 2) / 0.12);
  const rotation = 1 + 0.25 * Math.sin((2 * Math.PI * dayIndex) / 27.3);
  const wander = 1 + 0.1 * Math.sin((2 * Math.PI * dayIndex) / 113 + 1.3);
  return cycle * rotation * wander;
}

export function buildDemoScenario(seed = DEMO_SEED): DemoScenario {
  const random = makeRandom(seed);
  const days = listDays(DEMO_FIRST_DAY, DEMO_LAST_DAY);
  const observers: DemoObserver[] = OBSERVERS.map((o, i) => ({
    ...o,
    trueK: round(0.6 + (0.8 * ((i * 7) % 14)) / 13, 3),
    spotsPerGroup: round(random.between(4.5, 8.5), 2),
    clearSkyChance: round(random.between(0.35, 0.7), 2),
    localHourUt: Math.floor(random.between(6, 14)),
  }));

  const activity = new Map<string, number>();
  days.forEach((day, i) => activity.set(day, inventedActivity(i, days.length)));

  const observations: DemoObservation[] = [];
  const pendingFrom = days[days.length - PENDING_DAYS] ?? DEMO_LAST_DAY;
  for (const observer of observers) {
    let clear = random.next() < observer.clearSkyChance;
    for (const day of days) {
      // Weather comes in spells: tomorrow is more likely to be like today.
      const stay = 0.65;
      clear = random.next() < stay ? clear : random.next() < observer.clearSkyChance;
      if (!clear) continue;
      const raw = (activity.get(day) ?? 0) / observer.trueK;
      observations.push(drawObservation({ random, observer, day, raw, pending: day >= pendingFrom }));
    }
  }
  plantOutliers(random, observations);

  const students: DemoStudent[] = [
    { key: "ava", displayName: "Ava P.", trueK: 1.25, pin: "4821" },
    { key: "ben", displayName: "Ben K.", trueK: 1.45, pin: "1937" },
    { key: "chloe", displayName: "Chloe R.", trueK: 1.1, pin: "6604" },
    { key: "dev", displayName: "Dev S.", trueK: 1.6, pin: "2758" },
    { key: "ella", displayName: "Ella M.", trueK: 1.3, pin: "9312" },
    { key: "finn", displayName: "Finn T.", trueK: 1.8, pin: "5146" },
  ];
  const classSessions = days.filter(
    (d) => d >= DEMO_CLASSROOM.termStart && new Date(`${d}T00:00:00Z`).getUTCDay() === 3,
  );
  for (const day of classSessions) {
    const raw = activity.get(day) ?? 0;
    for (const student of students) {
      const obs = drawObservation({
        random,
        observer: { ...OBSERVER_FOR_CLASS, key: student.key, trueK: student.trueK },
        day,
        raw: raw / student.trueK,
        pending: day >= pendingFrom,
      });
      observations.push({
        ...obs,
        observedAt: new Date(`${day}T10:15:00Z`),
        northGroups: null,
        northSpots: null,
        southGroups: null,
        southSpots: null,
      });
    }
  }
  return { observers, students, observations, classSessions, activity };
}

const OBSERVER_FOR_CLASS: DemoObserver = {
  key: "",
  email: "",
  displayName: "",
  country: "GB",
  timeZone: "Europe/London",
  trueK: 1,
  spotsPerGroup: 4,
  clearSkyChance: 1,
  splitsHemispheres: false,
  localHourUt: 10,
  instrument: DEMO_CLASSROOM.instrument,
};

function drawObservation({
  random,
  observer,
  day,
  raw,
  pending,
}: {
  random: Random;
  observer: DemoObserver;
  day: string;
  raw: number;
  pending: boolean;
}): DemoObservation {
  // raw ≈ 10g + s = g(10 + spotsPerGroup): solve for the mean group count.
  const groupMean = raw / (10 + observer.spotsPerGroup);
  const groups = random.poisson(groupMean);
  const spots = groups === 0 ? 0 : groups + random.poisson(groups * (observer.spotsPerGroup - 1));
  let split: Pick<DemoObservation, "northGroups" | "northSpots" | "southGroups" | "southSpots"> = {
    northGroups: null,
    northSpots: null,
    southGroups: null,
    southSpots: null,
  };
  if (observer.splitsHemispheres) {
    const northGroups = random.binomial(groups, 0.55);
    const southGroups = groups - northGroups;
    // Each group keeps at least one spot; the rest fall where the groups are.
    const extra = spots - groups;
    const northExtra = groups === 0 ? 0 : random.binomial(extra, northGroups / groups);
    split = {
      northGroups,
      northSpots: northGroups + northExtra,
      southGroups,
      southSpots: southGroups + extra - northExtra,
    };
  }
  const minute = Math.floor(random.between(0, 59));
  const observedAt = new Date(
    `${day}T${String(observer.localHourUt).padStart(2, "0")}:${String(minute).padStart(2, "0")}:00Z`,
  );
  return {
    observerKey: observer.key,
    utDate: day,
    observedAt,
    seeing: Math.min(5, Math.max(1, Math.round(random.between(1, 4.6)))),
    groups,
    spots,
    ...split,
    notes: null,
    status: pending ? "submitted" : "accepted",
    source: "demo",
  };
}

/** A few planted mistakes for the Review desk to catch: a slipped digit, a doubled count. */
function plantOutliers(random: Random, observations: DemoObservation[]) {
  const recent = observations.filter((o) => o.status === "submitted" && o.groups > 1);
  for (let i = 0; i < 4 && recent.length > 0; i++) {
    const target = recent.splice(Math.floor(random.next() * recent.length), 1)[0];
    if (!target) break;
    if (i % 2 === 0) {
      target.spots = target.spots * 10;
      target.notes = "Demo: planted outlier (slipped digit)";
    } else {
      target.groups *= 3;
      target.spots *= 3;
      target.notes = "Demo: planted outlier (tripled count)";
    }
    target.northGroups = target.northSpots = target.southGroups = target.southSpots = null;
  }
  const older = observations.filter((o) => o.status === "accepted" && o.groups > 1);
  for (let i = 0; i < 4 && older.length > 0; i++) {
    const target = older.splice(Math.floor(random.next() * older.length), 1)[0];
    if (!target) break;
    target.spots = target.spots * 4;
    target.northGroups = target.northSpots = target.southGroups = target.southSpots = null;
  }
}

function round(value: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(value * f) / f;
}
