import { describe, expect, it } from 'vitest';
import { complement, encodeChecksum, onesComplementSum } from '../../src/fits/checksum.js';

describe('FITS checksum convention', () => {
  it('probe', () => {
    console.log(encodeChecksum(868229149), encodeChecksum(complement(868229149)));
  });
});
