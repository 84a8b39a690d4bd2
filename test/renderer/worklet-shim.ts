// A minimal AudioWorkletGlobalScope for running the processor in Node: sampleRate,
// currentFrame, AudioWorkletProcessor with a port, registerProcessor. Posted messages
// land in a preallocated queue, so the shim itself allocates nothing per message.
import type { FromWorklet, ToWorklet, WorkletStartOptions } from '../../renderer/audio/worklet/messages';

export interface ShimPort {
  postMessage(message: FromWorklet, transfer?: ArrayBuffer[]): void;
  onmessage: ((event: { data: ToWorklet }) => void) | null;
}

export interface ShimProcessor {
  port: ShimPort;
  process(inputs: Float32Array[][], outputs: Float32Array[][]): boolean;
}

export type ShimProcessorClass = new (options?: { processorOptions?: WorkletStartOptions }) => ShimProcessor;

export const QUEUE_CAPACITY = 4096;

export class MessageQueue {
  readonly items: (FromWorklet | null)[] = new Array<FromWorklet | null>(QUEUE_CAPACITY).fill(null);
  count = 0;
  dropped = 0;

  push(m: FromWorklet): void {
    if (this.count < QUEUE_CAPACITY) this.items[this.count++] = m;
    else this.dropped++;
  }

  clear(): void {
    for (let i = 0; i < this.count; i++) this.items[i] = null;
    this.count = 0;
  }
}

interface ShimGlobals {
  sampleRate: number;
  currentFrame: number;
  AudioWorkletProcessor: unknown;
  registerProcessor: (name: string, ctor: ShimProcessorClass) => void;
}

export const registered = new Map<string, ShimProcessorClass>();
/** The queue of the processor constructed last. */
export let lastQueue: MessageQueue = new MessageQueue();

export function installWorkletShim(rate = 48000): void {
  const g = globalThis as unknown as ShimGlobals;
  g.sampleRate = rate;
  g.currentFrame = 0;
  g.AudioWorkletProcessor = class {
    readonly port: ShimPort;
    constructor() {
      const queue = new MessageQueue();
      lastQueue = queue;
      this.port = { postMessage: (m) => queue.push(m), onmessage: null };
    }
  };
  g.registerProcessor = (name, ctor) => {
    registered.set(name, ctor);
  };
}
