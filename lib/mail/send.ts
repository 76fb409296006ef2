import "server-only";

import nodemailer, { type Transporter } from "nodemailer";

import { getEnv } from "@/lib/env";

let transporter: Transporter | undefined;

function getTransporter(): Transporter {
  if (transporter) return transporter;
  const env = getEnv();
  transporter = nodemailer.createTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure: env.SMTP_SECURE,
    auth: env.SMTP_USER ? { user: env.SMTP_USER, pass: env.SMTP_PASSWORD ?? "" } : undefined,
    // The local sink speaks plain SMTP; never let a missing TLS upgrade stall a send.
    ignoreTLS: !env.SMTP_SECURE && env.SMTP_HOST === "127.0.0.1",
    connectionTimeout: 5_000,
  });
  return transporter;
}

export type MailMessage = { to: string; subject: string; text: string; html?: string };

export async function sendMail(message: MailMessage): Promise<void> {
  await getTransporter().sendMail({ from: getEnv().MAIL_FROM, ...message });
}
