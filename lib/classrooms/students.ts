import "server-only";

import {
  createStudentsInClassroom,
  findClassroomByJoinCode,
  findMemberByDisplayName,
} from "@/db/queries/classrooms";
import {
  assertSignInAllowed,
  recordSignInFailure,
  recordSignInSuccess,
  SignInLockedError,
} from "@/lib/auth/throttle";
import { AppError } from "@/lib/http/errors";
import { classroomSignInSchema, type JoinClassroomInput } from "@/lib/validation/classroom";

import { makePin, normaliseDisplayName } from "./codes";
import { classInstrumentOf } from "./manage";
import { hashPin, verifyPin } from "./pins";

/**
 * Students sign in with their classroom code, their display name and a PIN.
 *
 * Failed attempts go through the same throttle as e-mail sign-ins, under
 * keys of our own: one per classroom code and student (five wrong PINs lock
 * that student for a while) and one per classroom code in the "address"
 * slot (a spray of guesses across a whole class locks the class's code
 * sign-in, not the school's network address: a school puts every pupil and
 * teacher behind one address, and a class's typing mistakes must not lock
 * the teachers out). Unknown codes are counted per network address, so
 * codes cannot be guessed in bulk.
 */

export const WRONG_CODE = "There is no classroom with that code. Check the code on your sign-in card.";
export const WRONG_NAME_OR_PIN =
  "That name and PIN do not match anyone in this classroom. Check your card, or ask your teacher to reset your PIN.";
export const CLASSROOM_ARCHIVED =
  "This classroom has finished for the term, so it is closed for sign-in. Ask your teacher.";

export class ClassroomSignInError extends Error {}

const studentKey = (code: string, name: string) => `classroom:${code}/${normaliseDisplayName(name)}`;
const classKey = (code: string) => `classroom:${code}`;
/** Unknown codes: counted per typed code and, above all, per network address. */
const unknownCodeKeys = (code: string, address: string) => ({
  email: `classroom-code:${code}`,
  address: `classroom-code-from:${address}`,
});

function lockedMessage(error: SignInLockedError): string {
  const minutes = Math.max(1, Math.ceil(error.retryAfterMs / 60_000));
  return `Too many wrong tries. Wait ${minutes} minute${minutes === 1 ? "" : "s"}, or ask your teacher to reset your PIN.`;
}

async function checkThrottle(keys: { email: string; address: string }, now: Date) {
  try {
    await assertSignInAllowed({ ...keys, now });
  } catch (error) {
    if (error instanceof SignInLockedError) throw new ClassroomSignInError(lockedMessage(error));
    throw error;
  }
}

/**
 * The classroom credentials check used by next-auth's "classroom" provider.
 * Returns the student's user, or throws ClassroomSignInError with a message
 * meant for the student.
 */
export async function authoriseClassroomSignIn({
  raw,
  address,
  now = new Date(),
}: {
  raw: unknown;
  address: string;
  now?: Date;
}): Promise<{ id: string; name: string }> {
  const parsed = classroomSignInSchema.safeParse(raw ?? {});
  if (!parsed.success) throw new ClassroomSignInError(parsed.error.issues[0]?.message ?? WRONG_NAME_OR_PIN);
  const { code, displayName, pin } = parsed.data;

  await checkThrottle(unknownCodeKeys(code, address), now);
  const room = await findClassroomByJoinCode({ joinCode: code });
  if (!room) {
    await recordSignInFailure({ ...unknownCodeKeys(code, address), now });
    throw new ClassroomSignInError(WRONG_CODE);
  }
  const keys = { email: studentKey(code, displayName), address: classKey(code) };
  await checkThrottle(keys, now);
  if (room.archivedAt) throw new ClassroomSignInError(CLASSROOM_ARCHIVED);

  const member = await findMemberByDisplayName({ classroomId: room.id, displayName });
  const ok = await verifyPin(pin, member?.pinHash);
  if (!member || !ok || member.disabledAt) {
    await recordSignInFailure({ ...keys, now });
    throw new ClassroomSignInError(WRONG_NAME_OR_PIN);
  }
  await recordSignInSuccess({ email: keys.email });
  return { id: member.userId, name: member.displayName };
}

/**
 * A student joins an open classroom with its code and gets a fresh PIN,
 * shown once. Refused (and nothing stored) when the code is unknown, the
 * educator has not opened joining, the class is full or archived, or the
 * name is already taken there.
 */
export async function joinClassroom({
  input,
  address,
  now = new Date(),
}: {
  input: JoinClassroomInput;
  address: string;
  now?: Date;
}): Promise<{ displayName: string; pin: string; code: string; classroomName: string }> {
  try {
    await assertSignInAllowed({ ...unknownCodeKeys(input.code, address), now });
  } catch (error) {
    if (error instanceof SignInLockedError) throw new AppError("rate_limited", lockedMessage(error));
    throw error;
  }
  const room = await findClassroomByJoinCode({ joinCode: input.code });
  if (!room) {
    await recordSignInFailure({ ...unknownCodeKeys(input.code, address), now });
    throw new AppError("not_found", WRONG_CODE, { issues: [{ path: "code", message: WRONG_CODE }] });
  }
  if (room.archivedAt) throw new AppError("conflict", CLASSROOM_ARCHIVED);
  if (!room.joinOpen) {
    throw new AppError(
      "conflict",
      "This classroom is not open for joining. Ask your teacher for a sign-in card, or to open joining.",
    );
  }
  const pin = makePin();
  try {
    const [created] = await createStudentsInClassroom({
      classroomId: room.id,
      capacity: room.capacity,
      students: [{ displayName: input.displayName, pinHash: await hashPin(pin) }],
      instrument: await classInstrumentOf(room.id),
    });
    if (!created) throw new Error("no student created");
    return { displayName: created.displayName, pin, code: room.joinCode, classroomName: room.name };
  } catch (error) {
    if (error instanceof AppError && error.code === "conflict" && error.issues) {
      // The name clash, said to the student rather than to the educator.
      throw new AppError(
        "conflict",
        "Someone in this classroom already uses that name. Add an initial, e.g. Sam T.",
        {
          issues: [
            {
              path: "displayName",
              message: "Someone in this classroom already uses that name. Add an initial, e.g. Sam T.",
            },
          ],
        },
      );
    }
    if (error instanceof AppError && error.code === "conflict") {
      throw new AppError("conflict", "This classroom is full. Ask your teacher.");
    }
    throw error;
  }
}
