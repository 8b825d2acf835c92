import { sha256 } from '@noble/hashes/sha2.js';
import { bytesToHex, utf8ToBytes } from '@noble/hashes/utils.js';

/**
 * SHA-256 as lowercase hex, in pure JavaScript so that the core, the renderer and Node agree byte for
 * byte. Strings are hashed as their UTF-8 bytes.
 *
 * Source: NIST FIPS 180-4, Secure Hash Standard (2015), §6.2; implementation @noble/hashes.
 */
export function sha256Hex(input: Uint8Array | string): string {
  return bytesToHex(sha256(typeof input === 'string' ? utf8ToBytes(input) : input));
}

/** A SHA-256 digest written as 64 lowercase hex digits. */
export const sha256Pattern = /^[0-9a-f]{64}$/;
