import type { Metadata } from "next";

import { PageHeader } from "@/components/layout/app-shell";
import { SafetyNotice } from "@/components/safety-notice";
import { Button } from "@/components/ui/button";
import { Field, Input, Select } from "@/components/ui/field";
import { listInstrumentsWithUsage } from "@/db/queries/instruments";
import { requireObserver } from "@/lib/auth/session";
import { getProjectedDiskDiameterMm } from "@/lib/optics/disk-size";
import { solarOrientation } from "@/lib/solar/ephemeris";
import {
  DEFAULT_TEMPLATE_DIAMETER_MM,
  layoutDiskTemplate,
  renderDiskTemplateSvg,
} from "@/lib/tracer/template-svg";
import { diskTemplateQuerySchema, templateInstant } from "@/lib/validation/disk-template";
import { fieldErrorsFromZod } from "@/lib/validation/form-state";

import { PrintButton } from "./_components/print-button";

export const metadata: Metadata = { title: "Disk template" };

type SearchParams = Record<string, string | string[] | undefined>;

function first(value: string | string[] | undefined): string | undefined {
  return Array.isArray(value) ? value[0] : value;
}

/** A printable, true-size disk with the day's heliographic grid, to tape onto the projection screen. */
export default async function DiskTemplatePage({ searchParams }: { searchParams: Promise<SearchParams> }) {
  const params = await searchParams;
  const { observer } = await requireObserver();
  const today = new Date().toISOString().slice(0, 10);
  const date = first(params.date) ?? today;
  const time = first(params.time) || "12:00";
  const dayAt = /^\d{4}-\d{2}-\d{2}$/.test(date) ? new Date(`${date}T12:00:00Z`) : new Date();

  const instruments = (await listInstrumentsWithUsage({ observerId: observer.id }))
    .filter((i) => i.archivedAt === null)
    .map((i) => ({
      id: i.id,
      name: i.name,
      diameterMm: getProjectedDiskDiameterMm({ instrument: i, at: dayAt }),
    }));
  const projecting = instruments.filter((i) => i.diameterMm !== null);
  const requestedInstrument = first(params.instrumentId);
  const chosen =
    requestedInstrument === undefined
      ? (projecting[0] ?? null)
      : (projecting.find((i) => i.id === requestedInstrument) ?? null);
  // The instrument's disk on that day, rounded to half a millimetre. A size typed by hand wins,
  // unless the observer has just switched to another instrument.
  const instrumentDiameterMm = chosen?.diameterMm ? Math.round(chosen.diameterMm * 2) / 2 : null;
  const typedDiameter = first(params.diameterMm);
  const switchedInstrument = chosen !== null && requestedInstrument !== first(params.lastInstrumentId);
  const diameterText =
    typedDiameter && !switchedInstrument
      ? typedDiameter
      : String(instrumentDiameterMm ?? DEFAULT_TEMPLATE_DIAMETER_MM);

  const parsed = diskTemplateQuerySchema.safeParse({
    date,
    time,
    diameterMm: diameterText,
    mirrored: first(params.mirrored),
  });
  const errors = parsed.success ? {} : fieldErrorsFromZod(parsed.error);
  const template = parsed.success
    ? (() => {
        const at = templateInstant(parsed.data);
        const orientation = solarOrientation(at);
        return {
          svg: renderDiskTemplateSvg({
            at,
            orientation,
            diameterMm: parsed.data.diameterMm,
            mirrored: parsed.data.mirrored,
          }),
          layout: layoutDiskTemplate({ diameterMm: parsed.data.diameterMm }),
          svgHref: `/api/v1/disk-template?${new URLSearchParams({
            date: parsed.data.date,
            time: parsed.data.time,
            diameterMm: String(parsed.data.diameterMm),
            mirrored: String(parsed.data.mirrored),
          })}`,
        };
      })()
    : null;

  return (
    <>
      {template ? (
        <style>{`@media print {
  @page { size: ${template.layout.widthMm}mm ${template.layout.heightMm}mm; margin: 0; }
  body * { visibility: hidden; }
  .template-sheet, .template-sheet * { visibility: visible; }
  .template-sheet { position: fixed; left: 0; top: 0; border: 0 !important; box-shadow: none !important; }
}`}</style>
      ) : null}
      <PageHeader
        title="Disk template"
        lead="Print a disk at the size your instrument projects, with the day's heliographic grid. Tape it to the screen, turn it until a spot drifts along the E–W line with the drive off, fit the image to the circle, and draw."
      />
      <div className="no-print mb-6 grid gap-6 lg:grid-cols-[2fr_1fr]">
        <form
          method="get"
          className="flex flex-col gap-4 rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
          noValidate
        >
          <div className="grid gap-4 sm:grid-cols-2">
            <Field id="date" label="Date (UT)" error={errors.date}>
              <Input
                id="date"
                name="date"
                type="date"
                defaultValue={date}
                aria-invalid={Boolean(errors.date)}
              />
            </Field>
            <Field
              id="time"
              label="Time (UT)"
              hint="The grid turns slowly; noon is fine for a whole day."
              error={errors.time}
            >
              <Input
                id="time"
                name="time"
                type="time"
                defaultValue={time}
                aria-invalid={Boolean(errors.time)}
              />
            </Field>
          </div>
          <div className="grid gap-4 sm:grid-cols-2">
            <Field
              id="instrumentId"
              label="Instrument"
              hint={
                projecting.length === 0
                  ? "None of your instruments projects a disk; enter the size you measure on the card."
                  : "Sets the diameter to the disk it projects that day."
              }
            >
              <Select id="instrumentId" name="instrumentId" defaultValue={chosen?.id ?? ""}>
                <option value="">Enter a size by hand</option>
                {instruments.map((i) => (
                  <option key={i.id} value={i.id} disabled={i.diameterMm === null}>
                    {i.name}
                    {i.diameterMm === null ? " (does not project)" : ` (${i.diameterMm.toFixed(1)} mm)`}
                  </option>
                ))}
              </Select>
              <input type="hidden" name="lastInstrumentId" value={chosen?.id ?? ""} />
            </Field>
            <Field
              id="diameterMm"
              label="Disk diameter (mm)"
              hint="Measure the projected disk if you are unsure."
              error={errors.diameterMm}
            >
              <Input
                id="diameterMm"
                name="diameterMm"
                inputMode="decimal"
                defaultValue={diameterText}
                aria-invalid={Boolean(errors.diameterMm)}
              />
            </Field>
          </div>
          <label className="flex items-center gap-2 text-sm text-ink-800">
            <input
              type="checkbox"
              name="mirrored"
              value="true"
              defaultChecked={parsed.success ? parsed.data.mirrored : false}
              className="size-4 accent-corona-600"
            />
            Mirror-reversed (you look at the card from the telescope&apos;s side, or use a diagonal or mirror)
          </label>
          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit" variant="secondary">
              Update the template
            </Button>
            {template ? (
              <>
                <PrintButton />
                <a href={template.svgHref} className="text-sm text-corona-700 underline" download>
                  Download the SVG
                </a>
              </>
            ) : null}
          </div>
          <p className="text-xs text-ink-500">
            Print at 100% (turn off &ldquo;fit to page&rdquo;) so the circle keeps its size.
          </p>
        </form>
        <SafetyNotice compact />
      </div>
      {template ? (
        <div
          className="template-sheet overflow-x-auto rounded-lg border border-ink-100 bg-white shadow-sm"
          data-testid="disk-template"
          // Built by lib/tracer/template-svg.ts from numbers and fixed text; user text is XML-escaped there.
          dangerouslySetInnerHTML={{ __html: template.svg }}
        />
      ) : (
        <p
          className="rounded-lg border border-caution-200 bg-caution-50 p-4 text-sm text-caution-800"
          role="alert"
        >
          Correct the fields above to see the template.
        </p>
      )}
    </>
  );
}
