// Starting points offered by the UI and the command line. The choices of mu and A
// are the trade's usual ones (mu = 255 for 8 bits, mu = 100 for 7 bits, A = 87.6:
// common practice, no source).
export interface ChannelPreset {
  id: string;
  title: string;
  text: string;
}

export const CHANNEL_PRESETS: readonly ChannelPreset[] = [
  { id: 'g711-mu', title: 'G.711 mu-law, 64 kbit/s', text: 'g711-mu' },
  { id: 'g711-a', title: 'G.711 A-law, 64 kbit/s', text: 'g711-a' },
  { id: 'mu-255-8', title: 'mu-law 255, 8 bits', text: 'mu:255:8' },
  { id: 'mu-100-7', title: 'mu-law 100, 7 bits', text: 'mu:100:7' },
  { id: 'a-87.6-8', title: 'A-law 87.6, 8 bits', text: 'a:87.6:8' },
  { id: 'uniform-8', title: 'Uniform 8 bits', text: 'uniform:8' },
  { id: 'uniform-12', title: 'Uniform 12 bits', text: 'uniform:12' },
  { id: 'uniform-16', title: 'Uniform 16 bits (linear PCM)', text: 'uniform:16' },
  { id: 'uniform-16-wb', title: 'Uniform 16 bits, wideband 16 kHz', text: 'uniform:16@16k' },
  { id: 'gateway-mu-a-mu', title: 'Gateway tandem mu -> A -> mu', text: 'g711-mu>g711-a>g711-mu' },
];
