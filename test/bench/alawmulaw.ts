// The reference library as installed. Node loads its CommonJS build, whose
// exports arrive through `default` only; bundlers pick its ES module build,
// which exports the names directly. Accept both.
import * as ns from 'alawmulaw';

type Lib = { alaw: typeof ns.alaw; mulaw: typeof ns.mulaw };
const lib: Lib = (ns as Partial<Lib>).mulaw !== undefined ? ns : (ns as unknown as { default: Lib }).default;

export const { alaw, mulaw } = lib;
