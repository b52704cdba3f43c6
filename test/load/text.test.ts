import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { firstInvalidUtf8 } from '../../src/load/text.ts';

/** Node's own decoder (WHATWG Encoding Standard, fatal mode) is the reference for what UTF-8 is. */
const strict = new TextDecoder('utf-8', { fatal: true });
const decodes = (bytes: Uint8Array) => {
  try {
    strict.decode(bytes);
    return true;
  } catch {
    return false;
  }
};

describe('finding the first byte that is not UTF-8', () => {
  it('agrees with the WHATWG decoder: valid exactly when it decodes, and everything before the byte found decodes', () => {
    // Bytes biased toward the lead and continuation bytes where the edge cases are.
    const byte = fc.oneof(fc.integer({ min: 0, max: 255 }), fc.constantFrom(0x80, 0xbf, 0xc0, 0xc2, 0xdf, 0xe0, 0xed, 0xef, 0xf0, 0xf4, 0xf5, 0x9f, 0xa0, 0x8f, 0x90));
    const mixed = fc.array(fc.oneof(fc.string({ unit: 'grapheme' }).map((text) => [...Buffer.from(text, 'utf8')]), fc.array(byte, { maxLength: 4 })), { maxLength: 12 }).map((parts) => Uint8Array.from(parts.flat()));
    fc.assert(
      fc.property(mixed, (bytes) => {
        const at = firstInvalidUtf8(bytes);
        if (at === undefined) return decodes(bytes);
        return !decodes(bytes) && decodes(bytes.subarray(0, at));
      }),
      { numRuns: 5000, seed: 17 },
    );
  });

  it('refuses overlong forms, surrogates and code points above U+10FFFF (Unicode Standard, Table 3-7)', () => {
    expect(firstInvalidUtf8(Uint8Array.from([0x41, 0xc0, 0xaf]))).toBe(1); // overlong "/"
    expect(firstInvalidUtf8(Uint8Array.from([0xed, 0xa0, 0x80]))).toBe(0); // U+D800
    expect(firstInvalidUtf8(Uint8Array.from([0xf4, 0x90, 0x80, 0x80]))).toBe(0); // U+110000
    expect(firstInvalidUtf8(Buffer.from('€ 𝄞 ä', 'utf8'))).toBeUndefined();
  });
});
