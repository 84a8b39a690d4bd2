// The one list of IPC channel names; the preload and the main process both read it.

export const IPC_CHANNELS = {
  appInfo: 'quantiscope:app-info',
} as const;

export type IpcChannel = (typeof IPC_CHANNELS)[keyof typeof IPC_CHANNELS];

export const ALL_IPC_CHANNELS: readonly IpcChannel[] = Object.values(IPC_CHANNELS);
