const SAFETY_EMPHASIS = {
  mirror:
    "A mirror sends a beam of full sunlight a long way: keep it off people's eyes, windows, roads and walkways, and cover the mirror whenever you step away.",
  "telescope-projection":
    "This telescope points at the Sun and concentrates its light: never look through it or its finder (cap the finder), keep everyone's eyes and hands away from the eyepiece, and never leave it aimed at the Sun unattended.",
  "filtered-optics":
    "This instrument points optics at the Sun: a certified solar filter must cover the front before it is aimed (never a filter at the eyepiece), check the filter for damage every time, and cap the finder.",
} as const;

/**
 * The usual cautions for anyone pointing optics at the Sun. Shown on every
 * page that helps set up or use a projection.
 */
export function SafetyNotice({
  compact = false,
  classroom = false,
  emphasis = null,
}: {
  compact?: boolean;
  classroom?: boolean;
  /** Puts the caution that matters most for this set-up first, in bold. */
  emphasis?: "mirror" | "telescope-projection" | "filtered-optics" | null;
}) {
  return (
    <aside
      aria-label="Solar safety"
      className="rounded-lg border-2 border-caution-200 bg-caution-50 px-4 py-3 text-sm text-caution-800"
    >
      <p className="font-semibold">Solar safety — read before observing</p>
      {emphasis ? (
        <p
          data-testid="safety-emphasis"
          className="mt-1 rounded-md bg-caution-200/60 px-3 py-2 font-semibold"
        >
          {SAFETY_EMPHASIS[emphasis]}
        </p>
      ) : null}
      <ul className={`mt-1 list-disc space-y-0.5 pl-5 ${compact ? "text-xs" : ""}`}>
        <li>
          Never look at the Sun directly, or through any binoculars, telescope or camera, without a certified
          solar filter over the front.
        </li>
        <li>Count by projection only: look at the image on the card or wall, never into the optics.</li>
        <li>
          A mirror&apos;s reflected beam travels far: keep it away from people&apos;s eyes, roads and
          walkways, and cover the mirror when you step away.
        </li>
        <li>
          {classroom
            ? "An adult supervises every class session from set-up to packing away."
            : "Supervise children at all times."}
        </li>
        <li>Follow local rules and your school&apos;s or club&apos;s own safety policy; they come first.</li>
      </ul>
    </aside>
  );
}
