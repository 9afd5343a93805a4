import { describe, expect, it } from 'vitest';
import { openSecret, sealSecret } from './secret-box';

const key = 'k'.repeat(40);

describe('sealSecret', () => {
  it('should give the secret back when opened with the same key', () => {
    const sealed = sealSecret(key, 'or-secret-123');
    expect(sealed).not.toContain('or-secret-123');
    expect(openSecret(key, sealed)).toBe('or-secret-123');
  });

  it('should seal the same secret differently each time', () => {
    expect(sealSecret(key, 'same')).not.toBe(sealSecret(key, 'same'));
  });

  // NIST SP 800-38D: GCM authenticates the ciphertext; another key or a changed byte fails.
  it('should refuse to open when the key differs or the text was changed', () => {
    const sealed = sealSecret(key, 'or-secret-123');
    expect(() => openSecret('x'.repeat(40), sealed)).toThrow();
    const parts = sealed.split('.');
    parts[3] = Buffer.from('tampered').toString('base64url');
    expect(() => openSecret(key, parts.join('.'))).toThrow();
  });
});
