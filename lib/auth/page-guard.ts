import "server-only";

import { forbidden, redirect } from "next/navigation";

import { AppError } from "@/lib/http/errors";

import type { Role } from "./roles";
import { requireRole, type SessionUser } from "./session";

/**
 * The guard for layouts and pages: the same check as requireRole, answered
 * the way a browser expects (sign-in page, or the 403 page).
 */
export async function requirePageRole(roles: readonly Role[]): Promise<SessionUser> {
  try {
    return await requireRole(roles);
  } catch (error) {
    if (error instanceof AppError && error.code === "unauthenticated") redirect("/sign-in");
    if (error instanceof AppError && error.code === "forbidden") forbidden();
    throw error;
  }
}
