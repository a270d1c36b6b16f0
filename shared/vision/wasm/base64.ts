// Base64 (RFC 4648 §4) to bytes, without relying on atob or Buffer being present.
const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';

export function decodeBase64(text: string): Uint8Array {
  const values = new Uint8Array(128);
  for (let i = 0; i < ALPHABET.length; i++) values[ALPHABET.charCodeAt(i)] = i;
  const clean = text.replace(/=+$/, '');
  const bytes = new Uint8Array(Math.floor((clean.length * 3) / 4));
  let bits = 0;
  let count = 0;
  let out = 0;
  for (let i = 0; i < clean.length; i++) {
    bits = (bits << 6) | values[clean.charCodeAt(i)];
    count += 6;
    if (count >= 8) {
      count -= 8;
      bytes[out++] = (bits >>> count) & 0xff;
    }
  }
  return bytes;
}
