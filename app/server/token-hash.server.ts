/**
 * How every secret token we hand out is kept: API tokens, invitation links,
 * welcome and password-reset links. Only the SHA-256 of the token is stored,
 * so a copy of the database lets no one use a token; the tokens are random
 * and long, so no salt or slow hash is needed (unlike passwords).
 */
import { createHash } from "node:crypto";

export function hashToken(token: string) {
  return createHash("sha256").update(token).digest("hex");
}
