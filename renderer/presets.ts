// Channels shown on the first page; their figures come from core (channelFigures),
// so the page cannot drift from the command line.
/** Shown on the first page; the full preset list comes with the channel picker. */
export const PAGE_PRESETS: readonly string[] = ['g711-mu', 'g711-a', 'mu:255:8', 'a:87.6:8', 'uniform:12'];
