// Outgoing mail through nodemailer over SMTP_URL (a local sink in the demo and tests; never a hosted service). Mail
// is sent after the change it reports has committed, and a failure to send never undoes that change.
import nodemailer from "nodemailer";

export interface Mail {
  to: string[];
  subject: string;
  text: string;
  html: string;
}

const FROM = process.env.MAIL_FROM ?? "Halflight <halflight@localhost>";

export function appUrl(path: string): string {
  return `${(process.env.NEXTAUTH_URL ?? "http://localhost:3000").replace(/\/$/, "")}${path}`;
}

export async function sendMail(mail: Mail): Promise<boolean> {
  const url = process.env.SMTP_URL;
  if (mail.to.length === 0) return false;
  if (!url && process.env.MAIL_TRANSPORT === "log") {
    // Chosen on purpose (MAIL_TRANSPORT=log): the message goes to the server log instead of a mail server.
    console.log(`mail (MAIL_TRANSPORT=log) to ${mail.to.join(", ")}: ${mail.subject}\n${mail.text}`);
    return true;
  }
  if (!url) return false;
  try {
    const transport = nodemailer.createTransport(url);
    await transport.sendMail({ from: FROM, to: mail.to.join(", "), subject: mail.subject, text: mail.text, html: mail.html });
    return true;
  } catch (e) {
    console.error(`mail to ${mail.to.join(", ")} not sent: ${(e as Error).message}`);
    return false;
  }
}

const esc = (s: string) => s.replace(/[&<>"]/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;" })[c]!);

/** A plain message with one link; nothing secret beyond the link itself. */
export function linkMail(to: string[], subject: string, lines: string[], link: string): Mail {
  return {
    to,
    subject,
    text: `${lines.join("\n")}\n\n${link}\n\n-- Halflight`,
    html: `${lines.map((l) => `<p>${esc(l)}</p>`).join("")}<p><a href="${esc(link)}">${esc(link)}</a></p><p>-- Halflight</p>`,
  };
}
