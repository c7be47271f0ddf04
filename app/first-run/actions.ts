"use server";
// The first-run form of a new install posts here: the one-time token printed on the server's console, the lab and its
// first administrator. Works without the page's scripts; then signs the administrator in.
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { getDb } from "@/db";
import { firstRunSetup, setupSchema } from "@/lib/admin/setup";
import { startSession } from "@/lib/auth/session-cookie";
import { signInWithPassword } from "@/lib/auth/sign-in";
import { AppError } from "@/lib/errors";
import { clientAddress, takeOrRefuse } from "@/lib/http/rate-limit";

export interface FirstRunState {
  errors: string[];
  values: Record<string, string>;
}

const text = (form: FormData, name: string, max: number) => {
  const v = form.get(name);
  return typeof v === "string" ? v.slice(0, max) : "";
};

export async function firstRunAction(_prev: FirstRunState, form: FormData): Promise<FirstRunState> {
  const values = { lab: text(form, "lab", 300), slug: text(form, "slug", 100), adminName: text(form, "adminName", 300), adminEmail: text(form, "adminEmail", 300) };
  const token = text(form, "token", 200).trim();
  const password = text(form, "password", 300);
  if (password !== text(form, "again", 300)) return { errors: ["The two passwords differ."], values };
  if (!token) return { errors: ["Enter the set-up token the server printed on its console when it started."], values };
  const db = await getDb();
  try {
    await takeOrRefuse(db, "invitationByAddress", `address ${clientAddress(await headers())}`);
    const parsed = setupSchema.safeParse({ ...values, password });
    if (!parsed.success) return { errors: parsed.error.issues.map((i) => i.message), values };
    await firstRunSetup(db, token, parsed.data);
    await startSession(await signInWithPassword(db, parsed.data.adminEmail, password));
  } catch (e) {
    if (e instanceof AppError) return { errors: e.issues?.length ? e.issues.map((i) => i.message) : [e.message], values };
    throw e;
  }
  redirect("/admin/members");
}
