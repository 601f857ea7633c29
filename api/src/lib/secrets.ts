import { createHash, randomBytes, timingSafeEqual } from "node:crypto";

/** A random URL-safe secret, optionally prefixed so leaked tokens are recognisable (e.g. `spt_`). */
export function randomSecret(prefix = "", bytes = 32): string {
  return prefix + randomBytes(bytes).toString("base64url");
}

export function sha256Hex(value: string): string {
  return createHash("sha256").update(value, "utf8").digest("hex");
}

export function safeEqual(a: string, b: string): boolean {
  const left = Buffer.from(a, "utf8");
  const right = Buffer.from(b, "utf8");
  return left.length === right.length && timingSafeEqual(left, right);
}
