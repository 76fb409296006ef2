import { redirect } from "next/navigation";

import { SafetyNotice } from "@/components/safety-notice";
import { ButtonLink } from "@/components/ui/button";
import { ROLE_HOME } from "@/lib/auth/roles";
import { getSessionUser } from "@/lib/auth/session";

export const dynamic = "force-dynamic";

export default async function HomePage() {
  const user = await getSessionUser();
  if (user) redirect(ROLE_HOME[user.role]);

  return (
    <div className="grid gap-10 md:grid-cols-[3fr_2fr]">
      <section>
        <p className="text-sm font-semibold tracking-widest text-corona-700">FOR SUNSPOT OBSERVERS</p>
        <h1 className="mt-2 text-4xl font-semibold tracking-tight text-ink-950">
          Count the Sun every clear day. Heliotally keeps the rest.
        </h1>
        <p className="mt-4 text-lg text-ink-700">
          Log your groups and spots in a minute, see your relative number <em>R = k(10g + s)</em> at once, and
          build a Logbook your network can trust. Coordinators review submissions, find every observer&apos;s{" "}
          <em>k</em> and publish the network&apos;s series; teachers run class observing sessions.
        </p>
        <div className="mt-6 flex gap-3">
          <ButtonLink href="/sign-in">Sign in</ButtonLink>
          <ButtonLink href="/sign-up" variant="secondary">
            Join as an observer
          </ButtonLink>
        </div>
      </section>
      <SafetyNotice />
    </div>
  );
}
