// What a browser test file reads of its own server (started for it by per-file-server.ts): the address, its mail
// sink's folder, its log, its database file, and the shared artifacts folder and lockout probe account.
export interface BrowserEnv {
  baseURL: string;
  mailDir: string;
  serverLog: string;
  dbFile: string;
  artifacts: string;
  lockoutUser: { email: string; password: string };
}

export function inject<K extends keyof BrowserEnv>(key: K): BrowserEnv[K] {
  const env = (globalThis as unknown as { __halflightE2E?: BrowserEnv }).__halflightE2E;
  if (!env) throw new Error("The browser test's own server is not running (tests/browser/per-file-server.ts is its set-up file).");
  return env[key];
}
