// next-auth configuration: e-mail + password, JWT sessions carrying user, lab and role.
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { getDb } from "@/db";
import { endSessions } from "@/db/queries/users";
import { AppError } from "@/lib/errors";
import { isRole } from "@/lib/permissions/roles";
import { authSecret } from "./secret";
import { clientAddress } from "@/lib/http/rate-limit";
import { signInWithPassword } from "./sign-in";

export const SESSION_HOURS = 10;

export const authOptions: NextAuthOptions = {
  secret: authSecret(),
  session: { strategy: "jwt", maxAge: SESSION_HOURS * 3600 },
  pages: { signIn: "/sign-in", error: "/sign-in" },
  providers: [
    CredentialsProvider({
      name: "Halflight account",
      credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
      async authorize(credentials, req) {
        const email = credentials?.email?.trim() ?? "";
        const password = credentials?.password ?? "";
        if (!email || !password) throw new Error("Enter your e-mail and your password.");
        try {
          const u = await signInWithPassword(await getDb(), email, password, new Date(), { address: clientAddress(new Headers(req.headers as Record<string, string>)) });
          return { id: String(u.userId), email: u.email, name: u.name, labId: u.labId, role: u.role, sv: u.sessionVersion ?? 0 };
        } catch (e) {
          // next-auth passes the thrown message to the sign-in form.
          if (e instanceof AppError) throw new Error(e.message);
          throw e;
        }
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        const u = user as { id: string; labId?: number; role?: string; sv?: number };
        token.uid = Number(u.id);
        token.sv = u.sv ?? 0;
        token.labId = u.labId;
        token.role = isRole(u.role) ? u.role : undefined;
      }
      return token;
    },
    async session({ session, token }) {
      return { ...session, uid: token.uid, labId: token.labId, role: token.role, sv: token.sv };
    },
  },
  events: {
    // Signing out ends the session everywhere: the old token no longer matches the user's session version.
    async signOut({ token }) {
      if (token?.uid) await endSessions(await getDb(), token.uid);
    },
  },
};

declare module "next-auth/jwt" {
  interface JWT {
    uid?: number;
    labId?: number;
    role?: import("@/lib/permissions/roles").Role;
    sv?: number;
  }
}
