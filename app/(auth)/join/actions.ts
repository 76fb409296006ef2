"use server";

import { headers } from "next/headers";

import { toFormState } from "@/lib/classrooms/form-error";
import { joinClassroom } from "@/lib/classrooms/students";
import { joinClassroomSchema } from "@/lib/validation/classroom";
import { fieldErrorsFromZod, type FormState } from "@/lib/validation/form-state";

export type JoinState = FormState & {
  card?: { code: string; displayName: string; pin: string; classroomName: string };
};

/** Public: a student joins a classroom whose educator opened joining. */
export async function joinClassroomAction(_prev: JoinState, form: FormData): Promise<JoinState> {
  const parsed = joinClassroomSchema.safeParse({
    code: form.get("code"),
    displayName: form.get("displayName"),
  });
  if (!parsed.success) return { ok: false, fieldErrors: fieldErrorsFromZod(parsed.error) };
  const h = await headers();
  const address = h.get("x-forwarded-for")?.split(",")[0]?.trim() || h.get("x-real-ip") || "local";
  try {
    const card = await joinClassroom({ input: parsed.data, address });
    return { ok: true, card };
  } catch (error) {
    return toFormState(error);
  }
}
