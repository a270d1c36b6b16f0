import { canonicalize } from 'json-canonicalize';
import { digestOf, sha256Hex } from '../../lib/digest';

export { digestOf, sha256Hex };

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

/** hash = SHA-256(previous hash ‖ canonical JSON of the event's own content). */
export function chainHash(prevHash: string, content: ChainedContent): string {
  return sha256Hex(prevHash + canonicalize(content));
}
