"use client";

import { memo } from "react";

import {
  checkGroupClasses,
  listMcIntoshLettersForZurich,
  listValidMcIntoshClasses,
  MCINTOSH_COMPACTNESS_DESCRIPTIONS,
  MCINTOSH_PENUMBRA_DESCRIPTIONS,
  MCINTOSH_ZURICH_DESCRIPTIONS,
  ZURICH_CLASSES,
  ZURICH_DESCRIPTIONS,
  type McIntoshCompactness,
  type McIntoshPenumbra,
  type McIntoshZurich,
  type ZurichClass,
} from "@/lib/solar/classes";
import type { EditorAction } from "@/lib/tracer/editor";
import type { MeasuredGroup } from "@/lib/tracer/measure";
import type { TracingGroup } from "@/lib/validation/tracing";

const ALL_MCINTOSH = listValidMcIntoshClasses();
const UNIPOLAR_ZURICH = new Set(["A", "H", "J"]);

function describeMcIntosh(cls: string): string {
  const [z, p, c] = cls as unknown as [McIntoshZurich, McIntoshPenumbra, McIntoshCompactness];
  return `${MCINTOSH_ZURICH_DESCRIPTIONS[z]}. Largest spot's penumbra: ${MCINTOSH_PENUMBRA_DESCRIPTIONS[p].toLowerCase()}. ${MCINTOSH_COMPACTNESS_DESCRIPTIONS[c]}.`;
}

/** McIntosh classes that can be chosen for this group: valid ones, agreeing with its Zurich class and size. */
function listChoosableMcIntosh({
  zurichClass,
  spotCount,
}: {
  zurichClass: string | null;
  spotCount: number;
}): string[] {
  const letters = zurichClass ? listMcIntoshLettersForZurich({ zurich: zurichClass as ZurichClass }) : null;
  return ALL_MCINTOSH.filter(
    (cls) =>
      (!letters || letters.includes(cls.charAt(0) as McIntoshZurich)) &&
      checkGroupClasses({ zurichClass: null, mcintoshClass: cls, spotCount }).length === 0,
  );
}

function formatSigned(value: number, digits = 1): string {
  return `${value >= 0 ? "+" : "−"}${Math.abs(value).toFixed(digits)}°`;
}

export const GroupPanel = memo(function GroupPanel({
  groups,
  measured,
  selectedGroupId,
  onSelectGroup,
  dispatch,
}: {
  groups: TracingGroup[];
  measured: MeasuredGroup[];
  selectedGroupId: string | null;
  onSelectGroup: (id: string | null) => void;
  dispatch: (action: EditorAction) => void;
}) {
  const byId = new Map(measured.map((m) => [m.id, m]));
  const sorted = [...groups].sort((a, b) => a.number - b.number);
  if (sorted.length === 0) {
    return (
      <p className="text-sm text-ink-600">
        No groups yet. Place spots, select them (or lasso them) and press{" "}
        <kbd className="font-semibold">G</kbd>, or use <em>Suggest groups</em>.
      </p>
    );
  }
  return (
    <ul className="flex flex-col gap-2" aria-label="Groups">
      {sorted.map((group) => {
        const m = byId.get(group.id);
        const spotCount = m?.spotCount ?? 0;
        const choosable = listChoosableMcIntosh({ zurichClass: group.zurichClass, spotCount });
        const problems = checkGroupClasses({
          zurichClass: group.zurichClass,
          mcintoshClass: group.mcintoshClass,
          spotCount,
        });
        const selected = group.id === selectedGroupId;
        return (
          <li
            key={group.id}
            data-testid={`group-${group.number}`}
            className={`rounded-md border p-2 text-sm ${selected ? "border-corona-500 bg-corona-50" : "border-ink-100 bg-white"}`}
          >
            <div className="flex flex-wrap items-center gap-2">
              <button
                type="button"
                className="font-semibold text-ink-900 underline decoration-dotted"
                onClick={() => onSelectGroup(selected ? null : group.id)}
                aria-pressed={selected}
              >
                Group
              </button>
              <label className="sr-only" htmlFor={`group-number-${group.id}`}>
                Number of this group within the day
              </label>
              <input
                id={`group-number-${group.id}`}
                type="number"
                min={1}
                max={999}
                value={group.number}
                onChange={(e) => {
                  const number = Number(e.target.value);
                  if (Number.isInteger(number) && number >= 1 && number <= 999) {
                    dispatch({ type: "update-group", id: group.id, patch: { number } });
                  }
                }}
                className="w-14 rounded border border-ink-200 px-1 py-0.5"
              />
              <span className="text-ink-600">
                {spotCount} {spotCount === 1 ? "spot" : "spots"}
              </span>
              <label className="ml-auto flex items-center gap-1">
                <span className="text-xs text-ink-600">Zurich</span>
                <select
                  aria-label={`Zurich class of group ${group.number}`}
                  value={group.zurichClass ?? ""}
                  onChange={(e) => {
                    const zurichClass = (e.target.value || null) as ZurichClass | null;
                    // Keep the McIntosh class only if it still agrees with the new Zurich class.
                    const keep =
                      group.mcintoshClass &&
                      checkGroupClasses({ zurichClass, mcintoshClass: group.mcintoshClass, spotCount })
                        .length === 0;
                    dispatch({
                      type: "update-group",
                      id: group.id,
                      patch: { zurichClass, mcintoshClass: keep ? group.mcintoshClass : null },
                    });
                  }}
                  className="rounded border border-ink-200 px-1 py-0.5"
                >
                  <option value="">—</option>
                  {ZURICH_CLASSES.map((cls) => (
                    <option
                      key={cls}
                      value={cls}
                      title={ZURICH_DESCRIPTIONS[cls]}
                      disabled={!UNIPOLAR_ZURICH.has(cls) && spotCount < 2}
                    >
                      {cls}
                    </option>
                  ))}
                </select>
              </label>
              <label className="flex items-center gap-1">
                <span className="text-xs text-ink-600">McIntosh</span>
                <select
                  aria-label={`McIntosh class of group ${group.number}`}
                  value={group.mcintoshClass ?? ""}
                  onChange={(e) =>
                    dispatch({
                      type: "update-group",
                      id: group.id,
                      patch: { mcintoshClass: e.target.value || null },
                    })
                  }
                  className="rounded border border-ink-200 px-1 py-0.5"
                >
                  <option value="">—</option>
                  {group.mcintoshClass && !choosable.includes(group.mcintoshClass) ? (
                    <option value={group.mcintoshClass}>{group.mcintoshClass} (not valid here)</option>
                  ) : null}
                  {choosable.map((cls) => (
                    <option key={cls} value={cls} title={describeMcIntosh(cls)}>
                      {cls}
                    </option>
                  ))}
                </select>
              </label>
            </div>
            {m ? (
              <p className="mt-1 text-xs text-ink-700" data-testid={`group-${group.number}-position`}>
                Lat {formatSigned(m.latitudeDeg)} · CMD {formatSigned(m.cmdDeg)} · Carrington{" "}
                {m.carringtonLonDeg.toFixed(1)}° · {m.hemisphere === "N" ? "north" : "south"} ·{" "}
                {m.longitudinalExtentDeg.toFixed(1)}° long
                {m.areaMsh !== null ? ` · ${Math.round(m.areaMsh)} MSH` : ""}
              </p>
            ) : (
              <p className="mt-1 text-xs text-ink-500">Position once the disk is fitted and oriented.</p>
            )}
            {group.mcintoshClass ? (
              <p className="text-xs text-ink-500">{describeMcIntosh(group.mcintoshClass)}</p>
            ) : null}
            {problems.map((p) => (
              <p key={p} role="alert" className="mt-1 text-xs font-medium text-caution-700">
                {p}
              </p>
            ))}
          </li>
        );
      })}
    </ul>
  );
});
