import NextAuth from "next-auth";

import { getAuthOptions } from "@/lib/auth/options";

type Context = { params: Promise<{ nextauth: string[] }> };

// Options are built on first use so that importing this module at build time
// opens no database.
async function handler(request: Request, context: Context) {
  return NextAuth(request as never, context as never, getAuthOptions());
}

export { handler as GET, handler as POST };
