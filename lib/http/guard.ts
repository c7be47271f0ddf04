// Writes only from the app's own pages: a request a browser sends from another origin or site (another port of the
// same host, a sibling subdomain) is refused before anything is read, and a browser's write must be JSON or multipart,
// so a "simple" cross-site form or text/plain request cannot act. Clients that are not browsers send no Origin and are
// judged by their credentials alone.
import { AppError } from "@/lib/errors";

const SAFE = new Set(["GET", "HEAD", "OPTIONS"]);

function allowedOrigins(req: Request): Set<string> {
  const out = new Set<string>([new URL(req.url).origin]);
  const host = req.headers.get("x-forwarded-host") ?? req.headers.get("host");
  if (host) {
    const proto = req.headers.get("x-forwarded-proto") ?? new URL(req.url).protocol.replace(":", "");
    out.add(`${proto}://${host}`);
  }
  if (process.env.NEXTAUTH_URL) out.add(new URL(process.env.NEXTAUTH_URL).origin);
  return out;
}

export function assertSameOriginWrite(req: Request): void {
  if (SAFE.has(req.method)) return;
  const site = req.headers.get("sec-fetch-site");
  const origin = req.headers.get("origin");
  const fromBrowser = site !== null || origin !== null;
  if (site && site !== "same-origin" && site !== "none")
    throw new AppError({ code: "forbidden", message: "Changes are accepted only from Halflight's own pages." });
  if (origin && !allowedOrigins(req).has(origin))
    throw new AppError({ code: "forbidden", message: "Changes are accepted only from Halflight's own pages." });
  if (!fromBrowser) return;
  const type = (req.headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase();
  const hasBody = Number(req.headers.get("content-length") ?? "0") > 0 || req.headers.has("transfer-encoding");
  if ((hasBody || type) && type !== "application/json" && type !== "multipart/form-data")
    throw new AppError({ code: "forbidden", message: "Send the request as JSON (content-type application/json)." });
}
