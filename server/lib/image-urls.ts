import crypto from 'node:crypto';

/**
 * Short-lived signed addresses for stored images, so that <img> tags can load them without a
 * bearer header: /api/images/<sha256>?exp=<unix s>&sig=<HMAC-SHA256(secret, hash.exp)>.
 */
export class ImageUrlSigner {
  constructor(
    private readonly secret: string,
    private readonly ttlSeconds = 3600,
  ) {}

  private signature(hash: string, exp: number): string {
    return crypto.createHmac('sha256', this.secret).update(`${hash}.${exp}`).digest('base64url');
  }

  url(hash: string, now = Date.now()): string {
    // Rounded to the hour so that the same image keeps the same address for a while (browser cache).
    const exp = Math.ceil(now / 1000 / this.ttlSeconds) * this.ttlSeconds + this.ttlSeconds;
    return `/api/images/${hash}?exp=${exp}&sig=${this.signature(hash, exp)}`;
  }

  verify(hash: string, exp: number, sig: string, now = Date.now()): boolean {
    if (!Number.isInteger(exp) || exp * 1000 < now) return false;
    const expected = Buffer.from(this.signature(hash, exp));
    const given = Buffer.from(sig);
    return expected.length === given.length && crypto.timingSafeEqual(expected, given);
  }
}
