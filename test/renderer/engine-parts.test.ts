// The engine's browser-free parts: calibration storage and the dBFS scale, the WAV
// data-chunk probe behind the empty-file fault, and the mapping of getUserMedia's errors.
import { describe, expect, it } from 'vitest';
import { dbfsFromRms, localCalibrationStore } from '../../renderer/audio/calibration';
import { microphoneFault } from '../../renderer/audio/faults';
import { renderBuiltIn, wavDataBytes } from '../../renderer/audio/sources';

class MemoryStorage {
  private readonly items = new Map<string, string>();
  get length() {
    return this.items.size;
  }
  clear() {
    this.items.clear();
  }
  getItem(k: string) {
    return this.items.get(k) ?? null;
  }
  key(i: number) {
    return [...this.items.keys()][i] ?? null;
  }
  removeItem(k: string) {
    this.items.delete(k);
  }
  setItem(k: string, v: string) {
    this.items.set(k, v);
  }
}

describe('calibration', () => {
  it('reads a full-scale sine as 0 dBFS', () => {
    // AES17 convention (from memory): a sine whose peak is full scale is 0 dBFS; its RMS is 1/sqrt(2).
    expect(dbfsFromRms(Math.SQRT1_2)).toBeCloseTo(0, 12);
    expect(dbfsFromRms(0.1 * Math.SQRT1_2)).toBeCloseTo(-20, 12);
    expect(dbfsFromRms(0)).toBeNull();
  });

  it('keeps one offset per input device, and survives a corrupt store', () => {
    const storage = new MemoryStorage() as unknown as Storage;
    const store = localCalibrationStore(storage);
    expect(store.get('mic:one')).toBeNull();
    store.set('mic:one', 3.5);
    store.set('mic:two', -1.25);
    expect(localCalibrationStore(storage).get('mic:one')).toBe(3.5);
    expect(localCalibrationStore(storage).get('mic:two')).toBe(-1.25);
    storage.setItem('quantiscope.calibration.v1', '{not json');
    expect(localCalibrationStore(storage).get('mic:one')).toBeNull();
  });
});

describe('sources', () => {
  it('finds the data chunk of a WAV file and tells a WAV of 0 samples', () => {
    // RIFF/WAVE layout (Microsoft 1991): "RIFF" size "WAVE", then chunks of id + little-endian size.
    const header = (dataBytes: number) => {
      const b = new DataView(new ArrayBuffer(44 + dataBytes));
      const tag = (at: number, s: string) => [...s].forEach((c, i) => b.setUint8(at + i, c.charCodeAt(0)));
      tag(0, 'RIFF');
      b.setUint32(4, 36 + dataBytes, true);
      tag(8, 'WAVE');
      tag(12, 'fmt ');
      b.setUint32(16, 16, true);
      tag(36, 'data');
      b.setUint32(40, dataBytes, true);
      return b.buffer;
    };
    expect(wavDataBytes(header(0))).toBe(0);
    expect(wavDataBytes(header(8))).toBe(8);
    expect(wavDataBytes(new TextEncoder().encode('not a wav file at all').buffer)).toBeNull();
  });

  it('levels the test tone at channel A in dBm0', () => {
    // G.711 mu-law: a -10 dBm0 sine peaks at 8159*4/32768 * 10^((-10 - 3.17)/20) (load capacity +3.17 dBm0, from memory).
    const tone = renderBuiltIn('tone', 48000, 'g711-mu', { dbm0: -10, frequencyHz: 1020 });
    const peak = Math.max(...tone);
    expect(peak).toBeCloseTo(((8159 * 4) / 32768) * Math.pow(10, (-10 - 3.17) / 20), 4);
    expect(tone.length).toBe(48000);
  });
});

describe('microphone errors', () => {
  it('maps getUserMedia rejections to faults', () => {
    // Media Capture and Streams: NotAllowedError for a refusal, NotFoundError with no device.
    const named = (name: string) => Object.assign(new Error('x'), { name });
    expect(microphoneFault(named('NotAllowedError')).code).toBe('permission-denied');
    expect(microphoneFault(named('SecurityError')).code).toBe('permission-denied');
    expect(microphoneFault(named('NotFoundError')).code).toBe('no-input-device');
    expect(microphoneFault(named('OverconstrainedError')).code).toBe('no-input-device');
    expect(microphoneFault(named('NotFoundError')).message).toMatch(/NotFoundError/);
  });
});
