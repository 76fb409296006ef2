import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";

import { requestResetAction, resetPasswordAction } from "@/app/(auth)/reset-password/actions";
import { signUpAction } from "@/app/(auth)/sign-up/actions";
import { getDb } from "@/db/client";
import { listCapturedMail } from "@/db/queries/mail";
import { getObserverByUserId, listInstrumentsByObserver } from "@/db/queries/observers";
import { getUserByEmail } from "@/db/queries/users";
import { users } from "@/db/schema";
import { verifyPassword } from "@/lib/auth/password";
import { requireRole } from "@/lib/auth/session";
import {
  assertSignInAllowed,
  recordSignInFailure,
  recordSignInSuccess,
  SignInLockedError,
  THROTTLE_RULES,
} from "@/lib/auth/throttle";
import { resetEnvCache } from "@/lib/env";
import { AppError } from "@/lib/http/errors";
import { startMailSink } from "@/lib/mail/sink";

import { apiRequest, makeUser } from "./support";

function form(values: Record<string, string>) {
  const data = new FormData();
  for (const [k, v] of Object.entries(values)) data.set(k, v);
  return data;
}

describe("the role guard", () => {
  it("answers who is calling from the session cookie, with the role from the database", async () => {
    const { user } = await makeUser({ role: "observer" });
    const request = await apiRequest("/x", { userId: user.id });
    await expect(requireRole(["observer"], { request })).resolves.toMatchObject({
      id: user.id,
      role: "observer",
    });
    await expect(requireRole(["coordinator"], { request })).rejects.toMatchObject({ code: "forbidden" });
    // A role change takes effect on the next request, without signing in again.
    await getDb().update(users).set({ role: "coordinator" }).where(eq(users.id, user.id));
    await expect(requireRole(["coordinator"], { request })).resolves.toMatchObject({ role: "coordinator" });
  });

  it("refuses a missing or forged cookie", async () => {
    await expect(requireRole(["observer"], { request: await apiRequest("/x") })).rejects.toBeInstanceOf(
      AppError,
    );
    const forged = await apiRequest("/x", {
      headers: { cookie: "next-auth.session-token=eyJhbGciOiJub25lIn0.e30." },
    });
    await expect(requireRole(["observer"], { request: forged })).rejects.toMatchObject({
      code: "unauthenticated",
    });
  });

  it("lets an admin act for a coordinator but not keep a Logbook", async () => {
    const { user } = await makeUser({ role: "admin" });
    const request = await apiRequest("/x", { userId: user.id });
    await expect(requireRole(["coordinator"], { request })).resolves.toMatchObject({ role: "admin" });
    await expect(requireRole(["observer", "student"], { request })).rejects.toMatchObject({
      code: "forbidden",
    });
  });
});

describe("failed sign-in throttle", () => {
  const t0 = new Date("2026-05-01T10:00:00Z");

  it("locks an account after repeated failures, then lets it in again later", async () => {
    const email = "throttle-a@example.test";
    const address = "192.0.2.10";
    for (let i = 0; i < THROTTLE_RULES.account.maxFailures; i++) {
      await assertSignInAllowed({ email, address, now: t0 });
      await recordSignInFailure({ email, address, now: t0 });
    }
    await expect(assertSignInAllowed({ email, address, now: t0 })).rejects.toBeInstanceOf(SignInLockedError);
    // The same account from another address is still locked.
    await expect(assertSignInAllowed({ email, address: "192.0.2.99", now: t0 })).rejects.toThrow(
      /Too many failed sign-ins/,
    );
    const later = new Date(t0.getTime() + THROTTLE_RULES.account.lockMs + 1000);
    await expect(assertSignInAllowed({ email, address: "192.0.2.99", now: later })).resolves.toBeUndefined();
  });

  it("locks an address that sprays many accounts", async () => {
    const address = "192.0.2.20";
    for (let i = 0; i < THROTTLE_RULES.address.maxFailures; i++) {
      await recordSignInFailure({ email: `spray-${i}@example.test`, address, now: t0 });
    }
    await expect(
      assertSignInAllowed({ email: "fresh@example.test", address, now: t0 }),
    ).rejects.toBeInstanceOf(SignInLockedError);
  });

  it("forgets an account's failures after a success", async () => {
    const email = "throttle-b@example.test";
    for (let i = 0; i < THROTTLE_RULES.account.maxFailures - 1; i++)
      await recordSignInFailure({ email, address: "192.0.2.30", now: t0 });
    await recordSignInSuccess({ email });
    await recordSignInFailure({ email, address: "192.0.2.31", now: t0 });
    await expect(assertSignInAllowed({ email, address: "192.0.2.31", now: t0 })).resolves.toBeUndefined();
  });
});

describe("sign-up and password reset", () => {
  it("creates an observer with a profile and a first instrument, all or nothing", async () => {
    const state = await signUpAction(
      { ok: false },
      form({
        name: "Quinn Example",
        email: "Quinn@Example.test",
        password: "sunny days ahead",
        confirmPassword: "sunny days ahead",
        country: "nz",
        timeZone: "Pacific/Auckland",
      }),
    );
    expect(state).toEqual({ ok: true });
    const user = await getUserByEmail({ email: "quinn@example.test" });
    expect(user?.role).toBe("observer");
    const observer = await getObserverByUserId({ userId: user!.id });
    expect(observer).toMatchObject({ country: "NZ", timeZone: "Pacific/Auckland" });
    expect(observer?.code).toMatch(/^HT-/);
    expect(await listInstrumentsByObserver({ observerId: observer!.id })).toHaveLength(1);
  });

  it("refuses a duplicate address and bad fields without storing anything", async () => {
    const again = await signUpAction(
      { ok: false },
      form({
        name: "Quinn Again",
        email: "quinn@example.test",
        password: "sunny days ahead",
        confirmPassword: "sunny days ahead",
        timeZone: "UTC",
      }),
    );
    expect(again.fieldErrors?.email).toMatch(/exists/);
    const bad = await signUpAction(
      { ok: false },
      form({ name: "Q", email: "nope", password: "short", confirmPassword: "x", timeZone: "Nowhere/Land" }),
    );
    expect(Object.keys(bad.fieldErrors ?? {}).sort()).toEqual([
      "confirmPassword",
      "email",
      "name",
      "password",
      "timeZone",
    ]);
    expect(await getUserByEmail({ email: "nope" })).toBeNull();
  });

  it("e-mails a reset link through SMTP that sets a new password once", async () => {
    const sink = await startMailSink({ port: 0 });
    process.env.SMTP_PORT = String(sink.port);
    resetEnvCache();
    try {
      const requested = await requestResetAction({ ok: false }, form({ email: "quinn@example.test" }));
      expect(requested.ok).toBe(true);
      const [mail] = await listCapturedMail({ limit: 1 });
      expect(mail?.toAddress).toBe("quinn@example.test");
      const token = /reset-password\/([A-Za-z0-9_-]+)/.exec(mail?.textBody ?? "")?.[1];
      expect(token).toBeTruthy();

      const done = await resetPasswordAction(
        { ok: false },
        form({ token: token!, password: "a brand new one", confirmPassword: "a brand new one" }),
      );
      expect(done.ok).toBe(true);
      const user = await getUserByEmail({ email: "quinn@example.test" });
      expect(await verifyPassword("a brand new one", user?.passwordHash)).toBe(true);

      const reused = await resetPasswordAction(
        { ok: false },
        form({ token: token!, password: "another new one", confirmPassword: "another new one" }),
      );
      expect(reused.ok).toBe(false);
      expect(reused.message).toMatch(/expired or was already used/);
    } finally {
      await sink.close();
    }
  });

  it("answers the same for an unknown address and sends nothing", async () => {
    const before = (await listCapturedMail({ limit: 100 })).length;
    const state = await requestResetAction({ ok: false }, form({ email: "nobody-here@example.test" }));
    expect(state.ok).toBe(true);
    expect((await listCapturedMail({ limit: 100 })).length).toBe(before);
  });
});
