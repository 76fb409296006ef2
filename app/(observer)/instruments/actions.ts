"use server";

import { revalidatePath } from "next/cache";

import { setObserverUnitSystem } from "@/db/queries/instruments";
import { requireObserver } from "@/lib/auth/session";
import { AppError } from "@/lib/http/errors";
import { fieldErrorsFromZod, type FormState } from "@/lib/validation/form-state";
import { unitPreferenceSchema } from "@/lib/validation/preferences";

/**
 * Saves the caller's choice of metric or imperial units. A server action is
 * a public endpoint: the guard runs first and only the caller's own profile
 * is changed.
 */
export async function setUnitSystemAction(input: { unitSystem: unknown }): Promise<FormState> {
  try {
    const { observer } = await requireObserver();
    const parsed = unitPreferenceSchema.safeParse(input);
    if (!parsed.success) return { ok: false, fieldErrors: fieldErrorsFromZod(parsed.error) };
    await setObserverUnitSystem({ observerId: observer.id, unitSystem: parsed.data.unitSystem });
    revalidatePath("/instruments", "layout");
    revalidatePath("/planner");
    return {
      ok: true,
      message: parsed.data.unitSystem === "imperial" ? "Imperial units saved." : "Metric units saved.",
    };
  } catch (error) {
    if (error instanceof AppError) return { ok: false, message: error.message };
    throw error;
  }
}
