// The channel on the audio thread: input -> core quantizer stage(s) -> output.
// Silent until unmuted. process() allocates nothing; stages are built on message.
// (The full engine, with the channel's own rate and the accumulators, is a later issue;
// for now the stages run at the context's rate.)
import { createQuantizer, type Quantizer } from '../../../core/quantizers/index';
import { formatChannel, parseChannel } from '../../../core/spec/index';
import { PROCESSOR_NAME, type FromWorklet, type ToWorklet, type WorkletStartOptions } from './messages';

// The AudioWorkletGlobalScope names we use; TypeScript ships no lib for this scope.
// Declared here (module scope) so they do not leak into the renderer's types.
declare const sampleRate: number;
declare class AudioWorkletProcessor {
  readonly port: {
    postMessage(message: FromWorklet): void;
    onmessage: ((event: { data: ToWorklet }) => void) | null;
  };
}
declare function registerProcessor(
  name: string,
  ctor: new (options?: { processorOptions?: WorkletStartOptions }) => AudioWorkletProcessor,
): void;

class ChannelProcessor extends AudioWorkletProcessor {
  private stages: Quantizer[] = [];
  private stageCount = 0;
  private muted = true;
  private announced = false;

  constructor(options?: { processorOptions?: WorkletStartOptions }) {
    super();
    this.port.onmessage = (event) => this.receive(event.data);
    // Start-up settings arrive with the node, so the very first block already uses them.
    const start = options?.processorOptions;
    if (start?.channel !== undefined) this.receive({ type: 'channel', text: start.channel });
    if (start?.muted === false) this.muted = false;
  }

  private receive(message: ToWorklet): void {
    if (message.type === 'mute') {
      this.muted = message.muted;
      this.port.postMessage({ type: 'muted', muted: this.muted });
      return;
    }
    try {
      const spec = parseChannel(message.text);
      this.stages = spec.stages.map((s) => createQuantizer(s));
      this.stageCount = this.stages.length;
      this.port.postMessage({ type: 'channel', canonical: formatChannel(spec) });
    } catch (err) {
      this.port.postMessage({ type: 'error', message: err instanceof Error ? err.message : String(err) });
    }
  }

  process(inputs: Float32Array[][], outputs: Float32Array[][]): boolean {
    if (!this.announced) {
      this.announced = true;
      this.port.postMessage({ type: 'running', sampleRate });
    }
    const input = inputs[0];
    const output = outputs[0];
    for (let ch = 0; ch < output.length; ch++) {
      const out = output[ch];
      const inp = input.length > ch ? input[ch] : input.length > 0 ? input[0] : null;
      if (this.muted || inp === null || this.stageCount === 0) {
        out.fill(0);
        continue;
      }
      for (let i = 0; i < out.length; i++) {
        let v = inp[i];
        for (let s = 0; s < this.stageCount; s++) v = this.stages[s].quantize(v);
        out[i] = v;
      }
    }
    return true;
  }
}

registerProcessor(PROCESSOR_NAME, ChannelProcessor);
