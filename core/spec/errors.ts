/** A channel specification that cannot be used; `part` is the offending piece of text. */
export class ChannelSpecError extends Error {
  readonly part: string;
  constructor(part: string, message: string) {
    super(message);
    this.name = 'ChannelSpecError';
    this.part = part;
  }
}
