// Outgoing mail through SMTP_URL (the local fake in demo and tests, a real relay in production).
import nodemailer from "nodemailer";

let transport: nodemailer.Transporter | null = null;

function getTransport() {
  if (!transport) {
    const url = process.env.SMTP_URL;
    if (!url) throw new Error("SMTP_URL is not set");
    transport = nodemailer.createTransport(url);
  }
  return transport;
}

/** `labId`: the lab the mail is about, so the demo mailbox shows it to that lab's leads only (none: nobody). */
export type Mail = { to: string; subject: string; text: string; html?: string; labId?: string };

export const LAB_HEADER = "X-Rustline-Lab";

export async function sendMail({ labId, ...mail }: Mail) {
  await getTransport().sendMail({
    from: process.env.MAIL_FROM ?? "Rustline <no-reply@rustline.local>",
    ...mail,
    ...(labId ? { headers: { [LAB_HEADER]: labId } } : {}),
  });
}

export function appUrl(path: string) {
  const base = process.env.APP_URL ?? process.env.NEXTAUTH_URL ?? "http://localhost:3000";
  return new URL(path, base).toString();
}
