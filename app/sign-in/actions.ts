"use server";
// Password forms post here (never by GET, so a password never lands in an address, a history or a log) and work before
// or without the page's scripts; scripts only keep the page in place while the answer comes.
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { getDb } from "@/db";
import { acceptInvitation } from "@/lib/admin/invitations";
import { safeNext, startSession } from "@/lib/auth/session-cookie";
import { signInWithPassword, WRONG_CREDENTIALS } from "@/lib/auth/sign-in";
import { AppError } from "@/lib/errors";
import { clientAddress, takeOrRefuse } from "@/lib/http/rate-limit";

export interface PasswordFormState {
  errors: string[];
  email: string;
}

/** As long as the invitation form allows; bounded before it reaches the (deliberately slow) hash. */
const MAX_PASSWORD = 256;

function field(form: FormData, name: string, max: number): string {
  const v = form.get(name);
  return typeof v === "string" ? v.slice(0, max) : "";
}

export async function signInAction(_prev: PasswordFormState, form: FormData): Promise<PasswordFormState> {
  const email = field(form, "email", 254).trim();
  const raw = form.get("password");
  const password = typeof raw === "string" ? raw : "";
  if (!email || !password) return { errors: ["Enter your e-mail and your password."], email };
  if (password.length > MAX_PASSWORD) return { errors: [WRONG_CREDENTIALS], email };
  try {
    await startSession(await signInWithPassword(await getDb(), email, password, new Date(), { address: clientAddress(await headers()) }));
  } catch (e) {
    if (e instanceof AppError) return { errors: [e.message], email };
    throw e;
  }
  redirect(safeNext(form.get("next")));
}

export async function acceptInvitationAction(_prev: PasswordFormState, form: FormData): Promise<PasswordFormState> {
  const token = field(form, "token", 200);
  const password = field(form, "password", MAX_PASSWORD + 1);
  const again = field(form, "again", MAX_PASSWORD + 1);
  if (password !== again) return { errors: ["The two passwords differ."], email: "" };
  if (password.length > MAX_PASSWORD) return { errors: [`A password may have at most ${MAX_PASSWORD} characters.`], email: "" };
  const db = await getDb();
  try {
    await takeOrRefuse(db, "invitationByAddress", `address ${clientAddress(await headers())}`);
    const { email } = await acceptInvitation(db, token, password);
    await startSession(await signInWithPassword(db, email, password));
  } catch (e) {
    if (e instanceof AppError) return { errors: e.issues?.length ? e.issues.map((i) => i.message) : [e.message], email: "" };
    throw e;
  }
  redirect("/");
}
