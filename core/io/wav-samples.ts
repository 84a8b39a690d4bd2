// Decoding one channel of interleaved sample frames into floats on the house
// scale (16-bit n -> n / 32768, DEVELOPERS.md "Numbers and scales"). Integer
// PCM of any width scales by its own full scale, so a full-scale value reads
// -1.0 in every width. One loop per format: the switch runs once per block,
// not per sample, and nothing is allocated per sample.

import { aLawToLinear, muLawToLinear } from '../quantizers/g711';
import { bytesPerSample, type SampleLayout } from './wav-layout';

const MU_FLOAT = Float64Array.from({ length: 256 }, (_, c) => muLawToLinear(c) / 32768);
const A_FLOAT = Float64Array.from({ length: 256 }, (_, c) => aLawToLinear(c) / 32768);

/**
 * Decodes `frames` frames starting at `src[srcOffset]` (channel `channel` of
 * `layout`) into `out[outOffset...]`. Returns the index (0-based, within this
 * block) of the first sample that is NaN or infinite, else -1; decoding stops
 * there, so callers refuse such input rather than analyse it.
 */
export function decodeChannel(
  src: Uint8Array,
  srcOffset: number,
  frames: number,
  layout: SampleLayout,
  channel: number,
  out: Float64Array,
  outOffset: number,
): number {
  const width = bytesPerSample(layout);
  const stride = layout.channels * width;
  let p = srcOffset + channel * width;
  let o = outOffset;
  const end = outOffset + frames;
  switch (layout.encoding) {
    case 'mulaw':
      for (; o < end; o++, p += stride) out[o] = MU_FLOAT[src[p]];
      return -1;
    case 'alaw':
      for (; o < end; o++, p += stride) out[o] = A_FLOAT[src[p]];
      return -1;
    case 'pcm':
      switch (width) {
        case 1: // unsigned, offset 128 (RIFF specification, from memory)
          for (; o < end; o++, p += stride) out[o] = (src[p] - 128) / 128;
          return -1;
        case 2:
          for (; o < end; o++, p += stride) out[o] = (((src[p] | (src[p + 1] << 8)) << 16) >> 16) / 32768;
          return -1;
        case 3:
          for (; o < end; o++, p += stride) {
            out[o] = (((src[p] | (src[p + 1] << 8) | (src[p + 2] << 16)) << 8) >> 8) / 8388608;
          }
          return -1;
        default:
          for (; o < end; o++, p += stride) {
            out[o] = (src[p] | (src[p + 1] << 8) | (src[p + 2] << 16) | (src[p + 3] << 24)) / 2147483648;
          }
          return -1;
      }
    case 'float': {
      const view = new DataView(src.buffer, src.byteOffset, src.byteLength);
      if (width === 4) {
        for (; o < end; o++, p += stride) {
          const v = view.getFloat32(p, true);
          // v - v is 0 for every finite v and NaN for NaN and +-Infinity.
          if (v - v !== 0) return o - outOffset;
          out[o] = v;
        }
      } else {
        for (; o < end; o++, p += stride) {
          const v = view.getFloat64(p, true);
          if (v - v !== 0) return o - outOffset;
          out[o] = v;
        }
      }
      return -1;
    }
  }
}
