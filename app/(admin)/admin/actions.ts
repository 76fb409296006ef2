"use server";

import { revalidatePath } from "next/cache";

import { setUserRole } from "@/db/queries/users";
import { requireRole } from "@/lib/auth/session";
import { changeRoleSchema } from "@/lib/validation/admin";
import { fieldErrorsFromZod, type FormState } from "@/lib/validation/form-state";
import { formFields } from "@/lib/validation/form-data";

export async function changeRoleAction(_prev: FormState, form: FormData): Promise<FormState> {
  const admin = await requireRole(["admin"]);
  const parsed = changeRoleSchema.safeParse(formFields(form));
  if (!parsed.success) return { ok: false, fieldErrors: fieldErrorsFromZod(parsed.error) };
  if (parsed.data.userId === admin.id && parsed.data.role !== "admin") {
    return { ok: false, message: "You cannot remove your own admin role; ask another admin." };
  }
  await setUserRole(parsed.data);
  revalidatePath("/admin");
  return { ok: true, message: "Role changed." };
}
