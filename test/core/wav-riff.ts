// Builds RIFF/WAVE files byte by byte for the tests, from the layout in the
// Microsoft/IBM RIFF specification (Multimedia Programming Interface and Data
// Specifications 1.0, 1991) and the WAVE_FORMAT_EXTENSIBLE addendum, as
// recalled (from memory). It shares no code with core/io, so a misreading of
// the format in one is caught by the other.
//
// Layout recalled: "RIFF" <u32 size of what follows> "WAVE", then chunks of
// <4-char id> <u32 body size> <body> [pad byte when the size is odd]. All
// numbers little-endian. fmt body: u16 format tag, u16 channels, u32 samples
// per second, u32 average bytes per second, u16 block align, u16 bits per
// sample, [u16 cbSize, extra bytes]. Extensible extra (cbSize 22): u16 valid
// bits, u32 channel mask, 16-byte sub-format GUID.

export const ascii = (s: string): number[] => Array.from(s, (c) => c.charCodeAt(0));
export const le16 = (n: number): number[] => [n & 0xff, (n >>> 8) & 0xff];
export const le24 = (n: number): number[] => [n & 0xff, (n >>> 8) & 0xff, (n >>> 16) & 0xff];
export const le32 = (n: number): number[] => [
  n & 0xff,
  (n >>> 8) & 0xff,
  (n >>> 16) & 0xff,
  (n >>> 24) & 0xff,
];
export function f32(x: number): number[] {
  const b = new Uint8Array(4);
  new DataView(b.buffer).setFloat32(0, x, true);
  return [...b];
}
export function f64(x: number): number[] {
  const b = new Uint8Array(8);
  new DataView(b.buffer).setFloat64(0, x, true);
  return [...b];
}

/** One chunk with its pad byte when the body is odd-sized. */
export function chunk(id: string, body: number[], declaredSize = body.length): number[] {
  return [...ascii(id), ...le32(declaredSize), ...body, ...(body.length % 2 ? [0] : [])];
}

/** A whole file: RIFF header around the chunks. */
export function riff(chunks: number[][], form = 'WAVE'): Uint8Array {
  const inner = [...ascii(form), ...chunks.flat()];
  return Uint8Array.from([...ascii('RIFF'), ...le32(inner.length), ...inner]);
}

export interface FmtFields {
  tag: number;
  channels: number;
  rate: number;
  bits: number;
  blockAlign?: number;
  byteRate?: number;
  /** Bytes after the 16 of WAVEFORMAT, cbSize included. */
  extra?: number[];
}

export function fmt(f: FmtFields): number[] {
  const align = f.blockAlign ?? f.channels * Math.ceil(f.bits / 8);
  return chunk('fmt ', [
    ...le16(f.tag),
    ...le16(f.channels),
    ...le32(f.rate),
    ...le32(f.byteRate ?? f.rate * align),
    ...le16(align),
    ...le16(f.bits),
    ...(f.extra ?? []),
  ]);
}

/** KSDATAFORMAT_SUBTYPE_xxx: {tag-0000-0010-8000-00aa00389b71}, fields little-endian (from memory). */
export function subFormatGuid(tag: number): number[] {
  return [...le32(tag), ...le16(0x0000), ...le16(0x0010), 0x80, 0x00, 0x00, 0xaa, 0x00, 0x38, 0x9b, 0x71];
}

export function extensibleFmt(f: {
  subTag: number;
  channels: number;
  rate: number;
  bits: number;
  validBits: number;
  mask?: number;
  guid?: number[];
}): number[] {
  return fmt({
    tag: 0xfffe,
    channels: f.channels,
    rate: f.rate,
    bits: f.bits,
    extra: [...le16(22), ...le16(f.validBits), ...le32(f.mask ?? 0), ...(f.guid ?? subFormatGuid(f.subTag))],
  });
}
