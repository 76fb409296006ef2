"use server";

import { revalidatePath } from "next/cache";

import { flagAwaitingReview, setOutlierThreshold } from "@/db/queries/review-flags";
import { requireRole } from "@/lib/auth/session";
import { fieldErrorsFromZod, type FormState } from "@/lib/validation/form-state";
import { reviewSettingsSchema } from "@/lib/validation/review";

/** Saves the outlier threshold and re-checks every count still waiting, so the queue reflects it at once. */
export async function saveReviewSettingsAction(_prev: FormState, form: FormData): Promise<FormState> {
  await requireRole(["coordinator"]);
  // Only the named field: React adds its own "$ACTION_…" entries to the form data.
  const parsed = reviewSettingsSchema.safeParse({
    outlierThreshold: form.get("outlierThreshold") ?? undefined,
  });
  if (!parsed.success) {
    const fieldErrors = fieldErrorsFromZod(parsed.error);
    return {
      ok: false,
      fieldErrors,
      message: fieldErrors.outlierThreshold
        ? undefined
        : "The settings could not be read; reload the page and try again.",
    };
  }
  await setOutlierThreshold({ value: parsed.data.outlierThreshold });
  const rechecked = await flagAwaitingReview();
  revalidatePath("/review");
  return {
    ok: true,
    message: `Threshold set to ${parsed.data.outlierThreshold}. ${rechecked} waiting ${rechecked === 1 ? "count was" : "counts were"} checked again.`,
  };
}
