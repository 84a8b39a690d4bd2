// The channel setup for A and B.
export { mountChannelSetup, type ChannelSetupOptions } from './channel-setup';
