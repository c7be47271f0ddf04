// Lab settings: outside-reviewer share links, their default expiry, the upload limit and the password rules.
import type { Knex } from "knex";
import { getLabSettingsRow, upsertLabSettings } from "@/db/queries/admin";
import { recordAudit } from "@/lib/audit";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { AppError } from "@/lib/errors";
import type { LabSettingsInput } from "@/lib/schemas/admin";

export interface LabSettings {
  outside_links: boolean;
  default_link_days: number;
  upload_limit_mb: number;
  password_min_length: number;
  updated_at: string | null;
}

/** What a lab has before an administrator changes anything. */
export const DEFAULT_SETTINGS: LabSettings = { outside_links: false, default_link_days: 14, upload_limit_mb: 50, password_min_length: 12, updated_at: null };

export async function getLabSettings(db: Knex | Knex.Transaction, labId: number): Promise<LabSettings> {
  const row = await getLabSettingsRow(db, labId);
  if (!row) return DEFAULT_SETTINGS;
  return { outside_links: Boolean(row.outside_links), default_link_days: row.default_link_days, upload_limit_mb: row.upload_limit_mb, password_min_length: row.password_min_length, updated_at: row.updated_at };
}

export async function changeLabSettings(db: Knex, admin: SignedInUser, input: LabSettingsInput) {
  const { reason, ...next } = input;
  const old = await getLabSettings(db, admin.labId);
  return db.transaction(async (trx) => {
    const updated_at = new Date().toISOString();
    await upsertLabSettings(trx, { lab_id: admin.labId, ...next, updated_at });
    await recordAudit(trx, {
      labId: admin.labId,
      actorUserId: admin.userId,
      action: "lab.settings_changed",
      objectType: "lab",
      objectId: admin.labId,
      oldValues: { outside_links: old.outside_links, default_link_days: old.default_link_days, upload_limit_mb: old.upload_limit_mb, password_min_length: old.password_min_length },
      newValues: next,
      reason,
    });
    return { ...next, updated_at };
  });
}

/** The lab's password rules: a minimum length, and not the e-mail address or its name part. Returns the problems. */
export function passwordProblems(password: string, email: string, minLength: number): string[] {
  const out: string[] = [];
  if (password.length < minLength) out.push(`Use at least ${minLength} characters (this one has ${password.length}).`);
  const p = password.toLowerCase();
  const e = email.trim().toLowerCase();
  const local = e.split("@")[0] ?? "";
  if (p === e || p.includes(e) || (local.length >= 3 && p.includes(local))) out.push("Do not use your e-mail address, or its name part, in the password.");
  if (password.length > 0 && new Set(password).size === 1) out.push("Do not repeat one character.");
  return out;
}

export function assertPassword(password: string, email: string, minLength: number): void {
  const problems = passwordProblems(password, email, minLength);
  if (problems.length) throw new AppError({ code: "unprocessable", message: problems.join(" "), issues: problems.map((message) => ({ path: "password", message })) });
}
