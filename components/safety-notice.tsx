/**
 * The usual cautions for anyone pointing optics at the Sun. Shown on every
 * page that helps set up or use a projection.
 */
export function SafetyNotice({ compact = false, classroom = false }: { compact?: boolean; classroom?: boolean }) {
  return (
    <aside
      aria-label="Solar safety"
      className="rounded-lg border-2 border-caution-200 bg-caution-50 px-4 py-3 text-sm text-caution-800"
    >
      <p className="font-semibold">Solar safety — read before observing</p>
      <ul className={`mt-1 list-disc space-y-0.5 pl-5 ${compact ? "text-xs" : ""}`}>
        <li>Never look at the Sun directly, or through any binoculars, telescope or camera, without a certified solar filter over the front.</li>
        <li>Count by projection only: look at the image on the card or wall, never into the optics.</li>
        <li>A mirror&apos;s reflected beam travels far: keep it away from people&apos;s eyes, roads and walkways, and cover the mirror when you step away.</li>
        <li>{classroom ? "An adult supervises every class session from set-up to packing away." : "Supervise children at all times."}</li>
        <li>Follow local rules and your school&apos;s or club&apos;s own safety policy; they come first.</li>
      </ul>
    </aside>
  );
}
