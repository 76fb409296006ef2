export const ROLES = ["observer", "coordinator", "educator", "student", "admin"] as const;
export type Role = (typeof ROLES)[number];

/** Roles that keep a Logbook of their own (they have an observer profile). */
export const LOGGING_ROLES = ["observer", "student"] as const satisfies readonly Role[];

/**
 * Whether a user holding `role` may act as `required`. Admins stand in for
 * coordinators and educators (they run the system) but keep no Logbook.
 */
export function roleSatisfies({ role, required }: { role: Role; required: readonly Role[] }): boolean {
  if (required.includes(role)) return true;
  if (role === "admin") return required.some((r) => r === "coordinator" || r === "educator");
  return false;
}

export const ROLE_LABELS: Record<Role, string> = {
  observer: "Observer",
  coordinator: "Coordinator",
  educator: "Educator",
  student: "Student",
  admin: "Admin",
};

/** Where each role lands after signing in. */
export const ROLE_HOME: Record<Role, string> = {
  observer: "/logbook",
  student: "/logbook",
  coordinator: "/review",
  educator: "/classrooms",
  admin: "/admin",
};
