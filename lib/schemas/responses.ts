// What the write routes answer, for the client's sendJson<T> (one place, so a route and its callers agree).

/** A new version of a versioned record (fit, study, method); `unchanged` when the options were the newest already. */
export interface SavedVersion {
  id: number;
  version: number;
  unchanged?: boolean;
}

/** A record made (a calibration curve, a study). */
export interface Created {
  id: number;
}

/** An invitation stored; `mailed` false when no mail server is configured. */
export interface InvitationSent {
  mailed: boolean;
}

/** An API key made: the key itself is shown once. */
export interface ApiKeyMade {
  name: string;
  key: string;
}

/** A share link made: its address (shown once; only its hash is stored). */
export interface ShareLinkMade {
  url: string;
}

/** A run's method set (or cleared). */
export interface MethodAssigned {
  method: { name: string; version: number } | null;
}
