// Every way the live engine can fail, as a code the page can style and a message a
// person can act on. Nothing here throws: callers turn errors into these.

export type FaultCode =
  | 'permission-denied'
  | 'no-input-device'
  | 'device-ended'
  | 'context-suspended'
  | 'file-undecodable'
  | 'file-empty'
  | 'channel-invalid'
  | 'audio-unavailable';

export interface EngineFault {
  code: FaultCode;
  message: string;
}

export const FAULT_MESSAGES: Record<FaultCode, string> = {
  'permission-denied':
    'Microphone access was refused. Allow the microphone for this page (site settings), then choose the microphone again.',
  'no-input-device': 'No microphone was found. Plug one in, or use the demo talker, a file or a test signal.',
  'device-ended':
    'The microphone stopped delivering sound (unplugged or taken by another program). Choose it again to resume.',
  'context-suspended':
    'The system suspended audio (another program, or the device went to sleep). Press Resume to continue.',
  'file-undecodable':
    'This file could not be decoded as audio. Try a WAV file, or another format the browser plays.',
  'file-empty': 'This file holds no audio samples.',
  'channel-invalid': 'The channel text was refused.',
  'audio-unavailable': 'Audio could not start in this browser.',
};

export function fault(code: FaultCode, detail?: string): EngineFault {
  const base = FAULT_MESSAGES[code];
  return { code, message: detail ? `${base} (${detail})` : base };
}

/** getUserMedia's rejections (Media Capture and Streams, section on getUserMedia errors). */
export function microphoneFault(err: unknown): EngineFault {
  const name =
    err instanceof Error || (typeof err === 'object' && err !== null && 'name' in err)
      ? String((err as { name: unknown }).name)
      : '';
  const detail = err instanceof Error ? `${err.name}: ${err.message}` : String(err);
  if (name === 'NotAllowedError' || name === 'SecurityError') return fault('permission-denied', detail);
  if (name === 'NotFoundError' || name === 'OverconstrainedError' || name === 'NotReadableError')
    return fault('no-input-device', detail);
  return fault('no-input-device', detail);
}
