/** The manifest's pure SHA-256 against FIPS 180-4's published examples and Node's OpenSSL hash over random inputs. */
import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import fc from 'fast-check';
import { sha256HexOf } from '../../src/core/check/sha256';

const enc = (s: string) => new TextEncoder().encode(s);

describe('sha256HexOf', () => {
  it('gives the digests of the FIPS 180-4 examples (NIST CSRC "SHA256.pdf" example values)', () => {
    // NIST example "abc" (one block) and the 448-bit two-block message; values as published by NIST, checked here
    // also against node:crypto below.
    expect(sha256HexOf(enc('abc'))).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(sha256HexOf(enc('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq'))).toBe('248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1');
    expect(sha256HexOf(new Uint8Array(0))).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
  });

  it('agrees with node:crypto (OpenSSL) on random byte strings across the block boundaries', () => {
    fc.assert(fc.property(fc.uint8Array({ minLength: 0, maxLength: 300 }), (b) => {
      expect(sha256HexOf(b)).toBe(createHash('sha256').update(b).digest('hex'));
    }), { numRuns: 300 });
  });
});
