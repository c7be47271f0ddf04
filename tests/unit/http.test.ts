// The error envelope and the client fetcher (STYLE.md 3-4).
import { afterEach, describe, expect, it, vi } from "vitest";
import { z } from "zod";
import { AppError } from "@/lib/errors";
import { toErrorBody } from "@/lib/http/errors";
import { fetcher, FetchError } from "@/lib/http/fetcher";
import { freshDb } from "../helpers/db";

describe("toErrorBody", () => {
  it("maps an AppError to its status and code", () => {
    const r = toErrorBody(new AppError({ code: "payload_too_large", message: "File over 50 MB." }));
    expect(r).toEqual({ status: 413, body: { error: { code: "payload_too_large", message: "File over 50 MB." } } });
  });

  it("maps a ZodError to 422 with its issues", () => {
    const parsed = z.object({ n: z.number() }).safeParse({ n: "x" });
    const r = toErrorBody(parsed.error);
    expect(r.status).toBe(422);
    expect(r.body.error.issues?.[0]?.path).toBe("n");
  });

  it("maps a real SQLite unique violation to 409 by its error code", async () => {
    const db = await freshDb();
    const row = { slug: "a", name: "A", created_at: "2026-01-01T00:00:00Z" };
    await db("labs").insert(row);
    const err = await db("labs").insert(row).catch((e: unknown) => e);
    await db.destroy();
    expect(toErrorBody(err).status).toBe(409);
  });

  it("hides anything else behind a generic 500", () => {
    const spy = vi.spyOn(console, "error").mockImplementation(() => {});
    const r = toErrorBody(new Error("secret detail"));
    expect(r.status).toBe(500);
    expect(r.body.error.message).not.toContain("secret");
    spy.mockRestore();
  });
});

describe("fetcher", () => {
  afterEach(() => vi.unstubAllGlobals());

  it("throws with the status and the server's message", async () => {
    vi.stubGlobal("fetch", async () =>
      Response.json({ error: { code: "forbidden", message: "Your role in this lab does not allow this." } }, { status: 403 }),
    );
    const err = await fetcher("/api/x").catch((e: unknown) => e);
    expect(err).toBeInstanceOf(FetchError);
    expect(err).toMatchObject({ status: 403, code: "forbidden", message: "Your role in this lab does not allow this." });
  });

  it("returns the JSON body on success", async () => {
    vi.stubGlobal("fetch", async () => Response.json({ ok: 1 }));
    expect(await fetcher("/api/x")).toEqual({ ok: 1 });
  });
});
