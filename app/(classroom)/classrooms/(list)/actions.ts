"use server";

import { revalidatePath } from "next/cache";

import { requireRole } from "@/lib/auth/session";
import { toFormState } from "@/lib/classrooms/form-error";
import { createClassroom } from "@/lib/classrooms/manage";
import { classroomInputSchema } from "@/lib/validation/classroom";
import { fieldErrorsFromZod, type FormState } from "@/lib/validation/form-state";

export type CreateClassroomState = FormState & { classroomId?: string };

export async function createClassroomAction(
  _prev: CreateClassroomState,
  form: FormData,
): Promise<CreateClassroomState> {
  try {
    const user = await requireRole(["educator"]);
    const parsed = classroomInputSchema.safeParse(Object.fromEntries(form));
    if (!parsed.success) return { ok: false, fieldErrors: fieldErrorsFromZod(parsed.error) };
    const room = await createClassroom({ educatorUserId: user.id, input: parsed.data });
    revalidatePath("/classrooms");
    return {
      ok: true,
      classroomId: room.id,
      message: `${room.name} is ready. Its classroom code is ${room.joinCode}.`,
    };
  } catch (error) {
    return toFormState(error);
  }
}
