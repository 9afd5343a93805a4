import { createCipheriv, createDecipheriv, hkdfSync, randomBytes } from 'node:crypto';

// AES-256-GCM (NIST SP 800-38D) with a 96-bit random nonce and a 128-bit tag; the key is
// derived from TUTTI_SECRET_KEY with HKDF-SHA-256 (RFC 5869), so any long random string serves.
const version = 'v1';

function keyOf(secretKey: string): Buffer {
  return Buffer.from(hkdfSync('sha256', secretKey, 'tuttiboard', 'stored secrets v1', 32));
}

/** Encrypts a secret for the database: `v1.<nonce>.<tag>.<ciphertext>`, base64url parts. */
export function sealSecret(secretKey: string, plain: string): string {
  const nonce = randomBytes(12);
  const cipher = createCipheriv('aes-256-gcm', keyOf(secretKey), nonce);
  const sealed = Buffer.concat([cipher.update(plain, 'utf8'), cipher.final()]);
  return [version, nonce, cipher.getAuthTag(), sealed]
    .map((part) => (typeof part === 'string' ? part : part.toString('base64url')))
    .join('.');
}

/** Decrypts what {@link sealSecret} made; throws when the key is not the one it was sealed with. */
export function openSecret(secretKey: string, sealed: string): string {
  const [tag, nonce, authTag, body] = sealed.split('.');
  if (tag !== version || !nonce || !authTag || body === undefined)
    throw new Error('The stored secret is not in a form this version reads.');
  const decipher = createDecipheriv(
    'aes-256-gcm',
    keyOf(secretKey),
    Buffer.from(nonce, 'base64url'),
  );
  decipher.setAuthTag(Buffer.from(authTag, 'base64url'));
  return Buffer.concat([
    decipher.update(Buffer.from(body, 'base64url')),
    decipher.final(),
  ]).toString('utf8');
}
