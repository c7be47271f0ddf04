// The client's one data layer (lib/http/client.ts): a refused body comes back as a FetchError with the server's
// message, code and field issues; a dropped connection as a plain message (never an unhandled rejection); success as
// the parsed reply.
import { afterEach, describe, expect, it, vi } from "vitest";
import { FetchError, problemLines, problemText, sendJson } from "@/lib/http/client";
import { seriesPointsFetcher } from "@/lib/http/fetcher";

afterEach(() => vi.unstubAllGlobals());

describe("sendJson", () => {
  it("sends JSON and answers the reply", async () => {
    const fetchMock = vi.fn(async (_u: string, init: RequestInit) => new Response(JSON.stringify({ id: 7, echo: JSON.parse(String(init.body)) }), { status: 201 }));
    vi.stubGlobal("fetch", fetchMock);
    await expect(sendJson<{ id: number; echo: unknown }>("/api/x", { body: { a: 1 } })).resolves.toEqual({ id: 7, echo: { a: 1 } });
    expect(fetchMock.mock.calls[0]![1]).toMatchObject({ method: "POST", headers: { "content-type": "application/json" } });
  });

  it("a 422 carries the route's issues, shown one way", async () => {
    vi.stubGlobal("fetch", async () => new Response(JSON.stringify({ error: { code: "unprocessable", message: "The request has problems.", issues: [{ path: "definition.name", message: "Give the method a name." }] } }), { status: 422 }));
    const e = await sendJson("/api/methods", { body: {} }).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(FetchError);
    expect(e).toMatchObject({ status: 422, code: "unprocessable", issues: [{ path: "definition.name" }] });
    expect(problemText(e)).toBe("The request has problems. definition.name: Give the method a name.");
    expect(problemLines(e, /^definition\./)).toEqual(["name: Give the method a name."]);
  });

  it("a dropped connection is a FetchError with a plain message; a reply that is not JSON keeps the status", async () => {
    vi.stubGlobal("fetch", async () => {
      throw new TypeError("Failed to fetch");
    });
    const e = await sendJson("/api/fits", { body: {} }).catch((x: unknown) => x);
    expect(e).toMatchObject({ status: 0, code: "network" });
    expect(problemText(e)).toMatch(/could not be reached, so nothing was saved/);
    vi.stubGlobal("fetch", async () => new Response("<html>bad gateway</html>", { status: 502 }));
    await expect(sendJson("/api/fits", { method: "DELETE" })).rejects.toMatchObject({ status: 502, message: "The server answered 502." });
  });
});

describe("seriesPointsFetcher", () => {
  afterEach(() => vi.unstubAllGlobals());
  it("reads n little-endian float64 times then n readings, exactly, and refuses a body cut short", async () => {
    // The layout the points route writes (checked against the stored BLOBs in ingest.test.ts).
    const t = [0, 0.1, 1e-300, 12345.678901234567];
    const y = [0.95, -0, 5e-324, 1.7976931348623157e308];
    const body = Buffer.alloc(64);
    [...t, ...y].forEach((v, i) => body.writeDoubleLE(v, 8 * i));
    vi.stubGlobal("fetch", async () => new Response(new Uint8Array(body), { headers: { "x-series-points": "4" } }));
    const got = await seriesPointsFetcher("/api/runs/1/series/1/points");
    expect(Array.from(got.t)).toEqual(t);
    expect(Array.from(got.y)).toEqual(y);
    expect(Object.is(got.y[1], -0)).toBe(true);
    vi.stubGlobal("fetch", async () => new Response(new Uint8Array(body.subarray(0, 56)), { headers: { "x-series-points": "4" } }));
    await expect(seriesPointsFetcher("/x")).rejects.toThrow(/cut short \(56 bytes for 4 points\)/);
  });
});
