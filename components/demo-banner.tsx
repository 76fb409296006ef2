import { getEnv } from "@/lib/env";
import { DEMO_NETWORK_NAME } from "@/lib/demo/scenario";

/** Invented data must never pass for real measurements. */
export function DemoBanner() {
  if (!getEnv().HELIOTALLY_DEMO) return null;
  return (
    <div className="no-print bg-umbra px-4 py-1.5 text-center text-xs text-corona-100">
      Demo network: the {DEMO_NETWORK_NAME} and all its counts are invented for demonstration. They are not
      real measurements.
    </div>
  );
}
