/**
 * The one redactor: every log line, error message and stack trace that may hold a URL or a password passes
 * through `redact` before anyone sees it (stderr, stdout, the database, Redis). Secrets are registered where
 * they enter (a URL's password, a password file); URL userinfo is hidden whether registered or not.
 */

/** Registered secrets, longest first (so a secret holding a shorter one is hidden whole); kept sorted here, not per call. */
let secrets: readonly string[] = [];

/** Register a secret (a password) so `redact` hides it wherever it appears, plain or percent-encoded. */
export function registerSecret(secret: string | undefined): void {
  if (secret !== undefined && secret.length > 0) {
    secrets = [...new Set([...secrets, secret, encodeURIComponent(secret)])].sort((a, b) => b.length - a.length);
  }
}

/** Hide the password of every URL-like `scheme://user:pass@` and every registered secret in `text`. */
export function redact(text: string): string {
  let out = text.replace(/([a-z][a-z0-9+.-]*:\/\/)([^/@\s]*)@/gi, (_m, scheme: string, userinfo: string) => {
    const colon = userinfo.indexOf(':');
    return colon < 0 ? `${scheme}${userinfo}@` : `${scheme}${userinfo.slice(0, colon)}:***@`;
  });
  for (const s of secrets) out = out.split(s).join('***');
  return out;
}

/** An error's message (or a thrown value), redacted. */
export function redactError(error: unknown): string {
  return redact(error instanceof Error ? error.message : String(error));
}

/** Write one line to stderr, redacted: the log of the commands that talk to Redis. */
export function logRedacted(line: string): void {
  process.stderr.write(redact(line) + '\n');
}
