"use server";

import { revalidatePath } from "next/cache";

import { requireRole } from "@/lib/auth/session";
import { toFormState } from "@/lib/classrooms/form-error";
import {
  archiveClassroom,
  enrolStudents,
  moveStudent,
  removeStudent,
  resetStudentPin,
  scheduleSession,
  updateClassroomSettings,
  type IssuedCard,
} from "@/lib/classrooms/manage";
import {
  archiveClassroomSchema,
  classroomSettingsSchema,
  enrolStudentsSchema,
  moveStudentSchema,
  removeStudentSchema,
  sessionInputSchema,
  studentActionSchema,
} from "@/lib/validation/classroom";
import { fieldErrorsFromZod, type FormState } from "@/lib/validation/form-state";

/**
 * The educator's changes to one classroom. Each action is a public endpoint:
 * it checks the role first, validates with the form's own schema, and the
 * domain functions find the classroom through the signed-in educator, so
 * another educator's classroom is "not found".
 */

const input = (form: FormData) => Object.fromEntries(form);

function refresh(classroomId: string) {
  revalidatePath(`/classrooms/${classroomId}`);
  revalidatePath("/classrooms");
}

export async function updateSettingsAction(_prev: FormState, form: FormData): Promise<FormState> {
  try {
    const user = await requireRole(["educator"]);
    const parsed = classroomSettingsSchema.safeParse(input(form));
    if (!parsed.success) return { ok: false, fieldErrors: fieldErrorsFromZod(parsed.error) };
    await updateClassroomSettings({ educatorUserId: user.id, input: parsed.data });
    refresh(parsed.data.classroomId);
    return { ok: true, message: "Settings saved." };
  } catch (error) {
    return toFormState(error);
  }
}

export async function archiveClassroomAction(_prev: FormState, form: FormData): Promise<FormState> {
  try {
    const user = await requireRole(["educator"]);
    const parsed = archiveClassroomSchema.safeParse(input(form));
    if (!parsed.success) return { ok: false, fieldErrors: fieldErrorsFromZod(parsed.error) };
    await archiveClassroom({ educatorUserId: user.id, classroomId: parsed.data.classroomId });
    refresh(parsed.data.classroomId);
    return {
      ok: true,
      message: "Classroom archived. Its sessions, counts and comparisons stay here for you to read.",
    };
  } catch (error) {
    return toFormState(error);
  }
}

export type EnrolState = FormState & { issued?: IssuedCard[] };

export async function enrolStudentsAction(_prev: EnrolState, form: FormData): Promise<EnrolState> {
  try {
    const user = await requireRole(["educator"]);
    const parsed = enrolStudentsSchema.safeParse(input(form));
    if (!parsed.success) return { ok: false, fieldErrors: fieldErrorsFromZod(parsed.error) };
    const issued = await enrolStudents({ educatorUserId: user.id, input: parsed.data });
    refresh(parsed.data.classroomId);
    return {
      ok: true,
      issued,
      message: `${issued.length} student${issued.length === 1 ? "" : "s"} enrolled.`,
    };
  } catch (error) {
    return toFormState(error);
  }
}

export type ResetPinState = FormState & { issued?: { userId: string; pin: string } };

export async function resetPinAction(_prev: ResetPinState, form: FormData): Promise<ResetPinState> {
  try {
    const user = await requireRole(["educator"]);
    const parsed = studentActionSchema.safeParse(input(form));
    if (!parsed.success) return { ok: false, fieldErrors: fieldErrorsFromZod(parsed.error) };
    const issued = await resetStudentPin({ educatorUserId: user.id, ...parsed.data });
    return { ok: true, issued, message: `New PIN: ${issued.pin}. The old one no longer works.` };
  } catch (error) {
    return toFormState(error);
  }
}

export async function moveStudentAction(_prev: FormState, form: FormData): Promise<FormState> {
  try {
    const user = await requireRole(["educator"]);
    const parsed = moveStudentSchema.safeParse(input(form));
    if (!parsed.success) return { ok: false, fieldErrors: fieldErrorsFromZod(parsed.error) };
    await moveStudent({ educatorUserId: user.id, ...parsed.data });
    refresh(parsed.data.classroomId);
    refresh(parsed.data.targetClassroomId);
    return { ok: true, message: "Student moved." };
  } catch (error) {
    return toFormState(error);
  }
}

export async function removeStudentAction(_prev: FormState, form: FormData): Promise<FormState> {
  try {
    const user = await requireRole(["educator"]);
    const parsed = removeStudentSchema.safeParse(input(form));
    if (!parsed.success) return { ok: false, fieldErrors: fieldErrorsFromZod(parsed.error) };
    await removeStudent({
      educatorUserId: user.id,
      classroomId: parsed.data.classroomId,
      studentUserId: parsed.data.studentUserId,
    });
    refresh(parsed.data.classroomId);
    return { ok: true, message: "Student removed, with their account and counts." };
  } catch (error) {
    return toFormState(error);
  }
}

export type ScheduleState = FormState & { sessionId?: string };

export async function scheduleSessionAction(_prev: ScheduleState, form: FormData): Promise<ScheduleState> {
  try {
    const user = await requireRole(["educator"]);
    const parsed = sessionInputSchema.safeParse(input(form));
    if (!parsed.success) return { ok: false, fieldErrors: fieldErrorsFromZod(parsed.error) };
    const session = await scheduleSession({ educatorUserId: user.id, input: parsed.data });
    refresh(parsed.data.classroomId);
    return { ok: true, sessionId: session.id, message: `“${session.title}” is scheduled.` };
  } catch (error) {
    return toFormState(error);
  }
}
