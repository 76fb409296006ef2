/** Heliotally's mark: a disk with a tally of four strokes and a crossbar. */
export function SunMark({ className = "size-7" }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true">
      <circle cx="16" cy="16" r="14" className="fill-corona-300 stroke-corona-600" strokeWidth="2" />
      <g className="stroke-umbra" strokeWidth="2" strokeLinecap="round">
        <path d="M10 10v12M14 10v12M18 10v12M22 10v12" />
        <path d="M8 20l16-8" />
      </g>
    </svg>
  );
}
