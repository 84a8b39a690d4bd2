// Everything that arrives over IPC is checked before a handler sees it: the channel
// must be on our list, the sender must be our own page, and the payload must fit.
import { ALL_IPC_CHANNELS, IPC_CHANNELS, type IpcChannel } from './channels';
import { isAppUrl } from '../security/permissions';

export type Checked<T> = { ok: true; value: T } | { ok: false; error: string };

/** Payload shape per channel; a checker returns the typed payload or an error. */
interface PayloadCheckers {
  [IPC_CHANNELS.appInfo]: (args: readonly unknown[]) => Checked<void>;
}

const checkers: PayloadCheckers = {
  [IPC_CHANNELS.appInfo]: (args) =>
    args.length === 0
      ? { ok: true, value: undefined }
      : { ok: false, error: `takes no arguments, got ${args.length}` },
};

export function isIpcChannel(name: unknown): name is IpcChannel {
  return typeof name === 'string' && (ALL_IPC_CHANNELS as readonly string[]).includes(name);
}

/** Only our own top frame may call the shell. */
export function checkSender(senderUrl: string | undefined, isTopFrame = true): Checked<void> {
  if (!senderUrl || !isAppUrl(senderUrl)) {
    return { ok: false, error: `sender ${JSON.stringify(senderUrl ?? '')} is not the app page` };
  }
  if (!isTopFrame) return { ok: false, error: 'sender is a subframe, not the app page itself' };
  return { ok: true, value: undefined };
}

export function checkPayload<C extends IpcChannel>(
  channel: C,
  args: readonly unknown[],
): ReturnType<PayloadCheckers[C]> {
  return checkers[channel](args) as ReturnType<PayloadCheckers[C]>;
}

/** Channel + sender + payload in one step, for the IPC wrapper in main.ts. */
export function checkCall(
  channel: string,
  senderUrl: string | undefined,
  args: readonly unknown[],
  isTopFrame = true,
): Checked<void> {
  if (!isIpcChannel(channel)) return { ok: false, error: `unknown channel ${JSON.stringify(channel)}` };
  const sender = checkSender(senderUrl, isTopFrame);
  if (!sender.ok) return sender;
  const payload = checkPayload(channel, args);
  return payload.ok ? { ok: true, value: undefined } : { ok: false, error: `${channel}: ${payload.error}` };
}
