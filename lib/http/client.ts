"use client";
// The client's one way to send a change to the server: JSON in, typed JSON out, and every failure as a FetchError
// carrying the server's message, code and field issues, or a plain message when the server could not be reached, so
// no Save button stays disabled after a dropped connection. `problemText` is the one way those are shown.
import useSWRMutation from "swr/mutation";
import { failureOf, FetchError } from "./fetcher";

export { FetchError } from "./fetcher";

type Method = "POST" | "PUT" | "PATCH" | "DELETE";

/** Sends `body` as JSON (none for DELETE) and answers the parsed reply; throws FetchError on any failure. */
export async function sendJson<T = unknown>(url: string, opts: { method?: Method; body?: unknown } = {}): Promise<T> {
  const method = opts.method ?? "POST";
  let res: Response;
  try {
    res = await fetch(url, {
      method,
      headers: { accept: "application/json", ...(opts.body !== undefined ? { "content-type": "application/json" } : {}) },
      ...(opts.body !== undefined ? { body: JSON.stringify(opts.body) } : {}),
    });
  } catch {
    throw new FetchError("The server could not be reached, so nothing was saved. Check the connection and try again.", 0, "network");
  }
  if (!res.ok) throw await failureOf(res);
  try {
    return (await res.json()) as T;
  } catch {
    return null as T; // an empty reply to a change that succeeded
  }
}

/** What to tell the user about a failure: the server's message, then each field issue ("field: problem"). */
export function problemText(e: unknown, strip: RegExp = /^$/): string {
  if (e instanceof FetchError) {
    const issues = (e.issues ?? []).map((i) => `${i.path.replace(strip, "") || "request"}: ${i.message}`);
    return issues.length && !issues.some((i) => e.message.includes(i)) ? `${e.message} ${issues.join("; ")}` : e.message;
  }
  return e instanceof Error ? e.message : String(e);
}

/** The field issues of a failure, one line each (for a form's error list). */
export function problemLines(e: unknown, strip: RegExp = /^$/): string[] {
  if (e instanceof FetchError && e.issues?.length) return e.issues.map((i) => `${i.path.replace(strip, "") || "request"}: ${i.message}`);
  return [e instanceof Error ? e.message : String(e)];
}

/** SWR's mutation hook over sendJson: `trigger(body)` sends, `isMutating` while it runs, `error` a FetchError. */
export function useSend<TBody, TOut = unknown>(url: string | null, method: Method = "POST") {
  return useSWRMutation<TOut, FetchError, string | null, TBody>(url, (u: string, { arg }: { arg: TBody }) => sendJson<TOut>(u, { method, body: arg }), { throwOnError: true });
}
