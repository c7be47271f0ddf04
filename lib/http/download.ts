// Content-Disposition for any file name (RFC 6266 with RFC 8187's filename*): a Latin-1-safe fallback for old clients
// and the exact name, UTF-8 and percent-encoded, for every current browser. Header values must be Latin-1, so a name
// like "Ωmega-測定-ü.csv" would otherwise break the response.
export function attachment(name: string): string {
  const fallback = name.replace(/[^\x20-\x7e]/g, "_").replace(/["\\]/g, "_") || "download";
  const encoded = encodeURIComponent(name).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
  return `attachment; filename="${fallback}"; filename*=UTF-8''${encoded}`;
}
