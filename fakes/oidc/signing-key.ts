import { generateKeyPairSync, randomUUID } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';
import type { JsonWebKey } from 'node:crypto';

/** A private RSA key in JWK form (RFC 7517), with the members oidc-provider signs with. */
export type SigningKey = JsonWebKey & { kid: string; alg: 'RS256'; use: 'sig' };

/** Generates a 2048-bit RSA signing key for RS256 (RFC 7518 §3.3 asks for at least 2048 bits). */
export function generateSigningKey(): SigningKey {
  const { privateKey } = generateKeyPairSync('rsa', { modulusLength: 2048 });
  return { ...privateKey.export({ format: 'jwk' }), kid: randomUUID(), alg: 'RS256', use: 'sig' };
}

/**
 * Reads the signing key kept at `keyFile`, or generates one and keeps it there, so tokens signed
 * before a restart still verify after it. Without a file, a fresh key is generated.
 */
export function loadSigningKey(keyFile?: string): SigningKey {
  if (keyFile === undefined) {
    return generateSigningKey();
  }
  if (existsSync(keyFile)) {
    const stored = JSON.parse(readFileSync(keyFile, 'utf8')) as SigningKey;
    if (stored.kty !== 'RSA' || typeof stored.d !== 'string') {
      throw new Error(`${keyFile} does not hold a private RSA JWK`);
    }
    return stored;
  }
  const key = generateSigningKey();
  mkdirSync(dirname(keyFile), { recursive: true });
  writeFileSync(keyFile, `${JSON.stringify(key)}\n`, { mode: 0o600 });
  return key;
}
