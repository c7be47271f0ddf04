// The SWR fetcher: throws an error carrying the HTTP status and the server's own message.
export class FetchError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly code?: string,
    /** The route's validation issues (field path and message), when it refused the body. */
    readonly issues?: ReadonlyArray<{ path: string; message: string; line?: number }>,
  ) {
    super(message);
    this.name = "FetchError";
  }
}

/** The FetchError of a refused reply: the server's message, code and issues, or its status line when it sent no JSON. */
export async function failureOf(res: Response): Promise<FetchError> {
  try {
    const e = ((await res.json()) as { error?: { message?: string; code?: string; issues?: Array<{ path: string; message: string; line?: number }> } } | null)?.error;
    return new FetchError(e?.message ?? `The server answered ${res.status}.`, res.status, e?.code, e?.issues);
  } catch {
    return new FetchError(`The server answered ${res.status}.`, res.status);
  }
}

export async function fetcher<T>(url: string): Promise<T> {
  const res = await fetch(url, { headers: { accept: "application/json" } });
  if (!res.ok) throw await failureOf(res);
  return (await res.json()) as T;
}

const LITTLE_ENDIAN = new Uint8Array(Float64Array.of(1).buffer)[7] === 0x3f;

/**
 * Every point of a series from its binary endpoint (n float64 times, then n readings, little-endian): on a
 * little-endian machine two views of the response itself, nothing converted (a million points as number[] cost the
 * page a main-thread task of over 100 ms; bench page).
 */
export async function seriesPointsFetcher(url: string): Promise<{ t: Float64Array; y: Float64Array }> {
  const res = await fetch(url, { headers: { accept: "application/octet-stream" } });
  if (!res.ok) throw await failureOf(res);
  const buf = await res.arrayBuffer();
  const n = Number(res.headers.get("x-series-points") ?? buf.byteLength / 16);
  if (!Number.isInteger(n) || buf.byteLength !== 16 * n) throw new FetchError(`The series arrived cut short (${buf.byteLength} bytes for ${n} points); reload the page.`, 502);
  if (LITTLE_ENDIAN) return { t: new Float64Array(buf, 0, n), y: new Float64Array(buf, 8 * n, n) };
  const view = new DataView(buf);
  const t = new Float64Array(n),
    y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = view.getFloat64(8 * i, true);
    y[i] = view.getFloat64(8 * (n + i), true);
  }
  return { t, y };
}
