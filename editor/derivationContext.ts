// Which derivation the editor shows, for blocks that fetch the derivation's own things (the
// datasets a trajectory plot lays over its curves). Provided by the page around the editor.
import { createContext, useContext } from 'react';

export const DerivationContext = createContext<{ derivationId: string | null }>({ derivationId: null });

export function useDerivationId(): string | null {
  return useContext(DerivationContext).derivationId;
}
