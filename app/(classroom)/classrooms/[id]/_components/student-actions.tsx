"use client";

import Link from "next/link";
import { useEffect, useState } from "react";

import { useValidatedAction } from "@/components/classrooms/use-validated-action";
import { moveStudentSchema, removeStudentSchema, studentActionSchema } from "@/lib/validation/classroom";

import type { FormState } from "@/lib/validation/form-state";

import { moveStudentAction, removeStudentAction, resetPinAction, type ResetPinState } from "../actions";
import { rememberIssuedPins } from "./card-store";

const small =
  "rounded border border-ink-200 bg-white px-2 py-1 text-xs font-semibold text-ink-800 hover:bg-ink-50 disabled:text-ink-300";

/** Reset PIN, move and remove for one student row. */
export function StudentActions({
  classroomId,
  student,
  otherClassrooms,
  archived,
}: {
  classroomId: string;
  student: { userId: string; displayName: string };
  otherClassrooms: Array<{ id: string; name: string }>;
  archived: boolean;
}) {
  const {
    state: reset,
    onSubmit: resetAction,
    pending: resetting,
    ready,
  } = useValidatedAction(resetPinAction, { ok: false } as ResetPinState, studentActionSchema);
  const {
    state: moved,
    onSubmit: moveAction,
    pending: moving,
  } = useValidatedAction(moveStudentAction, { ok: false } as FormState, moveStudentSchema);
  const {
    state: removed,
    onSubmit: removeAction,
    pending: removing,
  } = useValidatedAction(removeStudentAction, { ok: false } as FormState, removeStudentSchema);
  const [confirming, setConfirming] = useState(false);

  useEffect(() => {
    if (reset.ok && reset.issued) rememberIssuedPins(classroomId, [reset.issued]);
  }, [reset, classroomId]);

  const messages = [reset, moved, removed].filter((s) => s.message);
  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center gap-2">
        {!archived ? (
          <form onSubmit={resetAction}>
            <input type="hidden" name="classroomId" value={classroomId} />
            <input type="hidden" name="studentUserId" value={student.userId} />
            <button
              type="submit"
              className={small}
              disabled={!ready || resetting}
              aria-label={`Reset the PIN of ${student.displayName}`}
            >
              Reset PIN
            </button>
          </form>
        ) : null}
        {!archived && otherClassrooms.length > 0 ? (
          <form onSubmit={moveAction} className="flex items-center gap-1">
            <input type="hidden" name="classroomId" value={classroomId} />
            <input type="hidden" name="studentUserId" value={student.userId} />
            <select
              name="targetClassroomId"
              aria-label={`Move ${student.displayName} to`}
              className="rounded border border-ink-200 px-1 py-1 text-xs"
            >
              {otherClassrooms.map((room) => (
                <option key={room.id} value={room.id}>
                  {room.name}
                </option>
              ))}
            </select>
            <button type="submit" className={small} disabled={!ready || moving}>
              Move
            </button>
          </form>
        ) : null}
        {confirming ? (
          <form onSubmit={removeAction} className="flex items-center gap-1">
            <input type="hidden" name="classroomId" value={classroomId} />
            <input type="hidden" name="studentUserId" value={student.userId} />
            <input type="hidden" name="confirm" value="remove" />
            <span className="text-xs text-caution-800">
              Delete {student.displayName} and all their counts?
            </span>
            <button
              type="submit"
              className={`${small} border-caution-200 text-caution-800`}
              disabled={!ready || removing}
            >
              Yes, remove
            </button>
            <button type="button" className={small} onClick={() => setConfirming(false)}>
              Keep
            </button>
          </form>
        ) : (
          <button
            type="button"
            className={small}
            onClick={() => setConfirming(true)}
            aria-label={`Remove ${student.displayName}`}
          >
            Remove
          </button>
        )}
      </div>
      {messages.map((s, i) => (
        <p
          key={i}
          role={s.ok ? "status" : "alert"}
          className={`text-xs ${s.ok ? "text-meadow-700" : "text-caution-700"}`}
        >
          {s.message}
          {s === reset && reset.ok ? (
            <>
              {" "}
              <Link href={`/classrooms/${classroomId}/cards`} className="font-semibold underline">
                Print a new card
              </Link>
            </>
          ) : null}
        </p>
      ))}
    </div>
  );
}
