import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { sha256Hex } from '../../shared-core/study/sha256.js';

describe('sha256Hex', () => {
  // NIST FIPS 180-4 examples (Secure Hash Standard, example computations for SHA-256; from memory).
  it('hashes "abc" as the FIPS 180-4 one-block example', () => {
    expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });

  it('hashes the 448-bit two-block FIPS 180-4 example', () => {
    expect(sha256Hex('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).toBe(
      '248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1',
    );
  });

  it("hashes one million 'a' as the FIPS 180-4 long-message example", () => {
    expect(sha256Hex('a'.repeat(1_000_000))).toBe(
      'cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0',
    );
  });

  it('hashes strings as UTF-8 and agrees with node:crypto on random bytes and text', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 300 }), fc.string({ unit: 'grapheme' }), (bytes, text) => {
        expect(sha256Hex(bytes)).toBe(createHash('sha256').update(bytes).digest('hex'));
        expect(sha256Hex(text)).toBe(createHash('sha256').update(text, 'utf8').digest('hex'));
      }),
      { numRuns: 500 },
    );
  });
});
