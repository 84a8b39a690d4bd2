// Problems found in a file's bytes. The message says what is wrong; the file
// layer (main/cli/audio-file.ts) puts the file name in front of it.

export class WavFormatError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'WavFormatError';
  }
}
