import crypto from 'node:crypto';
import { canonicalize } from 'json-canonicalize';

export function sha256Hex(text: string): string {
  return crypto.createHash('sha256').update(text, 'utf8').digest('hex');
}

/** Digest of a JSON value: SHA-256 of its canonical form (RFC 8785, JSON Canonicalization Scheme). */
export function digestOf(value: unknown): string {
  return sha256Hex(canonicalize(value));
}
