import { describe, expect, it } from "vitest";

import { openDatabase } from "@/db/client";

// The scale-out path cannot be exercised end to end here (no libSQL server can
// be installed on this machine); these checks go as far as the client allows:
// the same code builds a remote client for server URLs and uses it.
describe("DATABASE_URL kinds", () => {
  it("opens the embedded file database by default", async () => {
    const db = openDatabase({ url: process.env.DATABASE_URL! });
    expect(db.$client.protocol).toBe("file");
    await expect(db.$client.execute("select 1 as one")).resolves.toMatchObject({ rows: [{ one: 1 }] });
    db.$client.close();
  });

  it("builds a remote client for an http(s) libSQL server URL and really sends to it", async () => {
    const db = openDatabase({ url: "http://127.0.0.1:9" });
    expect(db.$client.protocol).toBe("http");
    // Port 9 (discard) has no listener here: the query must fail on the network, not on a local file.
    await expect(db.$client.execute("select 1")).rejects.toThrow();
    db.$client.close();
  });

  it("builds a remote client for a libsql:// URL", () => {
    const db = openDatabase({ url: "libsql://db.example.test" });
    expect(["ws", "wss", "http", "https"]).toContain(db.$client.protocol);
    db.$client.close();
  });
});
