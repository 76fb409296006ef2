import "server-only";

import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";

import { storeCapturedMail } from "@/db/queries/mail";

/**
 * A local SMTP server that accepts every message and keeps it in the
 * database, where the admin pages list it. It stands in for a real mail
 * relay in development and demo mode: nothing leaves the machine.
 */
export async function startMailSink({
  port,
  host = "127.0.0.1",
  log = () => {},
}: {
  port: number;
  host?: string;
  log?: (line: string) => void;
}): Promise<{ port: number; close: () => Promise<void> }> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    banner: "Heliotally local mail sink",
    size: 5 * 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (mail) => {
          const to = session.envelope.rcptTo.map((r) => r.address).join(", ");
          await storeCapturedMail({
            fromAddress: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
            toAddress: to,
            subject: mail.subject ?? "(no subject)",
            textBody: mail.text ?? null,
            htmlBody: typeof mail.html === "string" ? mail.html : null,
          });
          log(`mail sink: kept "${mail.subject ?? ""}" for ${to}`);
          callback();
        })
        .catch((error: unknown) => callback(error instanceof Error ? error : new Error(String(error))));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => resolve());
  });
  const address = server.server.address();
  const boundPort = typeof address === "object" && address ? address.port : port;
  return {
    port: boundPort,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
