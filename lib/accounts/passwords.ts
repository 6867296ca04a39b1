/**
 * Password hashing with scrypt (Percival 2009; RFC 7914), a memory-hard function, from
 * node:crypto. Parameters N = 2^15, r = 8, p = 1 (about 32 MiB and tens of milliseconds per
 * hash), a 16-byte random salt per password and a 32-byte key.
 *
 * Encoded form, self-describing so the parameters can be raised later without breaking old
 * hashes: `scrypt$<log2 N>$<r>$<p>$<salt base64url>$<key base64url>`.
 */
import { randomBytes, scrypt as scryptCallback, timingSafeEqual, type ScryptOptions } from "node:crypto";

const LOG2_N = 15;
const R = 8;
const P = 1;
const KEY_LENGTH = 32;
const SALT_LENGTH = 16;

function scrypt(password: string, salt: Buffer, keyLength: number, options: ScryptOptions): Promise<Buffer> {
  return new Promise((resolve, reject) =>
    scryptCallback(password.normalize("NFKC"), salt, keyLength, options, (err, key) => (err ? reject(err) : resolve(key))),
  );
}

/** 128·N·r bytes are needed; Node's default limit (32 MiB) is exactly that, so allow twice. */
function maxmem(log2N: number, r: number): number {
  return 2 * 128 * 2 ** log2N * r;
}

/** Hashes a password; returns the encoded string to store in `User.passwordHash`. */
export async function hashPassword(password: string): Promise<string> {
  const salt = randomBytes(SALT_LENGTH);
  const key = await scrypt(password, salt, KEY_LENGTH, { N: 2 ** LOG2_N, r: R, p: P, maxmem: maxmem(LOG2_N, R) });
  return ["scrypt", LOG2_N, R, P, salt.toString("base64url"), key.toString("base64url")].join("$");
}

/**
 * Checks a password against an encoded hash (from {@link hashPassword}), comparing the keys
 * with `timingSafeEqual`. A malformed encoded hash verifies as false.
 */
export async function verifyPassword(password: string, encoded: string): Promise<boolean> {
  const parts = encoded.split("$");
  if (parts.length !== 6 || parts[0] !== "scrypt") return false;
  const [log2N, r, p] = parts.slice(1, 4).map(Number);
  if (![log2N, r, p].every((v) => Number.isInteger(v) && v > 0) || log2N > 20) return false;
  const salt = Buffer.from(parts[4], "base64url");
  const expected = Buffer.from(parts[5], "base64url");
  if (expected.length === 0) return false;
  const actual = await scrypt(password, salt, expected.length, { N: 2 ** log2N, r, p, maxmem: maxmem(log2N, r) });
  return timingSafeEqual(actual, expected);
}

/** A hash of a random password, verified against when the e-mail is unknown (equal timing). */
let dummyHash: Promise<string> | undefined;
export function dummyPasswordHash(): Promise<string> {
  dummyHash ??= hashPassword(randomBytes(16).toString("base64url"));
  return dummyHash;
}
