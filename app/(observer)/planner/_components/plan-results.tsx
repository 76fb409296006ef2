"use client";

import type { ReactNode } from "react";

import type { IncidenceRow } from "@/lib/optics/incidence-effect";
import {
  formatArcsec,
  formatBlur,
  formatFraction,
  formatKm,
  localisePlanMessage,
} from "@/lib/optics/plan-format";
import { bestMaskDiameterMm } from "@/lib/optics/planner";
import type { InstrumentOptics, ProjectionPlan } from "@/lib/optics/types";
import { formatLength, type UnitSystem } from "@/lib/optics/units";

const LIMITED_BY: Record<ProjectionPlan["smallestSpot"]["limitedBy"], string> = {
  blur: "set by the blur",
  eye: "set by what the eye can pick out on the image",
  pixels: "set by the camera's pixels",
};

export function PlanResults({
  instrument,
  plan,
  unitSystem,
  incidenceRows,
}: {
  instrument: InstrumentOptics;
  plan: ProjectionPlan;
  unitSystem: UnitSystem;
  incidenceRows: IncidenceRow[] | null;
}) {
  const len = (valueMm: number) => formatLength({ valueMm, unitSystem });
  return (
    <div className="flex flex-col gap-4">
      <div className="grid gap-3 sm:grid-cols-2">
        <Headline label={headlineLabel(plan)} testId="plan-disk-diameter">
          {headlineValue({ plan, len })}
        </Headline>
        <Headline label="Smallest spot that will show" testId="plan-smallest-spot">
          {formatArcsec({ arcsec: plan.smallestSpot.arcsec })} · {formatKm({ km: plan.smallestSpot.km })}
          <span className="block text-xs font-normal text-ink-500">
            {LIMITED_BY[plan.smallestSpot.limitedBy]}
          </span>
        </Headline>
      </div>

      <section aria-labelledby="warnings-heading" data-testid="plan-warnings">
        <h3 id="warnings-heading" className="text-sm font-semibold text-ink-900">
          {plan.warnings.length === 0 ? "No warnings" : `Warnings (${plan.warnings.length})`}
        </h3>
        {plan.warnings.length === 0 ? (
          <p className="text-sm text-meadow-700">
            This set-up should show the small spots that make up most counts.
          </p>
        ) : (
          <ul className="mt-1 flex flex-col gap-2">
            {plan.warnings.map((warning) => (
              <li
                key={warning.code}
                data-code={warning.code}
                className="rounded-md border-l-4 border-caution-700 bg-caution-50 px-3 py-2 text-sm text-caution-800"
              >
                {localisePlanMessage({ message: warning.message, unitSystem })}
              </li>
            ))}
          </ul>
        )}
      </section>

      <section className="rounded-lg border border-ink-100 bg-white p-4">
        <h3 className="text-sm font-semibold text-ink-900">Blur</h3>
        <table className="mt-2 w-full text-sm">
          <tbody className="divide-y divide-ink-100">
            <BlurRow
              label="Geometric (the opening seen from the image)"
              value={formatBlur({ blur: plan.geometricBlur })}
            />
            <BlurRow
              label="Diffraction"
              value={
                plan.diffractionBlur
                  ? formatBlur({ blur: plan.diffractionBlur })
                  : "not known (no aperture given)"
              }
            />
            <BlurRow label="Seeing (assumed, a fair day)" value={formatBlur({ blur: plan.seeingBlur })} />
            <BlurRow label="Combined" value={formatBlur({ blur: plan.combinedBlur })} strong />
          </tbody>
        </table>
        <p className="mt-2 text-xs text-ink-500">
          The Sun is {formatArcsec({ arcsec: plan.sunDiameterArcsec })} across on this date; 1″ is{" "}
          {Math.round(plan.kmPerArcsec)} km on the Sun.
        </p>
      </section>

      <KindDetails instrument={instrument} plan={plan} len={len} incidenceRows={incidenceRows} />
    </div>
  );
}

function headlineLabel(plan: ProjectionPlan): string {
  if (plan.kind === "camera") return "Disk on the sensor";
  if (plan.kind === "filtered-telescope") return "Disk seen in the eyepiece";
  return "Projected disk diameter";
}

function headlineValue({ plan, len }: { plan: ProjectionPlan; len: (mm: number) => string }): ReactNode {
  switch (plan.kind) {
    case "camera":
      return `${len(plan.diskDiameterOnSensorMm)} · ${Math.round(plan.diskDiameterPx).toLocaleString("en")} px`;
    case "filtered-telescope":
      return `${plan.apparentDiskDiameterDeg.toFixed(1)}° wide`;
    case "mirror":
      return (
        <>
          {len(plan.diskDiameterMm)}
          {plan.elongation > 1.005 ? (
            <span className="block text-xs font-normal text-ink-500">
              {len(plan.diskLengthAlongPlaneMm)} along the plane of incidence on a card parallel to the mirror
            </span>
          ) : null}
        </>
      );
    default:
      return len(plan.diskDiameterMm);
  }
}

function Headline({ label, testId, children }: { label: string; testId: string; children: ReactNode }) {
  return (
    <div className="rounded-lg border border-corona-200 bg-corona-50 p-4">
      <p className="text-xs text-ink-600">{label}</p>
      <p className="text-2xl font-semibold text-ink-950" data-testid={testId}>
        {children}
      </p>
    </div>
  );
}

function BlurRow({ label, value, strong = false }: { label: string; value: string; strong?: boolean }) {
  return (
    <tr>
      <th
        scope="row"
        className={`py-1 pr-3 text-left font-normal ${strong ? "font-semibold text-ink-900" : "text-ink-600"}`}
      >
        {label}
      </th>
      <td className={`py-1 text-right ${strong ? "font-semibold text-ink-950" : "text-ink-900"}`}>{value}</td>
    </tr>
  );
}

function Detail({
  title,
  rows,
  children,
}: {
  title: string;
  rows: Array<[string, ReactNode]>;
  children?: ReactNode;
}) {
  return (
    <section className="rounded-lg border border-ink-100 bg-white p-4">
      <h3 className="text-sm font-semibold text-ink-900">{title}</h3>
      <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
        {rows.map(([label, value]) => (
          <div key={label} className="contents">
            <dt className="text-ink-600">{label}</dt>
            <dd className="text-right text-ink-900">{value}</dd>
          </div>
        ))}
      </dl>
      {children}
    </section>
  );
}

function KindDetails({
  instrument,
  plan,
  len,
  incidenceRows,
}: {
  instrument: InstrumentOptics;
  plan: ProjectionPlan;
  len: (mm: number) => string;
  incidenceRows: IncidenceRow[] | null;
}) {
  if (plan.kind === "pinhole" && instrument.kind === "pinhole") {
    const differenceMm = instrument.holeDiameterMm - plan.bestHoleDiameterMm;
    return (
      <Detail
        title="Pinhole"
        rows={[
          ["Best hole for this box (Rayleigh, d ≈ 1.9 √(f λ))", len(plan.bestHoleDiameterMm)],
          [
            "Your hole",
            `${plan.holeToBestRatio.toFixed(2)} × the best (${differenceMm >= 0 ? "+" : "−"}${len(Math.abs(differenceMm))})`,
          ],
          ["Hole as a share of the box length", formatFraction({ fraction: plan.holeFractionOfBoxLength })],
        ]}
      />
    );
  }
  if (plan.kind === "mirror" && instrument.kind === "mirror") {
    const target = formatFraction({ fraction: plan.targetBlurFraction });
    return (
      <Detail
        title="Mirror"
        rows={[
          ["Opening in use", len(plan.apertureMm)],
          [
            `Largest mask for a ${target} blur at this throw`,
            plan.maskForTargetBlurMm === null
              ? `none can; the sharpest this throw allows is about ${len(bestMaskDiameterMm({ throwDistanceMm: instrument.throwDistanceMm, wavelengthNm: plan.wavelengthNm }))}`
              : len(plan.maskForTargetBlurMm),
          ],
          [
            `Throw for a ${target} blur with this opening`,
            plan.throwForTargetBlurMm === null
              ? "no throw is long enough: the opening is so small that diffraction alone exceeds it"
              : len(plan.throwForTargetBlurMm),
          ],
          ["Stretch along the plane of incidence", `× ${plan.elongation.toFixed(3)}`],
          [
            "Blur across / along the plane",
            `${formatArcsec({ arcsec: plan.acrossPlane.combinedBlur.arcsec })} / ${formatArcsec({ arcsec: plan.alongPlane.combinedBlur.arcsec })}`,
          ],
          [
            "Ghost image (ordinary glass mirror)",
            plan.ghost
              ? `${Math.round(plan.ghost.relativeBrightness * 100)} % as bright, ${len(plan.ghost.offsetMm)} aside`
              : "none (first-surface)",
          ],
        ]}
      >
        {incidenceRows ? (
          <div className="mt-3">
            <h4 className="text-xs font-semibold tracking-wide text-ink-600 uppercase">
              Effect of the angle of incidence
            </h4>
            <table className="mt-1 w-full text-sm" data-testid="incidence-table">
              <thead>
                <tr className="text-xs text-ink-500">
                  <th className="py-1 text-left font-normal">Angle</th>
                  <th className="py-1 text-right font-normal">Stretch</th>
                  <th className="py-1 text-right font-normal">Blur</th>
                  <th className="py-1 text-right font-normal">Blur on card</th>
                  {plan.ghost ? <th className="py-1 text-right font-normal">Ghost</th> : null}
                </tr>
              </thead>
              <tbody className="divide-y divide-ink-100">
                {incidenceRows.map((row) => (
                  <tr
                    key={row.incidenceAngleDeg}
                    className={row.isCurrent ? "bg-corona-50 font-semibold" : ""}
                  >
                    <td className="py-1">
                      {row.incidenceAngleDeg}°{row.isCurrent ? " (yours)" : ""}
                    </td>
                    <td className="py-1 text-right">× {row.elongation.toFixed(2)}</td>
                    <td className="py-1 text-right">
                      {formatFraction({ fraction: row.combinedBlurFraction })}
                    </td>
                    <td className="py-1 text-right">{len(row.blurOnCardMm)}</td>
                    {plan.ghost ? (
                      <td className="py-1 text-right">
                        {row.ghostRelativeBrightness === null
                          ? "—"
                          : `${Math.round(row.ghostRelativeBrightness * 100)} %`}
                      </td>
                    ) : null}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        ) : null}
      </Detail>
    );
  }
  if (plan.kind === "eyepiece-projection") {
    return (
      <Detail
        title="Eyepiece projection"
        rows={[
          ["Projection magnification", `× ${plan.projectionMagnification.toFixed(1)}`],
          ["Effective focal length", len(plan.effectiveFocalLengthMm)],
          ["Disk at prime focus", len(plan.primeFocusDiskDiameterMm)],
        ]}
      />
    );
  }
  if (plan.kind === "camera") {
    return (
      <Detail
        title="Camera"
        rows={[
          ["Each pixel covers", formatArcsec({ arcsec: plan.pixelScaleArcsec })],
          ["Disk across", `${Math.round(plan.diskDiameterPx).toLocaleString("en")} pixels`],
        ]}
      />
    );
  }
  if (plan.kind === "filtered-telescope") {
    return (
      <Detail
        title="Telescope"
        rows={[
          ["Dawes' limit (116″ / D)", formatArcsec({ arcsec: plan.dawesLimitArcsec })],
          ["Rayleigh's criterion (1.22 λ / D)", formatArcsec({ arcsec: plan.rayleighLimitArcsec })],
        ]}
      />
    );
  }
  return null;
}
