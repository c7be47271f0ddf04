// The SWR fetcher: throws an error carrying the HTTP status and the server's own message.
export class FetchError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly code?: string,
  ) {
    super(message);
    this.name = "FetchError";
  }
}

export async function fetcher<T>(url: string): Promise<T> {
  const res = await fetch(url, { headers: { accept: "application/json" } });
  if (!res.ok) {
    let message = `The server answered ${res.status}.`;
    let code: string | undefined;
    try {
      const body = (await res.json()) as { error?: { message?: string; code?: string } };
      if (body.error?.message) message = body.error.message;
      code = body.error?.code;
    } catch {
      // not JSON: keep the status line
    }
    throw new FetchError(message, res.status, code);
  }
  return (await res.json()) as T;
}
