import "server-only";

import { DrizzleAdapter } from "@auth/drizzle-adapter";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import EmailProvider from "next-auth/providers/email";

import { getDb } from "@/db/client";
import { getUserByEmail, getUserById } from "@/db/queries/users";
import { accounts, sessions, users, verificationTokens } from "@/db/schema";
import { authoriseClassroomSignIn, ClassroomSignInError } from "@/lib/classrooms/students";
import { sendMail } from "@/lib/mail/send";
import { signInLinkMessage } from "@/lib/mail/templates";
import { credentialsSchema } from "@/lib/validation/account";

import { verifyPassword } from "./password";
import { getAuthSecret } from "./secret";
import { assertSignInAllowed, recordSignInFailure, recordSignInSuccess, SignInLockedError } from "./throttle";
import { getEnv } from "../env";

const env = getEnv();

function clientAddress(headers: Record<string, unknown> | undefined): string {
  const forwarded = headers?.["x-forwarded-for"];
  const first = typeof forwarded === "string" ? forwarded.split(",")[0]?.trim() : undefined;
  const real = headers?.["x-real-ip"];
  return first || (typeof real === "string" ? real : "") || "local";
}

export const INVALID_CREDENTIALS = "That e-mail address and password do not match an account.";

let options: NextAuthOptions | undefined;

export function getAuthOptions(): NextAuthOptions {
  if (options) return options;
  options = {
    secret: getAuthSecret(),
    // Credentials sign-in only works with JWT sessions; the database is still
    // consulted on every request (lib/auth/session.ts) so role changes and
    // disabled accounts take effect at once.
    session: { strategy: "jwt", maxAge: 30 * 24 * 60 * 60 },
    // Our tables carry extra columns (role, password hash...) beyond the
    // adapter's declared shape, hence the cast.
    adapter: DrizzleAdapter(getDb(), {
      usersTable: users,
      accountsTable: accounts,
      sessionsTable: sessions,
      verificationTokensTable: verificationTokens,
    } as never) as NextAuthOptions["adapter"],
    pages: { signIn: "/sign-in", verifyRequest: "/sign-in/check-email", error: "/sign-in" },
    providers: [
      CredentialsProvider({
        id: "credentials",
        name: "E-mail and password",
        credentials: {
          email: { label: "E-mail", type: "email" },
          password: { label: "Password", type: "password" },
        },
        async authorize(raw, req) {
          const parsed = credentialsSchema.safeParse(raw ?? {});
          if (!parsed.success) throw new Error(INVALID_CREDENTIALS);
          const { email, password } = parsed.data;
          const address = clientAddress(req?.headers);
          try {
            await assertSignInAllowed({ email, address });
          } catch (error) {
            if (error instanceof SignInLockedError) throw new Error(error.message);
            throw error;
          }
          const user = await getUserByEmail({ email });
          const ok = await verifyPassword(password, user?.passwordHash);
          if (!user || !ok || user.disabledAt) {
            await recordSignInFailure({ email, address });
            throw new Error(INVALID_CREDENTIALS);
          }
          await recordSignInSuccess({ email });
          return { id: user.id, email: user.email, name: user.name };
        },
      }),
      // Students: classroom code, display name and PIN (lib/classrooms/students.ts).
      CredentialsProvider({
        id: "classroom",
        name: "Classroom code and PIN",
        credentials: {
          code: { label: "Classroom code" },
          displayName: { label: "Your name" },
          pin: { label: "PIN", type: "password" },
        },
        async authorize(raw, req) {
          try {
            const student = await authoriseClassroomSignIn({ raw, address: clientAddress(req?.headers) });
            return { id: student.id, name: student.name, email: null };
          } catch (error) {
            if (error instanceof ClassroomSignInError) throw new Error(error.message);
            throw error;
          }
        },
      }),
      EmailProvider({
        server: { host: env.SMTP_HOST, port: env.SMTP_PORT },
        from: env.MAIL_FROM,
        maxAge: 24 * 60 * 60,
        async sendVerificationRequest({ identifier, url }) {
          // Only existing accounts get a link; the page says the same either
          // way so the form cannot be used to find out who has an account.
          const user = await getUserByEmail({ email: identifier });
          if (!user || user.disabledAt) return;
          const { host } = new URL(url);
          await sendMail({ to: identifier, ...signInLinkMessage({ url, host }) });
        },
      }),
    ],
    callbacks: {
      async signIn({ user, account }) {
        if (account?.provider !== "email") return true;
        // Sign-in links never create accounts: sign-up is its own page.
        const existing = user.email ? await getUserByEmail({ email: user.email }) : null;
        return Boolean(existing && !existing.disabledAt);
      },
      async jwt({ token, user }) {
        if (user) token.sub = user.id;
        return token;
      },
      async session({ session, token }) {
        const user = token.sub ? await getUserById({ userId: token.sub }) : null;
        if (user) session.user = { ...session.user, id: user.id, role: user.role, name: user.name };
        return session;
      },
    },
  };
  return options;
}
