import crypto from 'node:crypto';
import { canonicalize } from 'json-canonicalize';

/** The hash before the first event of the chain. */
export const GENESIS_HASH = '0'.repeat(64);

export interface ChainedContent {
  seq: string;
  occurredAt: string;
  actorId: string | null;
  actorName: string;
  action: string;
  entityType: string;
  entityId: string | null;
  beforeDigest: string | null;
  afterDigest: string | null;
  details: Record<string, unknown>;
}

export function sha256Hex(text: string): string {
  return crypto.createHash('sha256').update(text, 'utf8').digest('hex');
}

/** Digest of a record's state: SHA-256 of its canonical JSON (RFC 8785, JSON Canonicalization Scheme). */
export function digestOf(record: unknown): string {
  return sha256Hex(canonicalize(record));
}

/** hash = SHA-256(previous hash ‖ canonical JSON of the event's own content). */
export function chainHash(prevHash: string, content: ChainedContent): string {
  return sha256Hex(prevHash + canonicalize(content));
}
